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
    SignedGraph voxels = graph.toSignedGraph();
    EdgeStatistics.Accumulator expected = new EdgeStatistics.Accumulator(16);
    for (int e = 0; e < voxels.edgeCount(); e++) {
      int a = labels[voxels.edgeU(e)];
      int b = labels[voxels.edgeV(e)];
      if (a != b && a != 0 && b != 0) {
        expected.add(a, b, voxels.weight(e));
      }
    }
    EdgeStatistics stats = RegionGraph.of(labels, graph).statistics();
    EdgeStatistics want = expected.build();
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
      SignedGraph voxels = graph.toSignedGraph();
      EdgeStatistics.Accumulator expected = new EdgeStatistics.Accumulator(16);
      for (int e = 0; e < voxels.edgeCount(); e++) {
        int s = voxels.edgeU(e);
        int t = voxels.edgeV(e);
        if (labels[s] != labels[t] && labels[s] != 0 && labels[t] != 0 && inside[s] != 0
            && inside[t] != 0) {
          expected.add(labels[s], labels[t], voxels.weight(e));
        }
      }
      RegionGraph split = RegionGraph.of(labels, graph, inside);
      assertSameRows(expected.build(), split.insideStatistics());
      assertSameRows(RegionGraph.of(labels, graph).statistics(), split.statistics());
      assertEquals(0, RegionGraph.of(labels, graph).insideStatistics().size());
    }
  }

  private static void assertSameRows(EdgeStatistics want, EdgeStatistics got) {
    assertEquals(want.size(), got.size());
    for (int i = 0; i < want.size(); i++) {
      assertEquals(want.u(i), got.u(i));
      assertEquals(want.v(i), got.v(i));
      assertEquals(want.count(i), got.count(i));
      assertEquals(want.sum(i), got.sum(i), 1e-9 * (1 + Math.abs(want.sum(i))));
      assertEquals(want.min(i), got.min(i));
      assertEquals(want.max(i), got.max(i));
    }
  }
}
