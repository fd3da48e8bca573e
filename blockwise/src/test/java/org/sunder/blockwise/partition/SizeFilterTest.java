package org.sunder.blockwise.partition;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.EdgeStatistics;

class SizeFilterTest {

  @Test
  void smallSegmentJoinsItsMostAttractedNeighbour() {
    int[] labels = {1, 1, 1, 2, 3, 3, 3};
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1, 2}, new long[] {2, 3},
        new double[] {0.2, 0.7});
    Segmentation out = new SizeFilter(2, Linkage.MEAN).apply(new Segmentation(labels, 3), stats,
        null);
    assertArrayEquals(new int[] {1, 1, 1, 2, 2, 2, 2}, out.labels());
    assertEquals(2, out.segmentCount());
    Segmentation blocked = new SizeFilter(2, Linkage.MEAN).apply(new Segmentation(labels, 3),
        stats, new boolean[] {false, true});
    assertArrayEquals(new int[] {1, 1, 1, 1, 2, 2, 2}, blocked.labels());
  }

  @Test
  void randomSegmentationsKeepMaskNeverCrossConstraintsAndLeaveOnlyStuckSmallSegments() {
    Random random = new Random(13);
    int[] shape = {13, 9, 6};
    int n = VoxelBox.size(shape);
    for (int trial = 0; trial < 40; trial++) {
      int[] labels = randomSegments(random, shape, 5 + random.nextInt(60));
      byte[] mask = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextDouble() < 0.9 ? 1 : 0);
        if (mask[i] == 0) {
          labels[i] = 0;
        }
      }
      Segmentation input = Segmentation.fromClusters(labels, mask);
      EdgeStatistics stats = faceStatistics(input.labels(), shape, random);
      boolean[] flags = new boolean[stats.size()];
      for (int r = 0; r < flags.length; r++) {
        flags[r] = trial % 3 != 0 && random.nextDouble() < 0.25;
      }
      int minSize = 2 + random.nextInt(40);
      Linkage linkage = Linkage.values()[trial % Linkage.values().length];
      Segmentation out = new SizeFilter(minSize, linkage).apply(input, stats, flags);
      int[] outOf = assertUnionOfInputSegments(input, out, mask);
      for (int r = 0; r < stats.size(); r++) {
        if (flags[r]) {
          assertNotEquals(outOf[(int) stats.u(r)], outOf[(int) stats.v(r)],
              "pair " + r + " was merged across a constraint");
        }
      }
      assertSmallSegmentsAreStuck(out, stats, flags, outOf, minSize);
    }
  }

  @Test
  void thresholdOfOneOrZeroChangesNothing() {
    int[] labels = {1, 2, 3};
    Segmentation s = new Segmentation(labels, 3);
    EdgeStatistics stats = EdgeStatistics.ofEdges(new long[] {1}, new long[] {2},
        new double[] {1});
    assertEquals(s, new SizeFilter(1, Linkage.SUM).apply(s, stats, null));
    assertEquals(s, new SizeFilter(0, Linkage.SUM).apply(s, stats, null));
  }

  private static int[] assertUnionOfInputSegments(Segmentation in, Segmentation out,
      byte[] mask) {
    int[] outOf = new int[in.segmentCount() + 1];
    int next = 0;
    for (int i = 0; i < in.labels().length; i++) {
      int a = in.labels()[i];
      int b = out.labels()[i];
      assertEquals(mask[i] == 0, b == 0, "masked voxels stay 0, others get a label");
      if (a > 0) {
        assertTrue(outOf[a] == 0 || outOf[a] == b, "an input segment was split");
        outOf[a] = b;
        assertTrue(b <= next + 1, "labels numbered in order of first voxel");
        next = Math.max(next, b);
      }
    }
    assertEquals(next, out.segmentCount());
    return outOf;
  }

  private static void assertSmallSegmentsAreStuck(Segmentation out, EdgeStatistics stats,
      boolean[] flags, int[] outOf, int minSize) {
    int[] size = new int[out.segmentCount() + 1];
    for (int l : out.labels()) {
      size[l]++;
    }
    Map<Long, Boolean> constrained = new HashMap<>();
    for (int r = 0; r < stats.size(); r++) {
      int a = outOf[(int) stats.u(r)];
      int b = outOf[(int) stats.v(r)];
      if (a != b) {
        constrained.merge((long) Math.min(a, b) << 32 | Math.max(a, b), flags[r],
            Boolean::logicalOr);
      }
    }
    for (Map.Entry<Long, Boolean> pair : constrained.entrySet()) {
      int a = (int) (pair.getKey() >>> 32);
      int b = (int) (long) pair.getKey();
      if (!pair.getValue()) {
        assertTrue(size[a] >= minSize && size[b] >= minSize, "segments " + a + " (" + size[a]
            + ") and " + b + " (" + size[b] + ") could still merge; minimum " + minSize);
      }
    }
  }

  static int[] randomSegments(Random random, int[] shape, int seeds) {
    int n = VoxelBox.size(shape);
    int[][] points = new int[seeds][3];
    for (int[] p : points) {
      for (int d = 0; d < 3; d++) {
        p[d] = random.nextInt(shape[d]);
      }
    }
    int[] labels = new int[n];
    int[] c = new int[3];
    for (int i = 0; i < n; i++) {
      int best = 0;
      long bestDistance = Long.MAX_VALUE;
      for (int s = 0; s < seeds; s++) {
        long d = 0;
        for (int k = 0; k < 3; k++) {
          long x = c[k] - points[s][k];
          d += x * x;
        }
        if (d < bestDistance) {
          bestDistance = d;
          best = s;
        }
      }
      labels[i] = best;
      VoxelBox.advance(c, shape);
    }
    return labels;
  }

  static EdgeStatistics faceStatistics(int[] labels, int[] shape, Random random) {
    int[] strides = VoxelBox.strides(shape);
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(64);
    int[] c = new int[3];
    for (int i = 0; i < labels.length; i++) {
      for (int d = 0; d < 3; d++) {
        if (c[d] > 0) {
          int j = i - strides[d];
          if (labels[i] != labels[j] && labels[i] > 0 && labels[j] > 0) {
            acc.add(labels[i], labels[j], random.nextGaussian());
          }
        }
      }
      VoxelBox.advance(c, shape);
    }
    return acc.build();
  }
}
