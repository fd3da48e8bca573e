package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.array.ArrayImgs;
import org.junit.jupiter.api.Test;

class GridGraphTest {
  static final Offsets OFFSETS = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0},
      new int[] {0, 0, -1}, new int[] {3, 0, 0}, new int[] {0, -2, 1}, new int[] {-2, 2, 0});

  static float[] randomAffinities(int voxels, int channels, Random random) {
    float[] a = new float[voxels * channels];
    for (int i = 0; i < a.length; i++) {
      a[i] = random.nextFloat();
    }
    return a;
  }

  /** Brute force: every (voxel, k) whose target lies in the box and the mask. */
  static Set<Long> bruteForceEdges(int[] shape, Offsets offsets, byte[] mask) {
    Set<Long> edges = new HashSet<>();
    int n = shape[0] * shape[1] * shape[2];
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++) {
          for (int k = 0; k < offsets.count(); k++) {
            int tx = x + offsets.component(k, 0);
            int ty = y + offsets.component(k, 1);
            int tz = z + offsets.component(k, 2);
            if (tx < 0 || ty < 0 || tz < 0 || tx >= shape[0] || ty >= shape[1] || tz >= shape[2]) {
              continue;
            }
            int s = x + shape[0] * (y + shape[1] * z);
            int t = tx + shape[0] * (ty + shape[1] * tz);
            if (mask != null && (mask[s] == 0 || mask[t] == 0)) {
              continue;
            }
            edges.add((long) s + (long) k * n);
          }
        }
      }
    }
    return edges;
  }

  @Test
  void presentEdgesAreExactlyThoseInsideBoxAndMask() {
    Random random = new Random(13);
    int[] shape = {7, 5, 4};
    int n = 140;
    byte[] mask = new byte[n];
    for (int i = 0; i < n; i++) {
      mask[i] = (byte) (random.nextInt(5) == 0 ? 0 : 1);
    }
    AffinityBlock block = AffinityBlock.ofFloats(randomAffinities(n, 6, random), shape,
        new long[] {10, 20, 30}, OFFSETS, mask);
    GridGraph graph = GridGraph.of(block, WeightRule.byChannelRole(), Subsampling.none());
    Set<Long> seen = new HashSet<>();
    List<Long> order = new ArrayList<>();
    graph.forEachEdge((s, t, k, w) -> {
      assertEquals(t, s + graph.delta(k));
      assertEquals(block.isQuantized() ? 0 : graph.weight(s, k), w);
      seen.add((long) s + (long) k * n);
      order.add((long) s + (long) k * n);
    });
    assertEquals(bruteForceEdges(shape, OFFSETS, mask), seen);
    for (int i = 1; i < order.size(); i++) {
      assertTrue(order.get(i - 1) < order.get(i), "ascending edge id");
    }
    for (int s = 0; s < n; s++) {
      for (int k = 0; k < 6; k++) {
        assertEquals(seen.contains((long) s + (long) k * n), graph.hasEdge(s, k));
      }
    }
  }

  @Test
  void presentSlotsMarkExactlyTheVisitedEdgesUnderMaskAndSubsampling() {
    Random random = new Random(21);
    int[] shape = {9, 6, 5};
    int n = 270;
    byte[] mask = new byte[n];
    for (int i = 0; i < n; i++) {
      mask[i] = (byte) (random.nextInt(4) == 0 ? 0 : 1);
    }
    AffinityBlock block = AffinityBlock.ofFloats(randomAffinities(n, 6, random), shape,
        new long[] {3, 1, 4}, OFFSETS, mask);
    for (Subsampling sub : new Subsampling[] {Subsampling.none(), Subsampling.hash(0.4, 9),
        Subsampling.stride(2, 1, 2)}) {
      GridGraph graph = GridGraph.of(block, WeightRule.byChannelRole(), sub);
      byte[] expected = new byte[graph.edgeSlotCount()];
      graph.forEachEdge((s, t, k, w) -> expected[s + k * n] = 1);
      assertTrue(java.util.Arrays.equals(expected, graph.presentSlots()), sub.toString());
    }
  }

  @Test
  void edgesAcrossLabelsAreTheFilteredEdgesSliceBySlice() {
    Random random = new Random(34);
    int[] shape = {9, 6, 5};
    int n = 270;
    for (int trial = 0; trial < 6; trial++) {
      byte[] mask = new byte[n];
      int[] labels = new int[n];
      long[] wide = new long[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextInt(5) == 0 ? 0 : 1);
        labels[i] = random.nextInt(1 + trial);  // trial 0: one label, nothing across
        wide[i] = labels[i] * (1L << 36);
      }
      AffinityBlock block = AffinityBlock.ofFloats(randomAffinities(n, 6, random), shape,
          new long[] {3, 1, 4}, OFFSETS, trial % 2 == 0 ? mask : null);
      Subsampling sub = trial < 3 ? Subsampling.none() : Subsampling.hash(0.5, trial);
      GridGraph graph = GridGraph.of(block, WeightRule.byValue(WeightRule.Transform.LOGIT,
          null), sub);
      // slice by slice along the last axis, each slice's offsets in turn, sources ascending
      List<long[]> keyed = new ArrayList<>();
      List<String> filtered = new ArrayList<>();
      graph.forEachEdge((s, t, k, w) -> {
        if (labels[s] != labels[t]) {
          keyed.add(new long[] {s / (shape[0] * shape[1]), k, s, filtered.size()});
          filtered.add(s + ">" + t + "@" + k + "=" + w);
        }
      });
      keyed.sort(java.util.Comparator.<long[]>comparingLong(x -> x[0])
          .thenComparingLong(x -> x[1]).thenComparingLong(x -> x[2]));
      List<String> expected = new ArrayList<>();
      for (long[] x : keyed) {
        expected.add(filtered.get((int) x[3]));
      }
      List<String> across = new ArrayList<>();
      graph.forEachEdgeAcross(labels, (s, t, k, w) -> across.add(s + ">" + t + "@" + k + "=" + w));
      List<String> acrossWide = new ArrayList<>();
      graph.forEachEdgeAcross(wide, (s, t, k, w) -> acrossWide.add(s + ">" + t + "@" + k + "="
          + w));
      assertEquals(expected, across);
      assertEquals(expected, acrossWide);
      assertEquals(trial == 0, expected.isEmpty());
    }
  }

  /**
   * The edges with a marked end, under masks and subsampling, in the order of the pass across
   * labels, with their weights or affinities; any non-zero flag marks (the pass lists a row's
   * marked slots without a branch).
   */
  @Test
  void edgesTouchingMarkedVoxelsAreTheFilteredEdgesSliceBySlice() {
    Random random = new Random(55);
    int[] shape = {11, 6, 5};
    int n = 330;
    byte[] flagValues = {1, 2, 127, -1, -128};
    for (int trial = 0; trial < 8; trial++) {
      byte[] mask = new byte[n];
      byte[] marked = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextInt(5) == 0 ? 0 : 1);
        marked[i] = random.nextInt(2 + trial) == 0
            ? flagValues[random.nextInt(flagValues.length)] : 0;
      }
      float[] affinities = randomAffinities(n, 6, random);
      AffinityBlock block = AffinityBlock.ofFloats(affinities, shape, new long[] {5, 2, 7},
          OFFSETS, trial % 2 == 0 ? mask : null);
      Subsampling sub = trial < 4 ? Subsampling.none() : Subsampling.hash(0.5, trial);
      GridGraph graph = GridGraph.of(block, WeightRule.logit(0.01), sub);
      List<long[]> keyed = new ArrayList<>();
      List<String> weights = new ArrayList<>();
      List<String> values = new ArrayList<>();
      graph.forEachEdge((s, t, k, w) -> {
        if (marked[s] != 0 || marked[t] != 0) {
          keyed.add(new long[] {s / (shape[0] * shape[1]), k, s, weights.size()});
          weights.add(s + ">" + t + "@" + k + "=" + w);
          values.add(s + ">" + t + "@" + k + "=" + affinities[s + k * n]);
        }
      });
      keyed.sort(java.util.Comparator.<long[]>comparingLong(x -> x[0])
          .thenComparingLong(x -> x[1]).thenComparingLong(x -> x[2]));
      List<String> expectedWeights = new ArrayList<>();
      List<String> expectedValues = new ArrayList<>();
      for (long[] x : keyed) {
        expectedWeights.add(weights.get((int) x[3]));
        expectedValues.add(values.get((int) x[3]));
      }
      List<String> touching = new ArrayList<>();
      graph.forEachEdgeTouching(marked, (s, t, k, w) -> touching.add(s + ">" + t + "@" + k + "="
          + w));
      List<String> touchingValues = new ArrayList<>();
      graph.forEachAffinityTouching(marked, (s, t, k, a) -> touchingValues.add(s + ">" + t + "@"
          + k + "=" + a));
      assertEquals(expectedWeights, touching, "trial " + trial);
      assertEquals(expectedValues, touchingValues, "trial " + trial);
      assertFalse(expectedWeights.isEmpty());
    }
  }

  @Test
  void channelRoleWeights() {
    float[] a = new float[3 * 2 * 6];
    for (int i = 0; i < a.length; i++) {
      a[i] = 0.25f;
    }
    AffinityBlock block = AffinityBlock.ofFloats(a, new int[] {3, 2, 1}, new long[3], OFFSETS,
        null);
    GridGraph graph = GridGraph.of(block, WeightRule.byChannelRole(), Subsampling.none());
    assertEquals(0.25f, graph.weight(0, 0));
    assertEquals(-0.75f, graph.weight(0, 3));
    GridGraph logit = GridGraph.of(block,
        WeightRule.byValue(WeightRule.Transform.LOGIT, new double[] {0, 0, 0, 1, 0, 0}),
        Subsampling.none());
    assertEquals(Math.log(1.0 / 3), logit.weight(0, 0), 1e-6);
    assertEquals(Math.log(1.0 / 3) + 1, logit.weight(0, 3), 1e-6);
    GridGraph centered = GridGraph.of(block,
        WeightRule.byValue(WeightRule.Transform.CENTERED, null), Subsampling.none());
    assertEquals(-0.25f, centered.weight(1, 2));
  }

  @Test
  void quantizedWeightsEqualFloatWeightsOfValueOver255() {
    Random random = new Random(13);
    int[] shape = {6, 4, 3};
    byte[] bytes = new byte[72 * 6];
    random.nextBytes(bytes);
    float[] floats = new float[bytes.length];
    for (int i = 0; i < bytes.length; i++) {
      floats[i] = (bytes[i] & 0xff) / 255f;
    }
    WeightRule rule = WeightRule.byValue(WeightRule.Transform.LOGIT,
        new double[] {0.1, 0, -0.2, 0, 0.3, 0});
    GridGraph q = GridGraph.of(AffinityBlock.ofBytes(bytes, shape, new long[3], OFFSETS, null),
        rule, Subsampling.none());
    GridGraph f = GridGraph.of(AffinityBlock.ofFloats(floats, shape, new long[3], OFFSETS, null),
        rule, Subsampling.none());
    assertEquals(f.toSignedGraph().statistics(), q.toSignedGraph().statistics());
  }

  @Test
  void subsamplingDependsOnGlobalCoordinatesOnly() {
    Random random = new Random(13);
    int[] whole = {12, 9, 5};
    float[] a = randomAffinities(12 * 9 * 5, 6, random);
    Subsampling hash = Subsampling.hash(0.3, 99);
    GridGraph big = GridGraph.of(AffinityBlock.ofFloats(a, whole, new long[] {100, 200, 300},
        OFFSETS, null), WeightRule.byChannelRole(), hash);
    // a sub-box that starts at (4, 2, 1): its copy of an edge must be kept iff the big box keeps it
    int[] sub = {7, 6, 4};
    float[] b = new float[7 * 6 * 4 * 6];
    int subN = 7 * 6 * 4;
    for (int k = 0; k < 6; k++) {
      for (int z = 0; z < 4; z++) {
        for (int y = 0; y < 6; y++) {
          for (int x = 0; x < 7; x++) {
            b[x + 7 * (y + 6 * z) + k * subN] =
                a[(x + 4) + 12 * ((y + 2) + 9 * (z + 1)) + k * 540];
          }
        }
      }
    }
    GridGraph small = GridGraph.of(AffinityBlock.ofFloats(b, sub, new long[] {104, 202, 301},
        OFFSETS, null), WeightRule.byChannelRole(), hash);
    int[] kept = new int[2];
    small.forEachEdge((s, t, k, w) -> {
      int x = s % 7 + 4;
      int y = (s / 7) % 6 + 2;
      int z = s / 42 + 1;
      assertTrue(big.hasEdge(x + 12 * (y + 9 * z), k));
      kept[OFFSETS.isLongRange(k) ? 1 : 0]++;
    });
    int[] all = new int[2];
    GridGraph.of(AffinityBlock.ofFloats(b, sub, new long[] {104, 202, 301}, OFFSETS, null),
        WeightRule.byChannelRole(), Subsampling.none()).forEachEdge(
            (s, t, k, w) -> all[OFFSETS.isLongRange(k) ? 1 : 0]++);
    assertEquals(all[0], kept[0], "nearest-neighbour edges are never dropped");
    double fraction = kept[1] / (double) all[1];
    assertTrue(fraction > 0.2 && fraction < 0.4, "kept fraction " + fraction);
    for (int s = 0; s < subN; s++) {
      for (int k = 0; k < 6; k++) {
        int x = s % 7 + 4;
        int y = (s / 7) % 6 + 2;
        int z = s / 42 + 1;
        if (!small.hasEdge(s, k) && small.block().offsets().isLongRange(k)) {
          int[] p = small.block().position(s);
          long[] g = {104 + p[0], 202 + p[1], 301 + p[2]};
          boolean inBox = GridGraph.of(AffinityBlock.ofFloats(b, sub, new long[] {104, 202, 301},
              OFFSETS, null), WeightRule.byChannelRole(), Subsampling.none()).hasEdge(s, k);
          assertEquals(inBox && hash.keepsLongRange(g, k), big.hasEdge(x + 12 * (y + 9 * z), k)
              && inBox);
        }
      }
    }
  }

  @Test
  void strideKeepsLatticePointsOnly() {
    Subsampling stride = Subsampling.stride(2, 3, 1);
    assertTrue(stride.keepsLongRange(new long[] {4, -3, 7}, 3));
    assertFalse(stride.keepsLongRange(new long[] {5, 3, 7}, 3));
    assertFalse(stride.keepsLongRange(new long[] {4, 1, 7}, 3));
    assertTrue(stride.keeps(new long[] {5, 1, 7}, 0, OFFSETS), "nearest neighbour always kept");
  }

  @Test
  void imgFactoryReadsChannelLast() {
    Random random = new Random(13);
    float[] a = randomAffinities(5 * 3 * 2, 6, random);
    ArrayImg<?, ?> img = ArrayImgs.floats(a, 5, 3, 2, 6);
    ArrayImg<?, ?> mask = ArrayImgs.unsignedBytes(new byte[30], 5, 3, 2);
    AffinityBlock block = AffinityBlock.of(img, new long[] {1, 2, 3}, OFFSETS, mask);
    assertEquals(a[7 + 30 * 4], block.affinity(7, 4));
    assertFalse(block.inside(7));
    assertEquals(0, GridGraph.of(block, WeightRule.byChannelRole(), Subsampling.none())
        .presentEdgeCount());
    byte[] q = new byte[180];
    random.nextBytes(q);
    AffinityBlock bytes = AffinityBlock.of(ArrayImgs.unsignedBytes(q, 5, 3, 2, 6),
        new long[3], OFFSETS, null);
    assertEquals((q[11 + 30 * 2] & 0xff) / 255f, bytes.affinity(11, 2));
  }
}
