package org.sunder.spark.cli;

import java.util.List;
import java.util.concurrent.Callable;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.workdir.Stage;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.ParentCommand;

/** {@code sunder stage NAME CONFIG}: one stage of a run. */
@Command(name = "stage", mixinStandardHelpOptions = true,
    description = {"Run one stage of a configured run; the stages before it must have finished."
        + " Stages in order: partition, seams, solve, relabel, evaluate, pyramid."})
final class StageCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Parameters(paramLabel = "STAGE",
      description = "partition, seams, solve, relabel, evaluate or pyramid.")
  String stage;

  @Mixin
  RunLocation location;

  @Mixin
  SparkOptions spark;

  @Override
  public Integer call() {
    Stage chosen = Stage.parse(stage);
    spark.requireValid();
    try (PreparedRun run = RunLoader.prepare(location.config, location.workDir, false)) {
      Pipeline.requireEarlierFinished(run, chosen);
      cli.runStages(run, List.of(chosen), spark.master).print(cli.out());
      return 0;
    }
  }
}
