package org.sunder.stitching.demo;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.metrics.TunedBaseline;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * The demo's input: a realistic synthetic tissue volume ({@link TissuePreset}) with imperfect
 * affinities and its ground truth, written once into a container in the demo directory, and the
 * yardstick measured on it (the naive seeded watershed, tuned on the ground truth). Writing is
 * O(voxels · offsets); the yardstick partitions the whole volume once per tried threshold.
 */
public final class DemoVolume {
  /** The affinities dataset. */
  public static final String AFFINITIES = SyntheticScenario.AFFINITIES;
  /** The ground-truth dataset. */
  public static final String GROUND_TRUTH = SyntheticScenario.GROUND_TRUTH;

  private final Path container;
  private final StorageFormat format;

  private DemoVolume(Path container, StorageFormat format) {
    this.container = container;
    this.format = format;
  }

  /**
   * The demo volume in {@code dir}: {@code volume.zarr} or {@code volume.n5}.
   *
   * @param formatName {@code zarr} or {@code n5}, in any case
   * @throws SunderException INVALID_CONFIG naming the value; the caller names the option
   */
  public static DemoVolume in(Path dir, String formatName) {
    StorageFormat format = switch (formatName.toLowerCase(Locale.ROOT)) {
      case "zarr" -> StorageFormat.ZARR;
      case "n5" -> StorageFormat.N5;
      default -> throw new SunderException(ErrorKind.INVALID_CONFIG,
          "expected zarr or n5, got '" + formatName + "'");
    };
    return new DemoVolume(dir.resolve(format == StorageFormat.N5 ? "volume.n5" : "volume.zarr")
        .toAbsolutePath().normalize(), format);
  }

  /**
   * Checks that {@code tissue} names a tissue preset.
   *
   * @throws SunderException INVALID_CONFIG naming the presets there are
   */
  public static void requireTissue(String tissue) {
    TissuePreset.named(tissue);
  }

  /** The container the volume lives in (absolute). */
  public Path container() {
    return container;
  }

  /** Whether the container already holds the affinities. */
  public boolean isWritten() {
    return Files.isDirectory(container.resolve(AFFINITIES));
  }

  /**
   * Writes the volume of preset {@code tissue}, shape {@code zyx} (slowest axis first) and
   * {@code seed}, in chunks of at most 16 × 64 × 64 voxels (zyx).
   */
  public void write(String tissue, long[] zyx, long seed) {
    TissuePreset preset = TissuePreset.named(tissue);
    long[] xyz = {zyx[2], zyx[1], zyx[0]};
    ScenarioOptions options = preset.scenarioOptions(seed).withChunkShape(chunks(xyz));
    SyntheticScenario.write(Container.create(container, format), preset.volume(seed, xyz),
        options);
  }

  /**
   * The block shape for a volume of shape {@code zyx} (zyx): one chunk per block, so that even
   * the small demo volume is stitched from several blocks.
   */
  public static int[] blockShape(long[] zyx) {
    int[] xyz = chunks(new long[] {zyx[2], zyx[1], zyx[0]});
    return new int[] {xyz[2], xyz[1], xyz[0]};
  }

  private static int[] chunks(long[] xyz) {
    return new int[] {(int) Math.min(64, xyz[0]), (int) Math.min(64, xyz[1]),
        (int) Math.min(16, xyz[2])};
  }

  /**
   * The yardstick printed beside the run's scores, one line: the naive seeded watershed of the
   * written volume at the best of {@link TunedBaseline#THRESHOLDS} against the ground truth.
   */
  public String yardstick() {
    Container c = Container.open(container);
    TunedBaseline naive = TunedBaseline.of(c.openDataset(AFFINITIES), TissuePreset.offsets(),
        c.openDataset(GROUND_TRUTH));
    return String.format(Locale.ROOT, "yardstick: naive seeded watershed (threshold %.2f,"
        + " the best of %s): adapted Rand error %.4f, VOI split %.4f, merge %.4f,"
        + " %d segments", naive.threshold(), Arrays.toString(TunedBaseline.THRESHOLDS),
        naive.scores().adaptedRandError(), naive.scores().voiSplit(),
        naive.scores().voiMerge(), naive.segmentation().segmentCount());
  }
}
