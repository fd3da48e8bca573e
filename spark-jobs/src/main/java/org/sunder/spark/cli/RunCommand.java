package org.sunder.spark.cli;

import java.util.List;
import java.util.concurrent.Callable;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.workdir.Stage;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
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

  @Mixin
  RunLocation location;

  @Option(names = "--fresh", description = "Discard an earlier run's records and output and"
      + " start over (default: resume).")
  boolean fresh;

  @Mixin
  SparkOptions spark;

  @Override
  public Integer call() {
    spark.requireValid();
    try (PreparedRun run = RunLoader.prepare(location.config, location.workDir, fresh)) {
      cli.runStages(run, List.of(Stage.values()), spark.master).print(cli.out());
      return 0;
    }
  }
}
