package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.api.Test;

class RegionGraphTest {

  @Test
  void statisticsEqualThoseOfTheVoxelEdgesBetweenLabels() {
    Random random = new Random(13);
    int[] shape = {9, 6, 5};
    int n = 270;
    Offsets offsets = GridGraphTest.OFFSETS;
    int[] labels = new int[n];
    for (int i = 0; i < n; i++) {
      int[] p = {i % 9, (i / 9) % 6, i / 54};
      labels[i] = 1 + (p[0] / 3) + 3 * (p[1] / 4) + (p[2] > 2 ? 6 : 0);
    }
    labels[17] = 0;
    byte[] mask = new byte[n];
    java.util.Arrays.fill(mask, (byte) 1);
    mask[100] = 0;
    GridGraph graph = GridGraph.of(AffinityBlock.ofFloats(
        GridGraphTest.randomAffinities(n, offsets.count(), random), shape, new long[3], offsets,
        mask), WeightRule.byValue(WeightRule.Transform.CENTERED, null), Subsampling.hash(0.5, 3));
    EdgeStatistics stats = RegionGraph.of(labels, graph).statistics();
    EdgeStatistics want = edgeByEdge(graph, labels, null);
    assertEquals(want.size(), stats.size());
    for (int i = 0; i < want.size(); i++) {
      assertEquals(want.u(i), stats.u(i));
      assertEquals(want.v(i), stats.v(i));
      assertEquals(want.count(i), stats.count(i));
      assertEquals(want.sum(i), stats.sum(i), 1e-9);
      assertEquals(want.min(i), stats.min(i));
      assertEquals(want.max(i), stats.max(i));
    }
    long[] wide = new long[n];
    for (int i = 0; i < n; i++) {
      wide[i] = labels[i] == 0 ? 0 : labels[i] + (1L << 45);
    }
    EdgeStatistics longStats = RegionGraph.of(wide, graph).statistics();
    assertEquals(stats.size(), longStats.size());
    assertEquals(stats.u(0) + (1L << 45), longStats.u(0));
  }

  @Test
  void insideStatisticsAreThoseOfTheEdgesWithBothEndsInsideAndTheWholeOnesUnchanged() {
    Random random = new Random(31);
    for (int trial = 0; trial < 20; trial++) {
      int[] shape = {5 + random.nextInt(6), 4 + random.nextInt(5), 3 + random.nextInt(4)};
      int n = shape[0] * shape[1] * shape[2];
      Offsets offsets = GridGraphTest.OFFSETS;
      int[] labels = new int[n];
      byte[] inside = new byte[n];
      for (int i = 0; i < n; i++) {
        labels[i] = random.nextInt(12) == 0 ? 0 : 1 + random.nextInt(2 + trial);
        inside[i] = (byte) (random.nextInt(3) == 0 ? 0 : 1);
      }
      GridGraph graph = GridGraph.of(AffinityBlock.ofFloats(
          GridGraphTest.randomAffinities(n, offsets.count(), random), shape, new long[3],
          offsets, null), WeightRule.byValue(WeightRule.Transform.LOGIT, null),
          trial % 2 == 0 ? Subsampling.none() : Subsampling.hash(0.5, trial));
      RegionGraph split = RegionGraph.of(labels, graph, inside);
      assertSameRows(edgeByEdge(graph, labels, inside), split.insideStatistics());
      assertSameRows(RegionGraph.of(labels, graph).statistics(), split.statistics());
      assertEquals(0, RegionGraph.of(labels, graph).insideStatistics().size());
    }
  }

  /**
   * Under the unbiased logit rule a run's weights are summed as the logarithm of its odds'
   * product: affinities 0.9, 0.9 and 0.1 between two labels weigh ln 9 + ln 9 − ln 9 = ln 9 =
   * 2.1972245773 (from memory), the smallest weight is −ln 9 and the largest ln 9, each rounded
   * to a float as the rule rounds one edge's weight.
   */
  @Test
  void aRunOfLogitWeightsSumsToTheLogarithmOfItsOddsProduct() {
    int[] shape = {3, 2, 1};
    int[] labels = {1, 1, 1, 2, 2, 2};
    float[] affinities = {0, 0, 0, 0.9f, 0.9f, 0.1f};
    GridGraph graph = GridGraph.of(AffinityBlock.ofFloats(affinities, shape, new long[3],
        Offsets.of(new int[] {0, -1, 0}), null), WeightRule.byValue(WeightRule.Transform.LOGIT,
        null), Subsampling.none());
    EdgeStatistics stats = RegionGraph.of(labels, graph).statistics();
    assertEquals(1, stats.size());
    assertEquals(3, stats.count(0));
    double ln9 = 2.1972245773;
    assertEquals(ln9, stats.sum(0), 1e-5);
    assertEquals((float) Math.log(0.1f / (1 - (double) 0.1f)), stats.min(0));
    assertEquals((float) Math.log(0.9f / (1 - (double) 0.9f)), stats.max(0));
    assertEquals(ln9, stats.max(0), 1e-6);
  }

  /**
   * A run of 300 edges at the clamp's extremes, whose odds' product leaves the double range
   * (10^-1800) unless folded into the sum on the way, and random runs on float and quantized
   * affinities: the same rows as the weights summed edge by edge.
   */
  @Test
  void logitRunsMatchTheEdgeByEdgeSumsAcrossLongRunsAndQuantizedAffinities() {
    int[] shape = {300, 2, 1};
    int[] labels = new int[600];
    float[] affinities = new float[600];
    for (int x = 0; x < 300; x++) {
      labels[x] = 1;
      labels[300 + x] = 2;
      affinities[300 + x] = x < 150 ? 1e-9f : 1f;
    }
    for (double clamp : new double[] {WeightRule.LOGIT_EPSILON, 0.01}) {
      GridGraph graph = GridGraph.of(AffinityBlock.ofFloats(affinities, shape, new long[3],
          Offsets.of(new int[] {0, -1, 0}), null), WeightRule.logit(clamp), Subsampling.none());
      EdgeStatistics stats = RegionGraph.of(labels, graph).statistics();
      double odds = Math.log(clamp / (1 - clamp));
      assertEquals(300, stats.count(0));
      assertEquals(150 * odds - 150 * odds, stats.sum(0), 1e-9 * 300 * Math.abs(odds));
      assertEquals((float) odds, stats.min(0));
      assertEquals((float) -odds, stats.max(0));
    }
    Random random = new Random(5);
    for (int trial = 0; trial < 10; trial++) {
      int[] box = {6 + random.nextInt(8), 4 + random.nextInt(5), 3 + random.nextInt(4)};
      int n = box[0] * box[1] * box[2];
      Offsets offsets = GridGraphTest.OFFSETS;
      int[] regions = new int[n];
      byte[] bytes = new byte[n * offsets.count()];
      for (int i = 0; i < n; i++) {
        regions[i] = 1 + (i % box[0]) / 3 + 4 * random.nextInt(2);
      }
      random.nextBytes(bytes);
      AffinityBlock block = trial % 2 == 0
          ? AffinityBlock.ofBytes(bytes, box, new long[3], offsets, null)
          : AffinityBlock.ofFloats(GridGraphTest.randomAffinities(n, offsets.count(), random),
              box, new long[3], offsets, null);
      GridGraph graph = GridGraph.of(block, WeightRule.logit(0.01), Subsampling.none());
      assertSameRows(edgeByEdge(graph, regions, null),
          RegionGraph.of(regions, graph).statistics());
    }
  }

  /**
   * The statistics summed edge by edge over the graph's weights: every edge between different
   * non-zero labels, with both ends inside when {@code insideOrNull} is given.
   */
  private static EdgeStatistics edgeByEdge(GridGraph graph, int[] labels, byte[] insideOrNull) {
    SignedGraph voxels = graph.toSignedGraph();
    EdgeStatistics.Accumulator expected = new EdgeStatistics.Accumulator(16);
    for (int e = 0; e < voxels.edgeCount(); e++) {
      int s = voxels.edgeU(e);
      int t = voxels.edgeV(e);
      if (labels[s] != labels[t] && labels[s] != 0 && labels[t] != 0
          && (insideOrNull == null || insideOrNull[s] != 0 && insideOrNull[t] != 0)) {
        expected.add(labels[s], labels[t], voxels.weight(e));
      }
    }
    return expected.build();
  }

  private static void assertSameRows(EdgeStatistics want, EdgeStatistics got) {
    assertEquals(want.size(), got.size());
    for (int i = 0; i < want.size(); i++) {
      assertEquals(want.u(i), got.u(i));
      assertEquals(want.v(i), got.v(i));
      assertEquals(want.count(i), got.count(i));
      // the edge-by-edge sums add weights rounded to floats (2^-24 relative each); logit runs
      // take the logarithm of the unrounded odds' product
      double rounding = want.count(i) * Math.ulp(1f) / 2
          * Math.max(Math.abs(want.min(i)), Math.abs(want.max(i)));
      assertEquals(want.sum(i), got.sum(i), 1e-9 * (1 + Math.abs(want.sum(i))) + rounding);
      assertEquals(want.min(i), got.min(i));
      assertEquals(want.max(i), got.max(i));
    }
  }
}
