package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * {@link DefectiveSections} on dense-neurite volumes (the preset's prediction flaws without its
 * random defective sections) with defects put into chosen planes: a garbage plane (uniform
 * random values on every channel) and a missing one (every edge with an end in it uncertain,
 * in [0.3, 0.5)), as {@link Degradation} makes them.
 */
class DefectiveSectionsTest {
  private static final int[] SHAPE = {64, 64, 24};
  private static final int GARBAGE = 7;
  private static final int MISSING = 15;

  private record Volume(long[] truth, float[] sound, float[] defective, double[] voxelSize) {}

  private static Volume volume(long seed) {
    TissuePreset preset = TissuePreset.DENSE_NEURITES;
    SyntheticVolume volume = SyntheticVolume.generate(
        preset.spec(seed).scaledTo(SHAPE[0], SHAPE[1], SHAPE[2]));
    int[][] vectors = TissuePreset.offsets().vectors();
    float[] exact = ExactAffinities.compute(volume.labels(), volume.shape(), vectors);
    Degradation d = preset.degradation(seed);
    Degradation noDefects = new Degradation(d.seed(), d.blurSigma(), d.noiseSigma(),
        d.gapRate(), d.falseBoundaryRate(), 0, d.boundaryWidening(), d.gapLongRangeStrength(),
        d.longRangeNoiseFactor(), d.correlatedNoiseSigma(), 0);
    float[] sound = noDefects.apply(volume.labels(), volume.shape(), volume.spec().voxelSize(),
        vectors, exact);
    float[] defective = sound.clone();
    int plane = SHAPE[0] * SHAPE[1];
    int n = plane * SHAPE[2];
    Random random = new Random(seed);
    for (int k = 0; k < vectors.length; k++) {
      for (int i = GARBAGE * plane; i < (GARBAGE + 1) * plane; i++) {
        defective[k * n + i] = random.nextFloat();
      }
      for (int i = 0; i < n; i++) {
        int z = i / plane;
        int target = z + vectors[k][2];
        if (z == MISSING || target == MISSING) {
          defective[k * n + i] = 0.3f + 0.2f * random.nextFloat();
        }
      }
    }
    return new Volume(volume.labels(), sound, defective, volume.spec().voxelSize());
  }

  private static AffinityBlock block(float[] values) {
    return AffinityBlock.ofFloats(values, SHAPE, new long[3], TissuePreset.offsets(), null);
  }

  @Test
  void findsTheGarbageAndTheMissingPlaneAndNothingInSoundData() {
    for (long seed = 1; seed <= 3; seed++) {
      Volume v = volume(seed);
      boolean[] expected = new boolean[SHAPE[2]];
      expected[GARBAGE] = true;
      expected[MISSING] = true;
      assertArrayEquals(expected, DefectiveSections.find(block(v.defective()), v.voxelSize()),
          "seed " + seed);
      assertNull(DefectiveSections.find(block(v.sound()), v.voxelSize()), "seed " + seed);
      // isotropic voxels have no sections
      assertNull(DefectiveSections.find(block(v.defective()), new double[] {8, 8, 8}));
    }
  }

  /**
   * Empty planes at the end of the tissue (every affinity 0: nothing joins, as exact affinities
   * of background read) are no missing sections; the missing plane between sound ones still is.
   */
  @Test
  void aRunOfEmptyPlanesIsNoDefect() {
    Volume v = volume(4);
    float[] values = v.defective().clone();
    int plane = SHAPE[0] * SHAPE[1];
    int n = plane * SHAPE[2];
    for (int k = 0; k < TissuePreset.offsets().count(); k++) {
      java.util.Arrays.fill(values, k * n + (SHAPE[2] - 4) * plane, (k + 1) * n, 0f);
    }
    boolean[] expected = new boolean[SHAPE[2]];
    expected[GARBAGE] = true;
    expected[MISSING] = true;
    assertArrayEquals(expected, DefectiveSections.find(block(values), v.voxelSize()));
  }

  /**
   * Data noisy everywhere (every plane as incoherent as a garbage one) has no defective
   * sections: the rules judge planes against the typical plane.
   */
  @Test
  void noiseEverywhereIsNoDefect() {
    Random random = new Random(8);
    float[] values = new float[SHAPE[0] * SHAPE[1] * SHAPE[2] * TissuePreset.offsets().count()];
    for (int i = 0; i < values.length; i++) {
      values[i] = random.nextFloat();
    }
    assertNull(DefectiveSections.find(block(values), new double[] {8, 8, 32}));
  }

  /**
   * A garbage plane's incoherence is the mean of {@code |U - V|} for independent uniforms on
   * [0, 1], which is 1/3 (a fact of probability).
   */
  @Test
  void garbagePlaneReadsTheMeanDifferenceOfTwoUniforms() {
    Volume v = volume(1);
    DefectiveSections.PlaneFigures figures = DefectiveSections.measure(block(v.defective()));
    assertEquals(1 / 3.0, figures.incoherence()[GARBAGE], 0.01);
    assertEquals(0.0, figures.attraction()[MISSING]);
    assertTrue(figures.incoherence()[GARBAGE + 1] < DefectiveSections.MAX_INCOHERENCE);
  }

  @Test
  void sourceIsTheNearestSoundPlaneTheLowerOnTies() {
    boolean[] defective = {true, false, true, true, false, true};
    assertEquals(1, DefectiveSections.source(defective, 0));
    assertEquals(1, DefectiveSections.source(defective, 2));
    assertEquals(4, DefectiveSections.source(defective, 3));
    assertEquals(4, DefectiveSections.source(defective, 5));
    assertEquals(-1, DefectiveSections.source(new boolean[] {true, true}, 1));
  }

  @Test
  void adoptedLabelsCopyTheSourcePlaneAndStayConsecutive() {
    Random random = new Random(5);
    int[] shape = {5, 4, 6};
    for (int trial = 0; trial < 50; trial++) {
      int[] labels = new int[5 * 4 * 6];
      for (int i = 0; i < labels.length; i++) {
        labels[i] = random.nextInt(4) == 0 ? 0 : 1 + random.nextInt(30);
      }
      boolean[] defective = new boolean[6];
      for (int p = 0; p < 6; p++) {
        defective[p] = random.nextInt(3) == 0;
      }
      int[] before = labels.clone();
      int[] after = DefectiveSections.adopt(labels.clone(), shape, defective);
      // the same partition as copying, voxel by voxel, then numbering by first voxel
      int[] copied = before.clone();
      for (int p = 0; p < 6; p++) {
        int q = defective[p] ? DefectiveSections.source(defective, p) : -1;
        for (int i = 0; q >= 0 && i < 20; i++) {
          if (before[q * 20 + i] != 0 && before[p * 20 + i] != 0) {
            copied[p * 20 + i] = before[q * 20 + i];
          }
        }
      }
      Map<Integer, Integer> number = new HashMap<>();
      for (int i = 0; i < copied.length; i++) {
        int l = copied[i];
        int expected = l == 0 ? 0 : number.computeIfAbsent(l, x -> number.size() + 1);
        assertEquals(expected, after[i], "trial " + trial + ", voxel " + i);
      }
    }
  }

  @Test
  void regionGraphLeavesOutTheIgnoredVoxelsEdges() {
    Volume v = volume(2);
    AffinityBlock block = block(v.defective());
    int[] labels = BlockFragments.label(block, FragmentOptions.fittedTo(v.voxelSize()));
    byte[] ignored = new byte[labels.length];
    for (int i = 0; i < ignored.length; i++) {
      ignored[i] = (byte) (i % 7 == 0 || i / (SHAPE[0] * SHAPE[1]) == GARBAGE ? 1 : 0);
    }
    GridGraph graph = GridGraph.of(block, WeightRule.byChannelRole(), Subsampling.none());
    EdgeStatistics statistics = RegionGraph.of(labels, graph, null, ignored).statistics();
    Map<List<Long>, double[]> expected = new HashMap<>();
    graph.forEachEdgeAcross(labels, (s, t, k, w) -> {
      if (labels[s] != 0 && labels[t] != 0 && ignored[s] == 0 && ignored[t] == 0) {
        double[] sum = expected.computeIfAbsent(List.of((long) Math.min(labels[s], labels[t]),
            (long) Math.max(labels[s], labels[t])), key -> new double[2]);
        sum[0] += w;
        sum[1]++;
      }
    });
    assertEquals(expected.size(), statistics.size());
    for (int e = 0; e < statistics.size(); e++) {
      double[] sum = expected.get(List.of(statistics.u(e), statistics.v(e)));
      assertEquals(sum[1], statistics.count(e));
      assertEquals(sum[0], statistics.sum(e), 1e-9 * Math.max(1, Math.abs(sum[0])));
    }
  }

  /**
   * The default method steps over the two defects: its adapted Rand error on the volume with
   * them stays within 0.04 of its error on the same volume without them (measured: 0.015 to
   * 0.030 above; 0.075 above on seed 1 with the defects left in), and the garbage plane's
   * fragments are those of the plane below it.
   */
  @Test
  void theDefaultMethodStepsOverDefects() {
    for (long seed = 1; seed <= 3; seed++) {
      Volume v = volume(seed);
      PartitionConfig config = PartitionConfig.robustDefault(v.voxelSize());
      double sound = score(v.truth(), config.create().partition(block(v.sound())).labels());
      double defective =
          score(v.truth(), config.create().partition(block(v.defective())).labels());
      assertTrue(defective < sound + 0.04, "seed " + seed + ": " + defective + " against "
          + sound + " without defects");
      int[] fragments = BlockFragments.label(block(v.defective()),
          FragmentOptions.fittedTo(v.voxelSize()));
      int plane = SHAPE[0] * SHAPE[1];
      for (int i = GARBAGE * plane; i < (GARBAGE + 1) * plane; i++) {
        if (fragments[i] != 0 && fragments[i - plane] != 0) {
          assertEquals(fragments[i - plane], fragments[i]);
        }
      }
      assertNotEquals(0, fragments[GARBAGE * plane]);
    }
  }

  private static double score(long[] truth, int[] labels) {
    long[] segmentation = new long[labels.length];
    for (int i = 0; i < labels.length; i++) {
      segmentation[i] = labels[i];
    }
    ContingencyTable table = new ContingencyTable();
    table.add(truth, segmentation);
    SegmentationScores s = new Scorer(ScoreOptions.DEFAULT).score(table);
    return s.adaptedRandError();
  }
}
