package org.sunder.blockwise.synth.bench;

import java.util.Arrays;
import java.util.Locale;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.metrics.TunedBaseline;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BaselineWatershed;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * Whole-volume survey of the tissue presets: per preset and seed, the ground truth's object
 * count and background share, generation time, and the scores of the naive watershed and of
 * each partition configuration given, all on one thread.
 *
 * <p>Arguments: {@code x y z} shape (default the standard shape), seeds (comma-separated,
 * default 1,2,3), then partition configurations as JSON strings. System properties:
 * {@code -Dpreset=NAME} surveys one preset; {@code -Dflaws=a,b,...} replaces the preset's
 * degradation by the {@link Degradation} with those ten strengths after the seed, in
 * the record's order (for exploring how hard a flaw makes the data).
 */
public final class PresetSurvey {
  private PresetSurvey() {}

  public static void main(String[] args) {
    long[] shape = args.length >= 3 ? new long[] {Long.parseLong(args[0]),
        Long.parseLong(args[1]), Long.parseLong(args[2])} : TissuePreset.STANDARD_SHAPE;
    long[] seeds = Arrays.stream((args.length >= 4 ? args[3] : "1,2,3").split(","))
        .mapToLong(Long::parseLong).toArray();
    String[] configs = args.length > 4 ? Arrays.copyOfRange(args, 4, args.length) : new String[0];
    String only = System.getProperty("preset");
    for (TissuePreset preset : TissuePreset.values()) {
      if (only != null && !only.equals(preset.presetName())) {
        continue;
      }
      for (long seed : seeds) {
        long t0 = System.nanoTime();
        SyntheticVolume volume = preset.volume(seed, shape);
        long t1 = System.nanoTime();
        float[] affinities = affinities(preset, volume, seed);
        long t2 = System.nanoTime();
        long background = Arrays.stream(volume.labels()).filter(l -> l == 0).count();
        System.out.printf(Locale.ROOT, "%s seed %d: %d objects, %.1f%% background, "
            + "generate %.1f s, affinities %.1f s%n", preset.presetName(), seed,
            volume.objectCount(), 100.0 * background / volume.labels().length, (t1 - t0) / 1e9,
            (t2 - t1) / 1e9);
        int[] s = {(int) shape[0], (int) shape[1], (int) shape[2]};
        AffinityBlock block = AffinityBlock.ofFloats(affinities, s, new long[3],
            TissuePreset.offsets(), null);
        long t3 = System.nanoTime();
        for (double threshold : TunedBaseline.THRESHOLDS) {
          report("naive watershed " + threshold, volume,
              new BaselineWatershed(threshold).partition(block).labels(), System.nanoTime() - t3);
          t3 = System.nanoTime();
        }
        for (String json : configs) {
          long t4 = System.nanoTime();
          Segmentation seg = PartitionConfig.fromJson(json).create().partition(block);
          report(json, volume, seg.labels(), System.nanoTime() - t4);
        }
      }
    }
  }

  /** The preset's affinities, or those of the degradation in {@code -Dflaws=a,b,...}. */
  private static float[] affinities(TissuePreset preset, SyntheticVolume volume, long seed) {
    String flaws = System.getProperty("flaws");
    if (flaws == null) {
      return preset.affinities(volume, seed);
    }
    double[] v = Arrays.stream(flaws.split(",")).mapToDouble(Double::parseDouble).toArray();
    Degradation d = new Degradation(seed, v[0], v[1], v[2], v[3], v[4], (int) v[5], v[6], v[7],
        v[8], v[9]);
    int[][] offsets = TissuePreset.offsets().vectors();
    return d.apply(volume.labels(), volume.shape(), volume.spec().voxelSize(), offsets,
        ExactAffinities.compute(volume.labels(), volume.shape(), offsets));
  }

  private static void report(String what, SyntheticVolume volume, int[] labels, long nanos) {
    long[] seg = new long[labels.length];
    long max = 0;
    for (int i = 0; i < labels.length; i++) {
      seg[i] = labels[i];
      max = Math.max(max, labels[i]);
    }
    ContingencyTable table = new ContingencyTable();
    table.add(volume.labels(), seg);
    SegmentationScores scores = new Scorer(ScoreOptions.DEFAULT).score(table);
    System.out.printf(Locale.ROOT, "  %-60s ARE %.3f  VOI %.3f (split %.3f merge %.3f)  "
        + "%d segments  %.1f s%n", what, scores.adaptedRandError(), scores.voi(),
        scores.voiSplit(), scores.voiMerge(), max, nanos / 1e9);
  }
}
