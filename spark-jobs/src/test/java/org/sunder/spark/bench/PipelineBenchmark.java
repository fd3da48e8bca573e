package org.sunder.spark.bench;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.spark.config.ConfigReader;
import org.sunder.spark.it.Scenes;
import org.sunder.spark.it.SharedSpark;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.run.RunResolver;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.stage.RunReport;
import org.sunder.spark.stage.StageReport;
import org.sunder.spark.workdir.Stage;
import org.sunder.stitching.InProcessRunner;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The whole pipeline on a synthetic 128 x 512 x 512 (z, y, x) volume in {@code local[2]}:
 * voxels per second end to end, seconds per stage, and the ratio to the stitching module's
 * in-process runner (one thread) on the same volume and settings, measured in the same run.
 * Not a test. Arguments: {@code [dir] [z y x]}; needs about 6 GB of heap to generate the volume.
 */
public final class PipelineBenchmark {
  private PipelineBenchmark() {}

  public static void main(String[] args) throws Exception {
    Path dir = args.length > 0 ? Path.of(args[0]) : Files.createTempDirectory("sunder-bench");
    long[] zyx = args.length >= 4 ? new long[] {Long.parseLong(args[1]), Long.parseLong(args[2]),
        Long.parseLong(args[3])} : new long[] {128, 512, 512};
    Path root = dir.resolve("bench.zarr");
    int[] chunkXyz = {64, 64, 32};
    long voxels = zyx[0] * zyx[1] * zyx[2];
    long t0 = System.nanoTime();
    double scale = voxels / (64.0 * 56 * 20);
    SynthSpec spec = SynthSpec.small(13).withShape(zyx[2], zyx[1], zyx[0])
        .withCounts((int) (30 * scale), (int) Math.max(1, 4 * scale), (int) Math.max(1, scale));
    SyntheticScenario.write(Container.create(root, StorageFormat.ZARR), spec,
        ScenarioOptions.defaults().withDegradation(Degradation.moderate(13))
            .withChunkShape(chunkXyz));
    System.out.printf(Locale.ROOT, "generated %d x %d x %d (zyx) in %.1f s%n", zyx[0], zyx[1],
        zyx[2], (System.nanoTime() - t0) / 1e9);
    Path config = dir.resolve("bench.json");
    int[] blockXyz = {128, 128, 64};
    Scenes.writeConfig(config, root, blockXyz, "{\"method\": \"mutex-watershed\"}", null);

    JavaSparkContext sc = SharedSpark.start("local[2]");
    RunReport report;
    try (PreparedRun run = RunLoader.prepare(config, null, true)) {
      ByteArrayOutputStream progress = new ByteArrayOutputStream();
      report = new Pipeline(sc, System.out, new PrintStream(progress, true,
          StandardCharsets.UTF_8), false).run(run, List.of(Stage.PARTITION, Stage.SEAMS,
              Stage.SOLVE, Stage.RELABEL));
    } finally {
      sc.stop();
    }
    double sparkSeconds = 0;
    for (StageReport stage : report.stages()) {
      System.out.println(stage.line());
      sparkSeconds += stage.seconds();
    }

    RunSettings s = RunResolver.resolve(new ConfigReader().read(config));
    StitchingSetup local = s.setup().withLabels("in-process");
    long t1 = System.nanoTime();
    InProcessRunner.run(local);
    double localSeconds = (System.nanoTime() - t1) / 1e9;
    boolean same = java.util.Arrays.equals(Scenes.labels(root, "segmentation"),
        Scenes.labels(root, "in-process"));
    System.out.printf(Locale.ROOT, "spark local[2]: %.2f s, %.0f voxels/s end to end%n",
        sparkSeconds, voxels / sparkSeconds);
    System.out.printf(Locale.ROOT, "in-process (1 thread): %.2f s, %.0f voxels/s%n", localSeconds,
        voxels / localSeconds);
    System.out.printf(Locale.ROOT, "speed-up of local[2] over in-process: %.2f; same ids: %s%n",
        localSeconds / sparkSeconds, same);
  }
}
