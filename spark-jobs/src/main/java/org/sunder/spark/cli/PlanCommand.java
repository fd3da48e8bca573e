package org.sunder.spark.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.sunder.spark.plan.RunPlan;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.run.TaskHooks;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.ParentCommand;

/** {@code sunder plan CONFIG}. */
@Command(name = "plan", mixinStandardHelpOptions = true,
    description = {"Check a configuration against its input and show what a run would do: the"
        + " block grid, task counts per stage, memory per partition task, and a time estimate"
        + " from partitioning one sample block here. Writes nothing."})
final class PlanCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Parameters(index = "0", paramLabel = "CONFIG", description = "Run configuration (JSON).")
  Path config;

  @Option(names = "--no-sample", description = "Skip partitioning a sample block (default: one"
      + " sample block is partitioned to estimate the time).")
  boolean noSample;

  @Option(names = "--cores", paramLabel = "N", description = "Cores the estimate assumes"
      + " (default: this machine's, ${DEFAULT-VALUE}).")
  int cores = Runtime.getRuntime().availableProcessors();

  @Override
  public Integer call() {
    RunSettings settings = RunLoader.resolve(config, null, TaskHooks.NONE);
    RunPlan.print(settings, !noSample, cores, cli.out());
    return 0;
  }
}
