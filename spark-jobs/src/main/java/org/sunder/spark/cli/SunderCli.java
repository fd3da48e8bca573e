package org.sunder.spark.cli;

import java.io.PrintStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.concurrent.Callable;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.ErrorKind;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.report.RunReportWriter;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.stage.RunReport;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.SunderVersion;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Sunder's command line: {@code run}, {@code stage}, {@code plan}, {@code demo}, {@code report},
 * {@code evaluate}, {@code inspect}. Commands return exit codes ({@link ExitCodes}); only
 * {@link #main} exits the process. No command, or an unknown one, prints the usage or the list
 * of commands and exits 2.
 */
@Command(name = "sunder", mixinStandardHelpOptions = true, versionProvider = SunderCli.Version.class,
    description = {
        "Turns affinity maps of large 3D volumes into one consistent instance segmentation,",
        "blockwise on Apache Spark, in N5 or Zarr containers.",
        "",
        "New here? Try it on a synthetic volume first:   ${sys:sunder.launcher:-bin/sunder} demo",
        "Then write a configuration for your data (only the container is required):",
        "  {\"input\": {\"container\": \"/data/volume.zarr\", \"affinities\": \"affinities\",",
        "             \"offsets\": [[-1, 0, 0], [0, -1, 0], [0, 0, -1]]}}",
        "and check it, then run it:",
        "  ${sys:sunder.launcher:-bin/sunder} plan run.json",
        "  ${sys:sunder.launcher:-bin/sunder} run run.json",
        "Relative paths in a configuration are relative to the configuration file's folder.",
        "",
        "Automated segmentations contain errors: proofread before drawing scientific conclusions."},
    subcommands = {RunCommand.class, StageCommand.class, PlanCommand.class, DemoCommand.class,
        EvaluateCommand.class, InspectCommand.class, ReportCommand.class})
public final class SunderCli implements Callable<Integer> {
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

  /**
   * Runs {@code stages} of {@code run} on Spark ({@code master} unless spark-submit set one),
   * writes the run report after them and returns what the run did.
   */
  RunReport runStages(PreparedRun run, List<Stage> stages, String master) {
    JavaSparkContext sc = spark.open(master);
    try {
      RunReport report = new Pipeline(sc, out, err, terminal).run(run, stages);
      RunReportWriter.writeAfterRun(sc, report, out);
      return report;
    } finally {
      spark.release(sc);
    }
  }

  /** Without a command: the usage, on standard error, and the exit code of a usage error. */
  @Override
  public Integer call() {
    CommandLine line = new CommandLine(this);
    line.setUsageHelpWidth(100);
    line.getCommandSpec().usageMessage().footer(ExitCodes.footer());
    err.println("sunder: no command given");
    line.usage(err);
    err.flush();
    return ErrorKind.INVALID_CONFIG.exitCode();
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
