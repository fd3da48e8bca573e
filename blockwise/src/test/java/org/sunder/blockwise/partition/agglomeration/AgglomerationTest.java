package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Locale;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.PartitionFixtures;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.mutex.MutexWatershed;
import org.sunder.testing.PythonReference;

class AgglomerationTest {

  @Test
  void absMaxWithConstraintsEqualsMutexWatershed() {
    Random random = new Random(13);
    for (int trial = 0; trial < 60; trial++) {
      int nodes = 4 + random.nextInt(70);
      SignedGraph g = PartitionFixtures.randomGraph(random, nodes, random.nextInt(4 * nodes),
          random.nextDouble());
      Clustering mws = MutexWatershed.partition(g);
      assertEquals(mws, new Agglomeration(Linkage.ABS_MAX, true).run(g).clustering(),
          "trial " + trial);
    }
    for (int trial = 0; trial < 4; trial++) {
      GridGraph grid = GridGraph.of(PartitionFixtures.randomBlock(random, new int[] {8, 6, 5},
          trial % 2 == 1), WeightRule.byChannelRole(), Subsampling.none());
      Clustering agg = new Agglomeration(Linkage.ABS_MAX, true).run(grid).clustering();
      assertEquals(MutexWatershed.partition(grid),
          Segmentation.fromClusters(agg.clusterOf(), grid.block().maskOrNull()));
    }
  }

  /**
   * Heavy ties: weights from a few levels, grids of 8-bit affinities and of float affinities
   * clamped to 0 and 1. The agglomeration must follow the Mutex Watershed's order exactly
   * (descending {@code |w|}, attractive first, then ascending edge id), also across parallel edges.
   */
  @Test
  void absMaxWithConstraintsEqualsMutexWatershedOnTiedWeights() {
    Random random = new Random(13);
    double[] levels = {0.25, 0.5, 1.0};
    Agglomeration absMax = new Agglomeration(Linkage.ABS_MAX, true);
    for (int trial = 0; trial < 80; trial++) {
      int nodes = 5 + random.nextInt(60);
      SignedGraph base = trial % 2 == 0
          ? PartitionFixtures.randomGraph(random, nodes, random.nextInt(3 * nodes), 0.5)
          : withParallelEdges(PartitionFixtures.randomGraph(random, nodes, 2 * nodes, 0.5),
              random);
      double[] w = new double[base.edgeCount()];
      for (int e = 0; e < w.length; e++) {
        int level = random.nextInt(levels.length + 1);
        double magnitude = level == levels.length ? 0 : levels[level];
        w[e] = random.nextBoolean() ? magnitude : -magnitude;
      }
      SignedGraph g = base.withWeights(w);
      assertEquals(MutexWatershed.partition(g), absMax.run(g).clustering(), "graph " + trial);
    }
    int[] shape = {7, 5, 4};
    int n = 7 * 5 * 4;
    int channels = PartitionFixtures.OFFSETS.count();
    byte[] fewBytes = {0, 64, (byte) 128, (byte) 191, (byte) 255};
    float[] fewFloats = {0f, 0.25f, 0.5f, 0.75f, 1f};
    WeightRule[] rules = {WeightRule.byChannelRole(),
        WeightRule.byValue(WeightRule.Transform.CENTERED, null)};
    for (int trial = 0; trial < 12; trial++) {
      byte[] bytes = new byte[n * channels];
      float[] floats = new float[n * channels];
      for (int i = 0; i < bytes.length; i++) {
        bytes[i] = trial % 3 == 0 ? (byte) random.nextInt(256) : fewBytes[random.nextInt(5)];
        floats[i] = fewFloats[random.nextInt(5)];
      }
      WeightRule rule = rules[trial % 2];
      for (AffinityBlock block : new AffinityBlock[] {
          AffinityBlock.ofBytes(bytes, shape, new long[3], PartitionFixtures.OFFSETS, null),
          AffinityBlock.ofFloats(floats, shape, new long[3], PartitionFixtures.OFFSETS, null)}) {
        GridGraph grid = GridGraph.of(block, rule, Subsampling.none());
        Segmentation mws = MutexWatershed.partition(grid);
        Clustering agg = absMax.run(grid).clustering();
        assertEquals(mws, Segmentation.fromClusters(agg.clusterOf(), null), "grid " + trial);
        assertEquals(agg, absMax.run(grid.toSignedGraph()).clustering(), "grid copy " + trial);
      }
    }
  }

  /** The graph plus a copy of about a third of its edges, appended in a shuffled order. */
  private static SignedGraph withParallelEdges(SignedGraph g, Random random) {
    int m = g.edgeCount();
    int[] order = PartitionFixtures.permutation(random, m);
    int extra = m / 3;
    int[] u = new int[m + extra];
    int[] v = new int[m + extra];
    for (int e = 0; e < m + extra; e++) {
      int from = e < m ? e : order[e - m];
      u[e] = g.edgeU(from);
      v[e] = g.edgeV(from);
    }
    return SignedGraph.of(g.nodeCount(), u, v, new double[m + extra]);
  }

  @Test
  void constraintsAreNeverViolatedAndUnconstrainedRunsStopAtNoPositiveLinkage() {
    Random random = new Random(13);
    for (Linkage linkage : Linkage.values()) {
      for (int trial = 0; trial < 12; trial++) {
        int nodes = 6 + random.nextInt(50);
        SignedGraph base = PartitionFixtures.randomGraph(random, nodes, 2 * nodes, 0.3);
        double[] w = new double[base.edgeCount()];
        boolean[] strong = new boolean[w.length];
        for (int e = 0; e < w.length; e++) {
          strong[e] = random.nextInt(8) == 0;
          w[e] = strong[e] ? -10 : base.weight(e);
        }
        SignedGraph g = base.withWeights(w);
        Agglomeration.Result constrained = new Agglomeration(linkage, true).withMergeTree().run(g);
        for (int e = 0; e < w.length; e++) {
          if (strong[e]) {
            assertTrue(!constrained.clustering().together(g.edgeU(e), g.edgeV(e)),
                linkage + ": a cannot-link edge ended inside one cluster");
          }
        }
        assertValidTree(constrained, g.nodeCount());
        Agglomeration.Result free = new Agglomeration(linkage, false).withMergeTree().run(g);
        assertValidTree(free, g.nodeCount());
        for (double h : free.tree().linkage()) {
          assertTrue(h > 0, "merged a pair of linkage " + h);
        }
        assertNoPositiveLinkageLeft(g, free.clustering(), linkage);
        assertEquals(free.clustering(),
            new Agglomeration(linkage, false).run(PartitionFixtures.shuffled(g, random))
                .clustering(), "edge order must not matter");
        assertEquals(constrained.clustering(),
            new Agglomeration(linkage, true).run(PartitionFixtures.shuffled(g, random))
                .clustering(), "edge order must not matter");
      }
    }
  }

  private static void assertValidTree(Agglomeration.Result r, int nodes) {
    MergeTree tree = r.tree();
    assertEquals(nodes - r.clustering().clusterCount(), tree.mergeCount());
    assertEquals(r.clustering(), tree.cut(tree.mergeCount()));
    boolean[] used = new boolean[nodes + tree.mergeCount()];
    for (int i = 0; i < tree.mergeCount(); i++) {
      assertTrue(tree.first()[i] < tree.second()[i]);
      assertTrue(tree.second()[i] < nodes + i, "merges only existing clusters");
      assertTrue(!used[tree.first()[i]] && !used[tree.second()[i]], "each cluster merged once");
      used[tree.first()[i]] = true;
      used[tree.second()[i]] = true;
    }
  }

  private static void assertNoPositiveLinkageLeft(SignedGraph g, Clustering c, Linkage linkage) {
    long[] nodes = new long[g.nodeCount()];
    long[] clusters = new long[g.nodeCount()];
    for (int i = 0; i < nodes.length; i++) {
      nodes[i] = i;
      clusters[i] = c.clusterOf()[i];
    }
    EdgeStatistics between = g.statistics().relabel(nodes, clusters);
    for (int i = 0; i < between.size(); i++) {
      double value = linkage.value(between.sum(i), between.count(i), between.min(i),
          between.max(i));
      assertTrue(value <= 1e-12, linkage + " left a positive linkage " + value);
    }
  }

  @Test
  void meanMaxMinMergeTreesAreShiftInvariant() {
    Random random = new Random(13);
    for (Linkage linkage : new Linkage[] {Linkage.MEAN, Linkage.MAX, Linkage.MIN}) {
      for (int trial = 0; trial < 10; trial++) {
        SignedGraph g = PartitionFixtures.randomGraph(random, 10 + random.nextInt(40),
            random.nextInt(80), 0.5);
        Agglomeration all = new Agglomeration(linkage, false)
            .withThreshold(Double.NEGATIVE_INFINITY).withMergeTree();
        MergeTree base = all.run(g).tree();
        assertEquals(g.nodeCount() - 1, base.mergeCount(), "runs to a single cluster");
        for (double shift : new double[] {0.375, -1.25, 3.0}) {
          double[] w = new double[g.edgeCount()];
          for (int e = 0; e < w.length; e++) {
            w[e] = g.weight(e) + shift;
          }
          MergeTree shifted = all.run(g.withWeights(w)).tree();
          assertArrayEquals(base.first(), shifted.first(), linkage + " shift " + shift);
          assertArrayEquals(base.second(), shifted.second(), linkage + " shift " + shift);
          for (int i = 0; i < base.mergeCount(); i++) {
            assertEquals(base.linkage()[i] + shift, shifted.linkage()[i], 1e-9);
          }
        }
      }
    }
    // the sum linkage is not shift-invariant: a counterexample
    SignedGraph star = SignedGraph.of(4, new int[] {0, 1, 0, 2}, new int[] {1, 2, 2, 3},
        new double[] {1.0, 0.6, 0.6, 0.9});
    Agglomeration sum = new Agglomeration(Linkage.SUM, false)
        .withThreshold(Double.NEGATIVE_INFINITY).withMergeTree();
    MergeTree a = sum.run(star).tree();
    MergeTree b = sum.run(star.withWeights(new double[] {0, -0.4, -0.4, -0.1})).tree();
    assertNotEquals(java.util.Arrays.toString(a.first()) + java.util.Arrays.toString(a.second()),
        java.util.Arrays.toString(b.first()) + java.util.Arrays.toString(b.second()));
  }

  /**
   * Reference: {@code scipy.cluster.hierarchy.linkage} with methods single, complete and average
   * on the distances {@code d = 1 - s} of a complete graph of similarities {@code s} in (0, 1).
   * Single linkage of {@code d} is our MAX of {@code s}, complete is MIN, average is MEAN; the
   * heights satisfy {@code height = 1 - linkage}; scipy numbers clusters as MergeTree does.
   */
  @Test
  void maxMinMeanEqualScipySingleCompleteAverage() {
    PythonReference.requireModules("scipy", "numpy");
    Random random = new Random(13);
    String script = """
        import sys, numpy as np
        from scipy.cluster.hierarchy import linkage
        # a case with a known answer: d01 = 1, d02 = 2, d12 = 3
        z = linkage(np.array([1.0, 2.0, 3.0]), method='single')
        assert [int(z[0][0]), int(z[0][1]), z[0][2]] == [0, 1, 1.0], z
        assert [int(z[1][0]), int(z[1][1]), z[1][2]] == [2, 3, 2.0], z
        d = np.array([float(v) for v in sys.argv[2].split(',')])
        for row in linkage(d, method=sys.argv[1]):
            print('%d %d %.17g' % (int(row[0]), int(row[1]), row[2]))
        """;
    for (int trial = 0; trial < 3; trial++) {
      int n = 9 + 3 * trial;
      int m = n * (n - 1) / 2;
      int[] u = new int[m];
      int[] v = new int[m];
      double[] s = new double[m];
      StringBuilder condensed = new StringBuilder();
      int e = 0;
      for (int i = 0; i < n; i++) {
        for (int j = i + 1; j < n; j++) {
          u[e] = i;
          v[e] = j;
          s[e] = 0.02 + 0.96 * random.nextDouble();
          condensed.append(e == 0 ? "" : ",").append(String.format(Locale.ROOT, "%.17g",
              1 - s[e]));
          e++;
        }
      }
      SignedGraph g = SignedGraph.of(n, u, v, s);
      String[][] pairs = {{"single", "MAX"}, {"complete", "MIN"}, {"average", "MEAN"}};
      for (String[] pair : pairs) {
        MergeTree ours = new Agglomeration(Linkage.valueOf(pair[1]), false).withMergeTree()
            .run(g).tree();
        String[] rows = PythonReference.runChecked(script, pair[0], condensed.toString())
            .strip().split("\n");
        assertEquals(n - 1, rows.length);
        assertEquals(n - 1, ours.mergeCount());
        for (int i = 0; i < rows.length; i++) {
          String[] f = rows[i].trim().split(" ");
          int a = Integer.parseInt(f[0]);
          int b = Integer.parseInt(f[1]);
          assertEquals(Math.min(a, b), ours.first()[i], pair[0] + " merge " + i);
          assertEquals(Math.max(a, b), ours.second()[i], pair[0] + " merge " + i);
          // mean values lie on Linkage.GRID
          assertEquals(Double.parseDouble(f[2]), 1 - ours.linkage()[i], Linkage.GRID / 2 + 1e-12,
              pair[0] + " height " + i);
        }
      }
    }
  }

  /**
   * Reference: {@code scipy.ndimage.label} (face connectivity). Attractive edges (+0.5) join
   * foreground face neighbours, every other face edge is repulsive (-0.5): with no pair of
   * clusters holding both signs, every linkage, with or without constraints, reduces to the
   * connected components of the foreground, background voxels staying single.
   */
  @Test
  void attractiveVersusRepulsiveOnlyEdgesGiveScipyNdimageComponents() {
    PythonReference.requireModules("scipy", "numpy");
    Random random = new Random(13);
    int[] shape = {12, 7, 5};
    int n = 12 * 7 * 5;
    boolean[] fg = new boolean[n];
    StringBuilder bits = new StringBuilder();
    for (int i = 0; i < n; i++) {
      fg[i] = random.nextInt(100) < 40;
      bits.append(fg[i] ? '1' : '0');
    }
    Offsets faces = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0}, new int[] {0, 0, -1});
    float[] a = new float[n * 3];
    for (int k = 0; k < 3; k++) {
      int delta = k == 0 ? -1 : k == 1 ? -12 : -84;
      for (int i = 0; i < n; i++) {
        int t = i + delta;
        a[i + k * n] = t >= 0 && fg[i] && fg[t] ? 1f : 0f;
      }
    }
    GridGraph graph = GridGraph.of(AffinityBlock.ofFloats(a, shape, new long[3], faces, null),
        WeightRule.byValue(WeightRule.Transform.CENTERED, null), Subsampling.none());
    String script = """
        import sys, numpy as np
        from scipy import ndimage
        known, count = ndimage.label(np.array([[1, 1, 0], [0, 0, 0], [1, 0, 1]]))
        assert count == 3 and known[0, 0] == known[0, 1] and known[2, 0] != known[2, 2], known
        z, y, x = (int(v) for v in sys.argv[1].split(','))
        labels, count = ndimage.label(np.array([c == '1' for c in sys.argv[2]]).reshape(z, y, x))
        print(','.join(str(v) for v in labels.ravel()))
        """;
    String[] ref = PythonReference.runChecked(script, "5,7,12", bits.toString()).strip()
        .split(",");
    int[] expected = new int[n];
    int[] idOf = new int[n + 1];
    int next = 0;
    for (int i = 0; i < n; i++) {
      int r = Integer.parseInt(ref[i]);
      if (r == 0) {
        expected[i] = ++next;
      } else {
        if (idOf[r] == 0) {
          idOf[r] = ++next;
        }
        expected[i] = idOf[r];
      }
    }
    for (Linkage linkage : Linkage.values()) {
      for (boolean constraints : new boolean[] {false, true}) {
        Segmentation s = new AgglomerationPartitioner(new Agglomeration(linkage, constraints),
            graph.weightRule(), graph.subsampling()).partition(graph.block());
        assertArrayEquals(expected, s.labels(), linkage + " constraints " + constraints);
      }
    }
  }

  @Test
  void continuesFromAggregatedStatistics() {
    // two rounds: agglomerate inside halves, aggregate statistics per cluster, agglomerate again;
    // with MAX linkage (single linkage) the result equals one run over everything
    Random random = new Random(13);
    SignedGraph g = PartitionFixtures.randomGraph(random, 60, 150, 0.4);
    Clustering once = new Agglomeration(Linkage.MAX, false).run(g).clustering();
    long[] nodes = new long[60];
    long[] ids = new long[60];
    Clustering partial = new Agglomeration(Linkage.MAX, false).withThreshold(0.5).run(g)
        .clustering();
    for (int i = 0; i < 60; i++) {
      nodes[i] = i;
      ids[i] = partial.clusterOf()[i];
    }
    EdgeStatistics reduced = g.statistics().relabel(nodes, ids);
    Clustering second = new Agglomeration(Linkage.MAX, false).run(partial.clusterCount(), reduced)
        .clustering();
    for (int i = 0; i < 60; i++) {
      for (int j = 0; j < 60; j++) {
        assertEquals(once.together(i, j),
            second.together(partial.clusterOf()[i], partial.clusterOf()[j]));
      }
    }
  }
}
