package org.sunder.spark.cli;

import java.util.concurrent.Callable;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.plan.RunPlan;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.run.RunSettings;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.ParentCommand;

/** {@code sunder plan CONFIG}. */
@Command(name = "plan", mixinStandardHelpOptions = true,
    description = {"Check a configuration against its input and show what a run would do: the"
        + " block grid and its halo overhead, task counts and records per stage, memory per"
        + " partition task against the budget, and, from one sample block measured here, the"
        + " time of every stage on the cores given and the reduced graph's expected size. Runs"
        + " every check that run makes before it writes (input, output, work dir, an earlier"
        + " run's settings, a block too large for one array or for the memory) and refuses with"
        + " the same message and exit code. Writes nothing to the run."})
final class PlanCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Mixin
  RunLocation location;

  @Option(names = "--fresh", description = "Plan a run with --fresh: an earlier run's records"
      + " and output would be discarded, so they are not checked against this configuration.")
  boolean fresh;

  @Option(names = "--no-sample", description = "Skip partitioning a sample block (default: one"
      + " sample block is partitioned to estimate the time).")
  boolean noSample;

  @Option(names = "--cores", paramLabel = "N", description = "Cores the run will have; the"
      + " default block shape keeps at least 2 blocks per core, and in local mode each task gets"
      + " the heap divided by N (default: spark.cores.max, else spark.executor.instances x"
      + " spark.executor.cores, else this machine's processors).")
  Integer cores;

  @Override
  public Integer call() {
    if (cores != null && cores < 1) {
      throw new ConfigException("--cores: expected a number of cores >= 1, got " + cores);
    }
    RunSettings settings = RunLoader.check(location.config, location.workDir, fresh,
        cores == null ? 0 : cores);
    RunPlan.print(settings, !noSample, settings.blockOrigin().budget().cores(), cli.out());
    return 0;
  }
}
