package org.sunder.spark.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.plan.RunPlan;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.run.RunSettings;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.ParentCommand;

/** {@code sunder plan CONFIG}. */
@Command(name = "plan", mixinStandardHelpOptions = true,
    description = {"Check a configuration against its input and show what a run would do: the"
        + " block grid, task counts per stage, memory per partition task, and a time estimate"
        + " from partitioning one sample block here. Runs every check that run makes before it"
        + " writes (input, output, work dir, an earlier run's settings) and refuses with the same"
        + " message and exit code. Writes nothing."})
final class PlanCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Parameters(index = "0", paramLabel = "CONFIG", description = "Run configuration (JSON)."
      + " Relative paths in it are relative to the configuration file's folder.")
  Path config;

  @Option(names = "--work-dir", paramLabel = "DIR", description = "Work dir for the manifest and"
      + " task records (default: the configuration's workDir, else <output container>.sunder-work/<dataset>).")
  Path workDir;

  @Option(names = "--fresh", description = "Plan a run with --fresh: an earlier run's records"
      + " and output would be discarded, so they are not checked against this configuration.")
  boolean fresh;

  @Option(names = "--no-sample", description = "Skip partitioning a sample block (default: one"
      + " sample block is partitioned to estimate the time).")
  boolean noSample;

  @Option(names = "--cores", paramLabel = "N", description = "Cores the estimate assumes"
      + " (default: this machine's, ${DEFAULT-VALUE}).")
  int cores = Runtime.getRuntime().availableProcessors();

  @Override
  public Integer call() {
    if (cores < 1) {
      throw new ConfigException("--cores: expected a number of cores >= 1, got " + cores);
    }
    RunSettings settings = RunLoader.check(config, workDir, fresh);
    RunPlan.print(settings, !noSample, cores, cli.out());
    return 0;
  }
}
