package org.sunder.spark.cli;

import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.stage.RunReport;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.workdir.Stage;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.ParentCommand;

/** {@code sunder run CONFIG}: every stage, resuming an interrupted run. */
@Command(name = "run", mixinStandardHelpOptions = true,
    description = {"Segment a volume: run every stage (partition, seams, solve, relabel,"
        + " evaluate when a ground truth is configured, and pyramid: coarser levels for viewers)"
        + " and write the run report, report.html in the work dir. A rerun of the same command"
        + " continues where an interrupted run stopped and says how many tasks it skipped."})
final class RunCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Parameters(index = "0", paramLabel = "CONFIG", description = "Run configuration (JSON)."
      + " Relative paths in it are relative to the configuration file's folder.")
  Path config;

  @Option(names = "--fresh", description = "Discard an earlier run's records and output and"
      + " start over (default: resume).")
  boolean fresh;

  @Option(names = "--work-dir", paramLabel = "DIR", description = "Work dir for the manifest and"
      + " task records (default: the configuration's workDir, else <output container>.sunder-work/<dataset>).")
  Path workDir;

  @Mixin
  SparkOptions spark;

  @Override
  public Integer call() {
    spark.requireValid();
    try (PreparedRun run = RunLoader.prepare(config, workDir, fresh)) {
      JavaSparkContext sc = cli.spark().open(spark.master);
      try {
        RunReport report = new Pipeline(sc, cli.out(), cli.err(), cli.terminal())
            .run(run, List.of(Stage.values()));
        report.print(cli.out());
        return 0;
      } finally {
        cli.spark().release(sc);
      }
    }
  }
}
