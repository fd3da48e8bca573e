package org.sunder.blockwise.synth;

import java.util.Arrays;
import java.util.Random;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;

/**
 * Realistic synthetic predictions: three kinds of tissue, each with the flaws a trained
 * network's affinities show on it. They are the yardstick for every quality and speed figure:
 * hard enough that a naive seeded watershed on the mean nearest-neighbour affinity makes many
 * errors, varied enough that tuning on one of them does not carry over for free.
 *
 * <p>Every preset uses the same 13 {@link #offsets() offsets} and a volume of
 * {@link #STANDARD_SHAPE} voxels unless another shape is asked for (object counts then scale
 * with the volume, see {@link SynthSpec#scaledTo}). Degradations common to all: boundaries
 * predicted one voxel too wide, missing-boundary patches that the long-range channels see at
 * 40%, false boundaries inside objects, blur, independent noise that is twice as strong on the
 * long-range channels and a spatially correlated share. The kinds:
 *
 * <ul>
 *   <li>{@link #DENSE_NEURITES}: densely packed thin branching fibres, voxels 8 × 8 × 32 nm (z
 *       four times coarser), about 10% background between them, and defective sections (each z
 *       slice is a garbage section with probability 1/100 and a missing one with probability
 *       1/100);
 *   <li>{@link #COMPACT_CELLS}: touching compact cells filling the whole volume (no
 *       background), a few fibres between them, isotropic 10 nm voxels;
 *   <li>{@link #BODIES_AND_NEURITES}: a few large bodies with fibres wrapped around them and an
 *       empty region (a vessel-like cylinder of background along z), voxels 10 × 10 × 20 nm.
 * </ul>
 * Deterministic: a preset, a seed and a shape give the same volume and the same affinities.
 */
public enum TissuePreset {
  DENSE_NEURITES("dense-neurites"),
  COMPACT_CELLS("compact-cells"),
  BODIES_AND_NEURITES("bodies-and-neurites");

  /** The standard volume, memory order x, y, z: 256 × 256 × 96 voxels (6.3 M). */
  public static final long[] STANDARD_SHAPE = {256, 256, 96};

  /**
   * The 13 offsets of every preset, zyx: the three nearest neighbours, then long-range ones up
   * to 3 sections in z and 27 voxels in-plane, two of them diagonal.
   */
  private static final int[][] OFFSETS_ZYX = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1},
      {-2, 0, 0}, {0, -3, 0}, {0, 0, -3}, {-3, 0, 0}, {0, -9, 0}, {0, 0, -9},
      {0, -9, -9}, {0, 9, -9}, {0, -27, 0}, {0, 0, -27}};

  private final String presetName;

  TissuePreset(String presetName) {
    this.presetName = presetName;
  }

  /** The preset's name in configuration, benchmarks and attributes. */
  public String presetName() {
    return presetName;
  }

  /**
   * The preset with that name.
   *
   * @throws SunderException {@link ErrorKind#INVALID_CONFIG} naming the known presets
   */
  public static TissuePreset named(String name) {
    for (TissuePreset p : values()) {
      if (p.presetName.equals(name)) {
        return p;
      }
    }
    throw new SunderException(ErrorKind.INVALID_CONFIG, "tissue preset \"" + name
        + "\": unknown; expected one of " + Arrays.stream(values())
            .map(TissuePreset::presetName).toList());
  }

  /** The offsets every preset uses (13 channels). */
  public static Offsets offsets() {
    return Offsets.fromZyx(OFFSETS_ZYX);
  }

  /** The ground-truth parameters at {@link #STANDARD_SHAPE}. */
  public SynthSpec spec(long seed) {
    return switch (this) {
      case DENSE_NEURITES -> new SynthSpec(seed, STANDARD_SHAPE, new double[] {8, 8, 32}, 160,
          40, 90, 0.3, 0.03, 0, 60, 80, 0, 120, 150, true, 60, 40);
      case COMPACT_CELLS -> new SynthSpec(seed, STANDARD_SHAPE, new double[] {10, 10, 10}, 20,
          20, 40, 0.3, 0.02, 640, 110, 170, 0, 200, 300, false, 60, 60);
      case BODIES_AND_NEURITES -> new SynthSpec(seed, STANDARD_SHAPE,
          new double[] {10, 10, 20}, 200, 40, 90, 0.3, 0.03, 0, 60, 80, 5, 350, 550, false, 60,
          60);
    };
  }

  /** The ground-truth parameters at another shape (memory order), the same tissue scaled. */
  public SynthSpec spec(long seed, long[] shape) {
    return Arrays.equals(shape, STANDARD_SHAPE) ? spec(seed) : spec(seed).scaledTo(shape);
  }

  /** The ground-truth volume, with the empty region where the preset has one. */
  public SyntheticVolume volume(long seed, long[] shape) {
    SynthSpec spec = spec(seed, shape);
    SyntheticVolume volume = SyntheticVolume.generate(spec);
    if (this != BODIES_AND_NEURITES) {
      return volume;
    }
    double[] size = spec.voxelSize();
    double width = shape[0] * size[0];
    double height = shape[1] * size[1];
    Random random = new Random(seed ^ 0x5EEDL);
    double radius = 0.12 * Math.min(width, height);
    return volume.withEmptyCylinder(width * (0.25 + 0.5 * random.nextDouble()),
        height * (0.25 + 0.5 * random.nextDouble()), radius);
  }

  /** The prediction flaws of this tissue kind. */
  public Degradation degradation(long seed) {
    double garbage = this == DENSE_NEURITES ? 0.01 : 0;
    double missing = this == DENSE_NEURITES ? 0.01 : 0;
    return new Degradation(seed, 0.6, 0.08, 0.001, 0.0004, garbage, 1, 0.4, 2.0, 0.08, missing);
  }

  /** Scenario options for writing this preset: its offsets and degradation, float32. */
  public ScenarioOptions scenarioOptions(long seed) {
    return ScenarioOptions.defaults().withOffsets(offsets()).withDegradation(degradation(seed));
  }

  /** The exact and the degraded affinities of {@code volume} (layout of {@link ExactAffinities}). */
  public float[] affinities(SyntheticVolume volume, long seed) {
    int[][] vectors = offsets().vectors();
    float[] exact = ExactAffinities.compute(volume.labels(), volume.shape(), vectors);
    return degradation(seed).apply(volume.labels(), volume.shape(), volume.spec().voxelSize(),
        vectors, exact);
  }
}
