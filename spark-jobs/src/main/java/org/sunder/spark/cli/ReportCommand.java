package org.sunder.spark.cli;

import java.util.concurrent.Callable;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.report.RunReportWriter;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.WorkDir;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.ParentCommand;

/** {@code sunder report CONFIG}: (re)writes the run report of a run's work dir. */
@Command(name = "report", mixinStandardHelpOptions = true,
    description = {"Write the run report (report.html in the work dir) of a run from its work"
        + " dir and output: settings, time per stage, segment sizes, slice pictures, the seam"
        + " audit, scores with the worst splits and merges, and the solve's least certain"
        + " decisions. Every run writes it at its end; this rewrites it. Changes nothing else."})
final class ReportCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Mixin
  RunLocation location;

  @Mixin
  SparkOptions spark;

  @Override
  public Integer call() {
    spark.requireValid();
    RunSettings settings = RunLoader.resolve(location.config, location.workDir);
    WorkDir work = new WorkDir(settings.workDirPath());
    if (work.manifest().isEmpty()) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "work dir " + work.root() + " holds no"
          + " run (no manifest.json); run '" + org.sunder.spark.Launcher.command() + " run "
          + location.config + "' first");
    }
    JavaSparkContext sc = cli.spark().open(spark.master);
    try {
      cli.out().println("report: " + RunReportWriter.write(sc, settings, work, null, null));
      return 0;
    } finally {
      cli.spark().release(sc);
    }
  }
}
