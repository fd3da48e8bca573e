package org.sunder.spark.cli;

import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.Launcher;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.demo.DemoScenario;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.stage.RunReport;
import org.sunder.spark.workdir.Stage;
import org.sunder.stitching.demo.DemoVolume;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.ParentCommand;

/** {@code sunder demo}. */
@Command(name = "demo", mixinStandardHelpOptions = true,
    description = {"See Sunder work end to end on this machine: generate a synthetic tissue"
        + " volume with known ground truth and imperfect affinities, segment it with Spark in"
        + " local mode, score the result against the ground truth, and print where everything"
        + " is. Rerunning reuses the volume and the finished run."})
final class DemoCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Option(names = "--dir", paramLabel = "DIR", defaultValue = "sunder-demo",
      description = "Where the volume, configuration and results go (default: ${DEFAULT-VALUE}).")
  Path dir;

  @Option(names = "--format", paramLabel = "FORMAT", defaultValue = "zarr",
      description = "Container format, zarr or n5 (default: ${DEFAULT-VALUE}).")
  String format;

  @Option(names = "--tissue", paramLabel = "KIND", defaultValue = "compact-cells",
      description = "Kind of synthetic tissue: compact-cells, dense-neurites or"
          + " bodies-and-neurites (default: ${DEFAULT-VALUE}).")
  String tissue;

  @Option(names = "--shape", paramLabel = "Z,Y,X", defaultValue = "48,128,128",
      description = "Volume shape in voxels, slowest axis first (default: ${DEFAULT-VALUE}).")
  String shapeText;

  @Option(names = "--seed", defaultValue = "13",
      description = "Seed of the synthetic volume (default: ${DEFAULT-VALUE}).")
  long seed;

  @Option(names = "--fresh", description = "Redo the run from scratch (default: resume).")
  boolean fresh;

  @Mixin
  SparkOptions spark;

  private long[] shape() {
    String[] parts = shapeText.split(",");
    long[] shape = new long[parts.length];
    try {
      for (int i = 0; i < parts.length; i++) {
        shape[i] = Long.parseLong(parts[i].trim());
      }
    } catch (NumberFormatException e) {
      shape = new long[0];
    }
    if (shape.length != 3 || shape[0] < 8 || shape[1] < 16 || shape[2] < 16) {
      throw new ConfigException("--shape: expected Z,Y,X with Z >= 8 and Y, X >= 16, got '"
          + shapeText + "'");
    }
    return shape;
  }

  @Override
  public Integer call() {
    spark.requireValid();
    DemoVolume volume;
    try {
      volume = DemoVolume.in(dir, format);
    } catch (SunderException e) {
      throw new ConfigException("--format: " + e.getMessage());
    }
    long[] shape = shape();
    try {
      DemoVolume.requireTissue(tissue);
    } catch (SunderException e) {
      throw new ConfigException("--tissue: " + e.getMessage());
    }
    if (volume.isWritten()) {
      cli.out().println("demo: reusing the synthetic volume in " + volume.container()
          + " (delete it to generate another with --shape, --tissue or --seed)");
    } else {
      cli.out().println("demo: preparing a synthetic volume in " + volume.container());
    }
    Path config = DemoScenario.prepare(dir, volume, tissue, shape, seed);
    RunReport report;
    String output;
    try (PreparedRun run = RunLoader.prepare(config, null, fresh)) {
      output = run.settings().outputContainer();
      report = cli.runStages(run, List.of(Stage.values()), spark.master);
    }
    report.print(cli.out());
    cli.out().println(volume.yardstick());
    cli.out().println();
    cli.out().println("The demo volume is synthetic; automated segmentations of real data contain"
        + " errors and need proofreading.");
    cli.out().println("configuration: " + config);
    cli.out().println("look inside:   " + Launcher.command() + " inspect " + output);
    cli.out().println("rerun:         " + Launcher.command() + " run " + config
        + "   (finished work is skipped)");
    return 0;
  }
}
