package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.mutex.MutexWatershedPartitioner;

/** Exact affinities plus the Mutex Watershed give back the ground truth: VOI 0. */
class ExactAffinityRecoveryTest {

  private static final Offsets OFFSETS = SyntheticScenario.defaultOffsets();

  private static SegmentationScores mutexWatershed(SyntheticVolume v, float[] affinities,
      WeightRule rule, boolean ignoreZero) {
    return mutexWatershed(v, affinities, OFFSETS, rule, ignoreZero);
  }

  private static SegmentationScores mutexWatershed(SyntheticVolume v, float[] affinities,
      Offsets offsets, WeightRule rule, boolean ignoreZero) {
    long[] s = v.shape();
    int[] shape = {(int) s[0], (int) s[1], (int) s[2]};
    AffinityBlock block = AffinityBlock.ofFloats(affinities, shape, new long[3], offsets, null);
    Segmentation segmentation =
        new MutexWatershedPartitioner(rule, Subsampling.none()).partition(block);
    long[] labels = Arrays.stream(segmentation.labels()).asLongStream().toArray();
    ContingencyTable table = new ContingencyTable();
    table.add(v.labels(), labels);
    return new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(ignoreZero)).score(table);
  }

  private static float[] exact(SyntheticVolume v) {
    return ExactAffinities.compute(v.labels(), v.shape(), OFFSETS.vectors());
  }

  @Test
  void denseVolumeIsRecoveredExactlyUnderBothWeightRules() {
    SyntheticVolume v = SyntheticVolume.generate(SynthSpec.small(13));
    float[] a = exact(v);
    for (WeightRule rule : new WeightRule[] {WeightRule.byChannelRole(),
        WeightRule.byValue(WeightRule.Transform.CENTERED, null)}) {
      SegmentationScores s = mutexWatershed(v, a, rule, false);
      assertEquals(0.0, s.voiSplit(), rule.toString());
      assertEquals(0.0, s.voiMerge(), rule.toString());
      assertEquals(1.0, s.adjustedRandIndex());
      assertEquals(v.objectCount(), s.segmentCount());
      assertEquals(v.objectCount(), s.groundTruthObjectCount());
    }
  }

  @Test
  void volumeWithBackgroundIsRecoveredExactlyOnItsObjects() {
    SyntheticVolume v = SyntheticVolume.generate(SynthSpec.small(14).withBackground(true));
    long background = Arrays.stream(v.labels()).filter(l -> l == 0).count();
    assertTrue(background > 0);
    SegmentationScores s = mutexWatershed(v, exact(v), WeightRule.byChannelRole(), true);
    assertEquals(0.0, s.voi());
    assertEquals(0.0, s.adaptedRandError());
    assertEquals(v.objectCount(), s.groundTruthObjectCount());
    // background has affinity 0 to everything, so each background voxel stays alone
    SegmentationScores all = mutexWatershed(v, exact(v), WeightRule.byChannelRole(), false);
    assertEquals(v.objectCount() + background, all.segmentCount());
  }

  @Test
  void gapsMergeObjectsWithoutRepulsionAndLongRangeRepulsionResistsThem() {
    SyntheticVolume v = SyntheticVolume.generate(SynthSpec.small(13));
    Degradation gaps = new Degradation(13, 0, 0, 0.02, 0, 0);
    Offsets nearest = Offsets.fromZyx(new int[][] {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}});
    SegmentationScores attractiveOnly = mutexWatershed(v, gaps, nearest);
    assertTrue(attractiveOnly.voiMerge() > 0.05, "merge VOI " + attractiveOnly.voiMerge());
    assertEquals(0.0, attractiveOnly.voiSplit(), "gaps only merge");
    assertTrue(!attractiveOnly.worstMerges().isEmpty());
    SegmentationScores withRepulsion = mutexWatershed(v, gaps, OFFSETS);
    assertTrue(withRepulsion.voiMerge() < attractiveOnly.voiMerge(),
        withRepulsion.voiMerge() + " vs " + attractiveOnly.voiMerge());
  }

  private static SegmentationScores mutexWatershed(SyntheticVolume v, Degradation d,
      Offsets offsets) {
    int[][] vectors = offsets.vectors();
    float[] a = d.apply(v.labels(), v.shape(), v.spec().voxelSize(), vectors,
        ExactAffinities.compute(v.labels(), v.shape(), vectors));
    return mutexWatershed(v, a, offsets, WeightRule.byChannelRole(), false);
  }
}
