package org.sunder.spark.it;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.metrics.TunedBaseline;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.spark.cli.CliRun;

/**
 * A small realistic case of each tissue kind, end to end through Spark local mode with the
 * configuration naming no method: the default must beat the naive seeded watershed, tuned on
 * the ground truth, by a clear margin in adapted Rand error.
 */
class RealisticQualityTest {
  private static final long[] SHAPE_XYZ = {128, 128, 32};
  private static final int[] CHUNK_XYZ = {64, 64, 16};
  /** The default's error must be at most this share of the tuned naive watershed's. */
  private static final double MARGIN = 0.6;
  @RegisterExtension
  static final SharedSpark.PerClass SPARK = SharedSpark.perClass("local[2]");

  @ParameterizedTest
  @EnumSource(TissuePreset.class)
  void theDefaultBeatsTheNaiveWatershed(TissuePreset preset, @TempDir Path dir) {
    long seed = 21;
    Path root = dir.resolve("case.zarr");
    Container container = Container.create(root, StorageFormat.ZARR);
    SyntheticScenario.write(container, preset.volume(seed, SHAPE_XYZ),
        preset.scenarioOptions(seed).withChunkShape(CHUNK_XYZ));
    Path config = dir.resolve("run.json");
    Scenes.writeConfig(config, root, CHUNK_XYZ, "{}", null);

    CliRun run = CliRun.with(SPARK.source(), "run", config.toString());
    assertEquals(0, run.exitCode(), () -> run.out() + run.err());

    long[] truth = Scenes.labels(root, SyntheticScenario.GROUND_TRUTH);
    ContingencyTable table = new ContingencyTable();
    table.add(truth, Scenes.labels(root, "segmentation"));
    SegmentationScores sunder = new Scorer(ScoreOptions.DEFAULT).score(table);
    TunedBaseline naive = TunedBaseline.of(container.openDataset(SyntheticScenario.AFFINITIES),
        TissuePreset.offsets(), container.openDataset(SyntheticScenario.GROUND_TRUTH));
    System.out.printf("%s: default ARE %.4f VOI %.3f; naive (threshold %.2f) ARE %.4f VOI %.3f%n",
        preset.presetName(), sunder.adaptedRandError(), sunder.voi(), naive.threshold(),
        naive.scores().adaptedRandError(), naive.scores().voi());
    assertTrue(sunder.adaptedRandError() <= MARGIN * naive.scores().adaptedRandError(),
        preset.presetName() + ": default " + sunder.adaptedRandError() + " against naive "
            + naive.scores().adaptedRandError());
  }
}
