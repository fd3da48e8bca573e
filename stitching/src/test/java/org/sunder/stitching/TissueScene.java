package org.sunder.stitching;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * A synthetic test volume (the synth package's tissue generator): ground truth, offsets and
 * affinities (exact, or degraded), arrays in memory order, affinities channel last.
 */
public final class TissueScene {
  final int[] shape;
  final long[] groundTruth;
  final float[] affinities;
  final int[][] offsets;

  TissueScene(int[] shape, long[] groundTruth, float[] affinities, int[][] offsets) {
    this.shape = shape;
    this.groundTruth = groundTruth;
    this.affinities = affinities;
    this.offsets = offsets;
  }

  static TissueScene generate(SynthSpec spec, int[][] offsets, Degradation degradation) {
    SyntheticVolume volume = SyntheticVolume.generate(spec);
    long[] shape = volume.shape();
    long[] labels = volume.labels();
    float[] exact = ExactAffinities.compute(labels, shape, offsets);
    float[] affinities = degradation.isNone() ? exact
        : degradation.apply(labels, shape, spec.voxelSize(), offsets, exact);
    return new TissueScene(new int[] {(int) shape[0], (int) shape[1], (int) shape[2]}, labels,
        affinities, offsets);
  }

  /** The small synthetic tissue of the given shape and seed. */
  public static TissueScene small(long seed, long[] shape, Degradation degradation) {
    return generate(SynthSpec.small(seed).withShape(shape), SceneStore.offsets(), degradation);
  }

  /** A realistic tissue preset: its ground truth, offsets and degraded affinities. */
  static TissueScene ofPreset(TissuePreset preset, long seed, long[] shape) {
    SyntheticVolume volume = preset.volume(seed, shape);
    return new TissueScene(new int[] {(int) shape[0], (int) shape[1], (int) shape[2]},
        volume.labels(), preset.affinities(volume, seed), TissuePreset.offsets().vectors());
  }

  /** The whole volume's affinities as one block at the origin. */
  AffinityBlock wholeBlock() {
    return AffinityBlock.ofFloats(affinities, shape, new long[3], Offsets.of(offsets), null);
  }

  int voxelCount() {
    return shape[0] * shape[1] * shape[2];
  }

  public static void position(int index, int[] shape, int[] out) {
    out[0] = index % shape[0];
    out[1] = index / shape[0] % shape[1];
    out[2] = index / (shape[0] * shape[1]);
  }
}
