package org.sunder.stitching.bench;

import static org.sunder.stitching.bench.BlockwiseRuns.score;
import static org.sunder.stitching.bench.BlockwiseRuns.toInts;
import static org.sunder.stitching.bench.BlockwiseRuns.toLongs;

import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import java.util.function.Function;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BaselineWatershed;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * How the default method's quality moves with each of its parameters: for every realistic
 * tissue kind and several seeds, the whole-volume default run and variants that change one
 * parameter (the weight bias, the fragments' boundary threshold and seed smoothing, the size
 * filter), scored against ground truth beside the naive watershed tuned per volume (its lowest
 * adapted Rand error over a few thresholds). Prints each case, then per variant and tissue kind
 * the mean ARE and VOI and their ratios to the tuned baseline's means: the evidence behind the
 * defaults. A variant is only worth adopting when it helps every kind, not one.
 *
 * <p>Arguments (optional, positional): {@code x y z} shape (default
 * {@code TissuePreset.STANDARD_SHAPE}), seeds (comma-separated, default 1,2,3), a regular
 * expression choosing the variants by name (default all; the default configuration always runs).
 */
public final class DefaultTuningBenchmark {
  private static final double[] BASELINE_THRESHOLDS = {0.1, 0.15, 0.2, 0.3, 0.5};

  private DefaultTuningBenchmark() {}

  public static void main(String[] args) {
    long[] shape = args.length >= 3
        ? new long[] {Long.parseLong(args[0]), Long.parseLong(args[1]), Long.parseLong(args[2])}
        : TissuePreset.STANDARD_SHAPE.clone();
    long[] seeds = Arrays.stream((args.length >= 4 ? args[3] : "1,2,3").split(","))
        .mapToLong(Long::parseLong).toArray();
    Map<String, Function<PartitionConfig, PartitionConfig>> variants = variants();
    if (args.length >= 5) {
      variants.keySet().removeIf(name -> !name.equals("default") && !name.matches(args[4]));
    }
    // per variant, per kind: sums of ARE, VOI; per kind: the baseline's sums
    Map<String, double[][]> sums = new LinkedHashMap<>();
    variants.keySet().forEach(v -> sums.put(v, new double[TissuePreset.values().length][2]));
    double[][] baseline = new double[TissuePreset.values().length][2];
    for (TissuePreset preset : TissuePreset.values()) {
      for (long seed : seeds) {
        SyntheticVolume volume = preset.volume(seed, shape);
        float[] affinities = preset.affinities(volume, seed);
        long[] truth = volume.labels();
        AffinityBlock block = AffinityBlock.ofFloats(affinities, toInts(shape), new long[3],
            TissuePreset.offsets(), null);
        SegmentationScores naive = null;
        for (double t : BASELINE_THRESHOLDS) {
          SegmentationScores s =
              score(truth, toLongs(new BaselineWatershed(t).partition(block).labels()), true);
          if (naive == null || s.adaptedRandError() < naive.adaptedRandError()) {
            naive = s;
          }
        }
        baseline[preset.ordinal()][0] += naive.adaptedRandError();
        baseline[preset.ordinal()][1] += naive.voi();
        System.out.printf(Locale.ROOT, "%s seed %d: naive tuned ARE %.4f VOI %.3f%n",
            preset.presetName(), seed, naive.adaptedRandError(), naive.voi());
        PartitionConfig standard = PartitionConfig.robustDefault(volume.spec().voxelSize());
        for (Map.Entry<String, Function<PartitionConfig, PartitionConfig>> v
            : variants.entrySet()) {
          SegmentationScores s = score(truth,
              toLongs(v.getValue().apply(standard).create().partition(block).labels()), true);
          sums.get(v.getKey())[preset.ordinal()][0] += s.adaptedRandError();
          sums.get(v.getKey())[preset.ordinal()][1] += s.voi();
          System.out.printf(Locale.ROOT, "  %-28s ARE %.4f VOI %.3f (split %.3f merge %.3f)%n",
              v.getKey(), s.adaptedRandError(), s.voi(), s.voiSplit(), s.voiMerge());
        }
      }
    }
    System.out.printf(Locale.ROOT, "%nmeans over seeds %s, ratio to the tuned naive watershed"
        + " (ARE target <= 0.333, VOI <= 0.5)%n", Arrays.toString(seeds));
    StringBuilder header = new StringBuilder(String.format(Locale.ROOT, "%-28s", "variant"));
    for (TissuePreset preset : TissuePreset.values()) {
      header.append(String.format(Locale.ROOT, " | %-24s", preset.presetName() + " ARE, VOI"));
    }
    System.out.println(header.append(" | worst ARE ratio"));
    for (Map.Entry<String, double[][]> e : sums.entrySet()) {
      StringBuilder line = new StringBuilder(String.format(Locale.ROOT, "%-28s", e.getKey()));
      double worst = 0;
      for (TissuePreset preset : TissuePreset.values()) {
        double[] s = e.getValue()[preset.ordinal()];
        double[] b = baseline[preset.ordinal()];
        worst = Math.max(worst, s[0] / b[0]);
        line.append(String.format(Locale.ROOT, " | %.3f (%.2f), %.2f (%.2f)    ",
            s[0] / seeds.length, s[0] / b[0], s[1] / seeds.length, s[1] / b[1]));
      }
      System.out.println(line.append(String.format(Locale.ROOT, " | %.3f", worst)));
    }
  }

  /** The default and the variants, each changing one parameter of it. */
  private static Map<String, Function<PartitionConfig, PartitionConfig>> variants() {
    Map<String, Function<PartitionConfig, PartitionConfig>> variants = new LinkedHashMap<>();
    variants.put("default", c -> c);
    for (double bias : new double[] {-1, -0.5, 0.5, 1}) {
      variants.put("weight bias " + bias, c -> withWeights(c, bias));
    }
    for (double threshold : new double[] {0.3, 0.4, 0.6}) {
      variants.put("boundaryThreshold " + threshold, c -> withFragments(c, new FragmentOptions(
          threshold, c.fragments().seedSmoothing(), c.fragments().voxelSize(),
          c.fragments().perSlice())));
    }
    for (double sigma : new double[] {0, 2, 4}) {
      variants.put("seedSmoothing " + sigma, c -> withFragments(c, new FragmentOptions(
          c.fragments().boundaryThreshold(), sigma * minimum(c.fragments().voxelSize()),
          c.fragments().voxelSize(), c.fragments().perSlice())));
    }
    variants.put("perSlice flipped", c -> withFragments(c, new FragmentOptions(
        c.fragments().boundaryThreshold(), c.fragments().seedSmoothing(),
        c.fragments().voxelSize(), !c.fragments().perSlice())));
    for (double factor : new double[] {0.25, 4}) {
      variants.put("minSegmentSize x" + factor, c -> new PartitionConfig(c.method(), c.linkage(),
          c.constraints(), c.threshold(), c.weights(), c.subsampling(), c.fragments(),
          (int) Math.max(2, Math.round(c.minSegmentSize() * factor)), c.sizeFilter()));
    }
    variants.put("kernighanLin on", c -> new PartitionConfig(c.method(), c.linkage(),
        c.constraints(), c.threshold(), c.weights(), c.subsampling(), c.fragments(),
        c.minSegmentSize(), c.sizeFilter(), true));
    for (double keep : new double[] {0.25, 0.1}) {
      variants.put("long-range kept " + keep, c -> new PartitionConfig(c.method(), c.linkage(),
          c.constraints(), c.threshold(), c.weights(), Subsampling.hash(keep, 7), c.fragments(),
          c.minSegmentSize(), c.sizeFilter(), c.kernighanLin()));
    }
    return variants;
  }

  private static double minimum(double[] values) {
    return Arrays.stream(values).min().orElse(1);
  }

  private static PartitionConfig withWeights(PartitionConfig c, double bias) {
    double[] perChannel = new double[TissuePreset.offsets().count()];
    Arrays.fill(perChannel, bias);
    return new PartitionConfig(c.method(), c.linkage(), c.constraints(), c.threshold(),
        WeightRule.byValue(WeightRule.Transform.LOGIT, perChannel), c.subsampling(),
        c.fragments(), c.minSegmentSize(), c.sizeFilter());
  }

  private static PartitionConfig withFragments(PartitionConfig c, FragmentOptions fragments) {
    return new PartitionConfig(c.method(), c.linkage(), c.constraints(), c.threshold(),
        c.weights(), c.subsampling(), fragments, c.minSegmentSize(), c.sizeFilter());
  }
}
