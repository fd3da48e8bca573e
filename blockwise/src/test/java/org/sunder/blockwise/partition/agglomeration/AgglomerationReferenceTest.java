package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
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

/**
 * {@link Agglomeration} against two references: the implementation it replaced (a global pair
 * map and an indexed heap, kept as {@link PreviousAgglomerationState}), which must give the same
 * merge tree, ties included, on every linkage and input kind; and a brute-force run of the
 * definition in "A Generalized Framework for Agglomerative Clustering of Signed Graphs applied to
 * Instance Segmentation" (2019/2022) on small tie-free graphs: recompute every adjacent cluster
 * pair's linkage from the original edges and merge (or, with constraints, forbid) the best.
 */
class AgglomerationReferenceTest {
  private static final Offsets LONG_RANGE = Offsets.of(new int[] {-1, 0, 0},
      new int[] {0, -1, 0}, new int[] {0, 0, -1}, new int[] {-3, 0, 0}, new int[] {0, 4, 0},
      new int[] {2, -2, -1}, new int[] {0, 0, -3}, new int[] {-5, 3, 0});

  @Test
  void equalsThePreviousImplementationOnGraphsAndStatistics() {
    Random random = new Random(13);
    for (int trial = 0; trial < 60; trial++) {
      int nodes = 3 + random.nextInt(80);
      SignedGraph g = PartitionFixtures.randomGraph(random, nodes, random.nextInt(5 * nodes),
          random.nextDouble());
      if (trial % 3 == 1) {
        g = withParallelEdges(g, random);
      }
      if (trial % 4 == 2) {
        g = g.withWeights(fewLevels(random, g.edgeCount()));
      }
      for (Agglomeration options : variants(random)) {
        String at = "trial " + trial + " " + options.linkage() + " constraints "
            + options.constraints() + " threshold " + options.threshold();
        assertEquals(previous(options, g), options.run(g), at);
        EdgeStatistics statistics = g.statistics();
        assertEquals(previous(options, g.nodeCount(), statistics),
            options.run(g.nodeCount(), statistics), at);
      }
    }
  }

  @Test
  void equalsThePreviousImplementationOnGrids() {
    Random random = new Random(17);
    Offsets opposite = Offsets.of(new int[] {-1, 0, 0}, new int[] {1, 0, 0},
        new int[] {0, -1, 0}, new int[] {0, 0, 2});
    for (int trial = 0; trial < 24; trial++) {
      int[] shape = {3 + random.nextInt(9), 3 + random.nextInt(7), 2 + random.nextInt(6)};
      Offsets offsets = trial % 6 == 5 ? opposite : trial % 2 == 0 ? LONG_RANGE
          : PartitionFixtures.OFFSETS;
      int n = shape[0] * shape[1] * shape[2];
      byte[] mask = null;
      if (trial % 4 == 3) {
        mask = new byte[n];
        for (int i = 0; i < n; i++) {
          mask[i] = (byte) (random.nextInt(5) == 0 ? 0 : 1);
        }
      }
      AffinityBlock block;
      if (trial % 3 == 2) {
        byte[] bytes = new byte[n * offsets.count()];
        for (int i = 0; i < bytes.length; i++) {
          bytes[i] = (byte) (random.nextInt(5) * 63);  // heavy ties
        }
        block = AffinityBlock.ofBytes(bytes, shape, new long[3], offsets, mask);
      } else {
        float[] floats = new float[n * offsets.count()];
        for (int i = 0; i < floats.length; i++) {
          floats[i] = random.nextFloat();
        }
        block = AffinityBlock.ofFloats(floats, shape, new long[3], offsets, mask);
      }
      WeightRule rule = trial % 2 == 0 ? WeightRule.byValue(WeightRule.Transform.LOGIT, null)
          : WeightRule.byChannelRole();
      Subsampling subsampling = trial % 5 == 4 ? Subsampling.stride(2, 2, 1) : Subsampling.none();
      GridGraph grid = GridGraph.of(block, rule, subsampling);
      for (Agglomeration options : variants(random)) {
        assertEquals(previous(options, grid), options.run(grid), "trial " + trial + " "
            + options.linkage() + " constraints " + options.constraints());
      }
    }
  }

  @Test
  void equalsBruteForceOnTieFreeGraphs() {
    Random random = new Random(29);
    for (int trial = 0; trial < 40; trial++) {
      int nodes = 2 + random.nextInt(14);
      SignedGraph g = withParallelEdges(PartitionFixtures.randomGraph(random, nodes,
          random.nextInt(3 * nodes), random.nextDouble()), random);
      double[] w = new double[g.edgeCount()];
      for (int e = 0; e < w.length; e++) {
        w[e] = random.nextGaussian();  // distinct with probability 1
      }
      g = g.withWeights(w);
      for (Linkage linkage : Linkage.values()) {
        for (boolean constraints : new boolean[] {false, true}) {
          Agglomeration options = new Agglomeration(linkage, constraints).withMergeTree();
          if (!constraints && trial % 2 == 1) {
            options = options.withThreshold(trial % 4 == 1 ? -0.3 : Double.NEGATIVE_INFINITY);
          }
          BruteForce expected = bruteForce(g, linkage, constraints, options.threshold());
          Agglomeration.Result result = options.run(g);
          String at = "trial " + trial + " " + linkage + " constraints " + constraints;
          assertEquals(expected.clustering(), result.clustering(), at);
          assertEquals(expected.heights().size(), result.tree().mergeCount(), at);
          for (int i = 0; i < expected.heights().size(); i++) {
            assertEquals(expected.heights().get(i), result.tree().linkage()[i], 1e-12, at);
          }
        }
      }
    }
  }

  private record BruteForce(Clustering clustering, List<Double> heights) {}

  /**
   * The definition, {@code O(n^2 m)} per merge: each step aggregates the original edges between
   * every pair of current clusters and takes the pair of largest linkage (largest |linkage| with
   * constraints, skipping forbidden pairs): merge if positive (above the threshold without
   * constraints), else forbid the pair with constraints or stop without.
   */
  private static BruteForce bruteForce(SignedGraph g, Linkage linkage, boolean constraints,
      double threshold) {
    int n = g.nodeCount();
    int[] cluster = new int[n];
    for (int i = 0; i < n; i++) {
      cluster[i] = i;
    }
    boolean[][] forbidden = new boolean[n][n];
    List<Double> heights = new ArrayList<>();
    while (true) {
      double[][] sum = new double[n][n];
      long[][] count = new long[n][n];
      double[][] min = new double[n][n];
      double[][] max = new double[n][n];
      for (double[] row : min) {
        Arrays.fill(row, Double.POSITIVE_INFINITY);
      }
      for (double[] row : max) {
        Arrays.fill(row, Double.NEGATIVE_INFINITY);
      }
      for (int e = 0; e < g.edgeCount(); e++) {
        int a = Math.min(cluster[g.edgeU(e)], cluster[g.edgeV(e)]);
        int b = Math.max(cluster[g.edgeU(e)], cluster[g.edgeV(e)]);
        if (a != b) {
          sum[a][b] += g.weight(e);
          count[a][b]++;
          min[a][b] = Math.min(min[a][b], g.weight(e));
          max[a][b] = Math.max(max[a][b], g.weight(e));
        }
      }
      int bestA = -1;
      int bestB = -1;
      double best = 0;
      for (int a = 0; a < n; a++) {
        for (int b = a + 1; b < n; b++) {
          if (count[a][b] == 0 || forbidden[a][b]) {
            continue;
          }
          double value = linkage.value(sum[a][b], count[a][b], min[a][b], max[a][b]);
          double priority = constraints ? Math.abs(value) : value;
          if (bestA < 0 || priority > (constraints ? Math.abs(best) : best)) {
            bestA = a;
            bestB = b;
            best = value;
          }
        }
      }
      if (bestA < 0 || (constraints ? best == 0 : best <= threshold)) {
        break;
      }
      if (constraints && best < 0) {
        forbidden[bestA][bestB] = true;
        continue;
      }
      heights.add(best);
      for (int i = 0; i < n; i++) {
        if (cluster[i] == bestB) {
          cluster[i] = bestA;
        }
      }
      for (int c = 0; c < n; c++) {
        boolean f = forbidden[Math.min(c, bestB)][Math.max(c, bestB)];
        if (f && c != bestA) {
          forbidden[Math.min(c, bestA)][Math.max(c, bestA)] = true;
        }
      }
    }
    return new BruteForce(Clustering.fromRepresentatives(cluster), heights);
  }

  /** Every linkage with and without constraints, without constraints at a random threshold. */
  private static List<Agglomeration> variants(Random random) {
    List<Agglomeration> all = new ArrayList<>();
    for (Linkage linkage : Linkage.values()) {
      all.add(new Agglomeration(linkage, true).withMergeTree());
      double threshold = random.nextBoolean() ? 0 : random.nextGaussian() * 0.3;
      all.add(new Agglomeration(linkage, false).withThreshold(threshold).withMergeTree());
    }
    return all;
  }

  private static double[] fewLevels(Random random, int m) {
    double[] levels = {0, 0.25, -0.25, 0.5, -0.5, 1};
    double[] w = new double[m];
    for (int e = 0; e < m; e++) {
      w[e] = levels[random.nextInt(levels.length)];
    }
    return w;
  }

  /** The graph plus a copy of about a third of its edges with their own weights. */
  private static SignedGraph withParallelEdges(SignedGraph g, Random random) {
    int m = g.edgeCount();
    int extra = m / 3;
    int[] u = new int[m + extra];
    int[] v = new int[m + extra];
    double[] w = new double[m + extra];
    for (int e = 0; e < m + extra; e++) {
      int from = e < m ? e : random.nextInt(m);
      u[e] = g.edgeU(from);
      v[e] = g.edgeV(from);
      w[e] = e < m ? g.weight(e) : random.nextGaussian();
    }
    return SignedGraph.of(g.nodeCount(), u, v, w);
  }

  private static Agglomeration.Result previous(Agglomeration options, int nodes,
      EdgeStatistics s) {
    PreviousAgglomerationState state = new PreviousAgglomerationState(options, nodes, s.size());
    for (int i = 0; i < s.size(); i++) {
      state.addEdge((int) s.u(i), (int) s.v(i), s.sum(i), s.count(i), s.min(i), s.max(i), i);
    }
    return state.run();
  }

  private static Agglomeration.Result previous(Agglomeration options, SignedGraph g) {
    if (!(options.linkage() == Linkage.ABS_MAX && options.constraints())) {
      return previous(options, g.nodeCount(), g.statistics());
    }
    PreviousAgglomerationState state = new PreviousAgglomerationState(options, g.nodeCount(),
        g.edgeCount());
    for (int e = 0; e < g.edgeCount(); e++) {
      state.addEdge(g.edgeU(e), g.edgeV(e), g.weight(e), 1, g.weight(e), g.weight(e), e);
    }
    return state.run();
  }

  private static Agglomeration.Result previous(Agglomeration options, GridGraph grid) {
    PreviousAgglomerationState state = new PreviousAgglomerationState(options,
        grid.nodeCount(), Math.toIntExact(grid.presentEdgeCount()));
    int[] id = new int[1];
    grid.forEachEdge((s, t, k, w) -> state.addEdge(s, t, w, 1, w, w, id[0]++));
    assertTrue(id[0] >= 0);
    return state.run();
  }
}
