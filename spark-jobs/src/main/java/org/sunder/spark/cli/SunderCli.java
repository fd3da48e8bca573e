package org.sunder.spark.cli;

import java.io.PrintStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.SunderVersion;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Sunder's command line: {@code run}, {@code stage}, {@code plan}, {@code demo},
 * {@code evaluate}, {@code inspect}. Commands return exit codes ({@link ExitCodes}); only
 * {@link #main} exits the process.
 */
@Command(name = "sunder", mixinStandardHelpOptions = true, versionProvider = SunderCli.Version.class,
    description = {
        "Turns affinity maps of large 3D volumes into one consistent instance segmentation,",
        "blockwise on Apache Spark, in N5 or Zarr containers.",
        "",
        "New here? Try it on a synthetic volume first:   sunder demo",
        "Then write a configuration for your data (only the container is required):",
        "  {\"input\": {\"container\": \"/data/volume.zarr\", \"affinities\": \"affinities\",",
        "             \"offsets\": [[-1, 0, 0], [0, -1, 0], [0, 0, -1]]}}",
        "and check it, then run it:   sunder plan run.json   and   sunder run run.json",
        "",
        "Automated segmentations contain errors: proofread before drawing scientific conclusions."},
    subcommands = {RunCommand.class, StageCommand.class, PlanCommand.class, DemoCommand.class,
        EvaluateCommand.class, InspectCommand.class})
public final class SunderCli implements Runnable {
  private final SparkContextSource spark;
  private final PrintStream out;
  private final PrintStream err;
  private final boolean terminal;

  public SunderCli(SparkContextSource spark, PrintStream out, PrintStream err, boolean terminal) {
    this.spark = spark;
    this.out = out;
    this.err = err;
    this.terminal = terminal;
  }

  SparkContextSource spark() {
    return spark;
  }

  PrintStream out() {
    return out;
  }

  PrintStream err() {
    return err;
  }

  boolean terminal() {
    return terminal;
  }

  @Override
  public void run() {
    new CommandLine(this).usage(out);
  }

  /** Runs one command line and returns its exit code. */
  public int execute(String... args) {
    CommandLine line = new CommandLine(this);
    line.setUsageHelpWidth(100);
    line.setOut(new PrintWriter(out, true, StandardCharsets.UTF_8));
    line.setErr(new PrintWriter(err, true, StandardCharsets.UTF_8));
    line.getCommandSpec().usageMessage().footer(ExitCodes.footer());
    ExitCodes codes = new ExitCodes(err);
    line.setExecutionExceptionHandler(codes);
    line.setParameterExceptionHandler(ExitCodes::usageError);
    try {
      return line.execute(args);
    } catch (OutOfMemoryError e) {
      return codes.handle(e, args.length == 0 ? "" : args[0]);
    }
  }

  public static void main(String[] args) {
    SunderCli cli = new SunderCli(SparkContextSource.perCommand(), System.out, System.err,
        System.console() != null);
    System.exit(cli.execute(args));
  }

  /** Prints the tool version. */
  static final class Version implements CommandLine.IVersionProvider {
    @Override
    public String[] getVersion() {
      return new String[] {"sunder " + SunderVersion.get()};
    }
  }
}
