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

/** {@code sunder stage NAME CONFIG}: one stage of a run. */
@Command(name = "stage", mixinStandardHelpOptions = true,
    description = {"Run one stage of a configured run; the stages before it must have finished."
        + " Stages in order: partition, seams, solve, relabel, evaluate, pyramid."})
final class StageCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Parameters(index = "0", paramLabel = "STAGE",
      description = "partition, seams, solve, relabel, evaluate or pyramid.")
  String stage;

  @Parameters(index = "1", paramLabel = "CONFIG", description = "Run configuration (JSON)."
      + " Relative paths in it are relative to the configuration file's folder.")
  Path config;

  @Option(names = "--work-dir", paramLabel = "DIR", description = "Work dir for the manifest and"
      + " task records of the run (default: the configuration's workDir, else <output container>.sunder-work/<dataset>).")
  Path workDir;

  @Mixin
  SparkOptions spark;

  @Override
  public Integer call() {
    Stage chosen = Stage.parse(stage);
    spark.requireValid();
    try (PreparedRun run = RunLoader.prepare(config, workDir, false)) {
      Pipeline.requireEarlierFinished(run, chosen);
      JavaSparkContext sc = cli.spark().open(spark.master);
      try {
        RunReport report = new Pipeline(sc, cli.out(), cli.err(), cli.terminal())
            .run(run, List.of(chosen));
        report.print(cli.out());
        return 0;
      } finally {
        cli.spark().release(sc);
      }
    }
  }
}
