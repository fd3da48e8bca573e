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
}
