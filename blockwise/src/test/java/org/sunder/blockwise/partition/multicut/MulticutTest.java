package org.sunder.blockwise.partition.multicut;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.partition.RandomSignedGraph;
import org.sunder.testing.PythonReference;

class MulticutTest {
  private static final double TOLERANCE = 1e-9;

  @Test
  void triangleWithOneStrongRepulsionCutsItAndTheWeakerAttraction() {
    int[] u = {0, 1, 0};
    int[] v = {1, 2, 2};
    double[] w = {1.0, 1.5, -3.0};
    MulticutResult result = Multicut.solve(3, u, v, w);
    assertEquals(-2.0, result.objective(), TOLERANCE);
    assertArrayEquals(new int[] {0, 1, 1}, result.labels());
  }

  @Test
  void resultsArePartitionsWhoseReportedObjectiveIsRecomputed() {
    Random random = new Random(13);
    for (int trial = 0; trial < 60; trial++) {
      int n = 5 + random.nextInt(120);
      RandomSignedGraph g = trial % 2 == 0
          ? RandomSignedGraph.of(random, n, 0.05 + 0.5 * random.nextDouble(), 0.3)
          : RandomSignedGraph.sparse(random, n, 2, 0.2);
      MulticutResult greedy = Multicut.greedyAdditive(n, g.u(), g.v(), g.w());
      MulticutResult refined = Multicut.refine(n, g.u(), g.v(), g.w(), greedy.labels());
      for (MulticutResult r : List.of(greedy, refined)) {
        assertValidPartition(r, n);
        assertEquals(Multicut.objective(g.u(), g.v(), g.w(), r.labels()), r.objective(), 0.0);
        assertEquals(bruteObjective(g, r.labels()), r.objective(), TOLERANCE);
      }
      assertTrue(refined.objective() <= greedy.objective() + TOLERANCE, "trial " + trial);
      assertNoPositiveWeightBetweenClusters(g, greedy.labels());
      assertNoSingleMoveOrJoinImproves(g, refined.labels());
    }
  }

  /**
   * The greedy contraction step by step as its definition reads, on a weight matrix: contract
   * the pair of clusters of largest positive summed weight (ties: the smaller pair of cluster
   * ids), the cluster with more neighbours keeping its id (the smaller id on equal counts). Small
   * integer weights, so sums are exact and ties frequent; the heap's bookkeeping must give the
   * very same contractions.
   */
  @Test
  void greedyContractionMakesTheContractionsOfItsDefinition() {
    Random random = new Random(23);
    for (int trial = 0; trial < 200; trial++) {
      int n = 2 + random.nextInt(trial < 100 ? 12 : 60);
      int m = random.nextInt(4 * n);
      int[] u = new int[m];
      int[] v = new int[m];
      double[] w = new double[m];
      for (int e = 0; e < m; e++) {
        u[e] = random.nextInt(n);
        v[e] = random.nextInt(n);
        w[e] = random.nextInt(7) - 3;
      }
      int[] expected = Multicut.consecutiveFromZero(contractByDefinition(n, u, v, w));
      assertArrayEquals(expected, Multicut.greedyAdditive(n, u, v, w).labels(),
          "trial " + trial);
    }
  }

  /** Per node, its cluster's surviving id. O(n^3); for small graphs. */
  private static int[] contractByDefinition(int n, int[] u, int[] v, double[] w) {
    double[][] weight = new double[n][n];
    boolean[][] joined = new boolean[n][n];
    for (int e = 0; e < u.length; e++) {
      if (u[e] != v[e]) {
        weight[u[e]][v[e]] += w[e];
        weight[v[e]][u[e]] += w[e];
        joined[u[e]][v[e]] = joined[v[e]][u[e]] = true;
      }
    }
    boolean[] alive = new boolean[n];
    java.util.Arrays.fill(alive, true);
    int[] cluster = new int[n];
    for (int i = 0; i < n; i++) {
      cluster[i] = i;
    }
    while (true) {
      int a = -1;
      int b = -1;
      for (int x = 0; x < n; x++) {
        for (int y = x + 1; y < n; y++) {
          if (alive[x] && alive[y] && joined[x][y] && weight[x][y] > 0
              && (a < 0 || weight[x][y] > weight[a][b])) {
            a = x;
            b = y;
          }
        }
      }
      if (a < 0) {
        return cluster;
      }
      int keep = degree(joined, alive, b) > degree(joined, alive, a) ? b : a;
      int gone = keep == a ? b : a;
      alive[gone] = false;
      for (int c = 0; c < n; c++) {
        if (alive[c] && c != keep && joined[gone][c]) {
          weight[keep][c] += weight[gone][c];
          weight[c][keep] = weight[keep][c];
          joined[keep][c] = joined[c][keep] = true;
        }
        if (cluster[c] == gone) {
          cluster[c] = keep;
        }
      }
    }
  }

  private static int degree(boolean[][] joined, boolean[] alive, int x) {
    int d = 0;
    for (int c = 0; c < joined.length; c++) {
      d += alive[c] && c != x && joined[x][c] ? 1 : 0;
    }
    return d;
  }

  @Test
  void refinementNeverIncreasesTheObjectiveOfAnyStart() {
    Random random = new Random(13);
    for (int trial = 0; trial < 60; trial++) {
      int n = 4 + random.nextInt(60);
      RandomSignedGraph g = RandomSignedGraph.of(random, n, 0.3, random.nextGaussian() * 0.5);
      int[] start = new int[n];
      int clusters = 1 + random.nextInt(n);
      for (int i = 0; i < n; i++) {
        start[i] = trial % 5 == 0 ? 0 : random.nextInt(clusters);
      }
      double before = Multicut.objective(g.u(), g.v(), g.w(), start);
      MulticutResult refined = Multicut.refine(n, g.u(), g.v(), g.w(), start);
      assertTrue(refined.objective() <= before + TOLERANCE,
          "trial " + trial + ": " + refined.objective() + " > " + before);
      assertValidPartition(refined, n);
      assertNoSingleMoveOrJoinImproves(g, refined.labels());
    }
  }

  @Test
  void resultDoesNotDependOnEdgeOrder() {
    Random random = new Random(13);
    for (int trial = 0; trial < 20; trial++) {
      int n = 20 + random.nextInt(80);
      RandomSignedGraph g = RandomSignedGraph.sparse(random, n, 3, 0.3);
      RandomSignedGraph h = g.shuffled(random);
      MulticutResult a = Multicut.solve(n, g.u(), g.v(), g.w());
      MulticutResult b = Multicut.solve(n, h.u(), h.v(), h.w());
      assertArrayEquals(a.labels(), b.labels(), "trial " + trial);
    }
  }

  /**
   * The same graph with its nodes numbered otherwise gives the same partition: a blockwise
   * run's reduced graph numbers the fragments block by block, the one-block run in voxel order.
   * (Before the refinement ordered its work by weights, the first of these graphs already gave
   * another partition.)
   */
  @Test
  void resultDoesNotDependOnNodeNumbering() {
    Random random = new Random(17);
    for (int trial = 0; trial < 40; trial++) {
      int n = 100 + random.nextInt(300);
      RandomSignedGraph g = RandomSignedGraph.sparse(random, n, 4, 0.3 + 0.1 * (trial % 4));
      int[] renumber = new int[n];
      for (int i = 0; i < n; i++) {
        renumber[i] = i;
      }
      for (int i = n - 1; i > 0; i--) {
        int j = random.nextInt(i + 1);
        int t = renumber[i];
        renumber[i] = renumber[j];
        renumber[j] = t;
      }
      int[] u = new int[g.u().length];
      int[] v = new int[u.length];
      for (int e = 0; e < u.length; e++) {
        u[e] = renumber[g.u()[e]];
        v[e] = renumber[g.v()[e]];
      }
      int[] a = Multicut.solve(n, g.u(), g.v(), g.w()).labels();
      int[] b = Multicut.solve(n, u, v, g.w()).labels();
      for (int x = 0; x < n; x++) {
        for (int y = x + 1; y < n; y++) {
          assertEquals(a[x] == a[y], b[renumber[x]] == b[renumber[y]],
              "trial " + trial + ": nodes " + x + " and " + y);

        }
      }
    }
  }

  @Test
  void sparseGraphOverloadsGiveTheArrayResults() {
    Random random = new Random(13);
    RandomSignedGraph g = RandomSignedGraph.sparse(random, 70, 3, 0.2);
    SignedGraph graph = SignedGraph.of(g.nodeCount(), g.u(), g.v(), g.w());
    MulticutResult fromArrays = Multicut.solve(g.nodeCount(), g.u(), g.v(), g.w());
    MulticutResult fromGraph = Multicut.solve(graph);
    assertArrayEquals(fromArrays.labels(), fromGraph.labels());
    assertEquals(fromArrays.objective(), fromGraph.objective(), TOLERANCE);
    assertEquals(fromGraph.objective(), Multicut.objective(graph, fromGraph.labels()), 0.0);
    MulticutResult greedy = Multicut.greedyAdditive(graph);
    assertTrue(Multicut.refine(graph, greedy.labels()).objective()
        <= greedy.objective() + TOLERANCE);
  }

  @Test
  void parallelEdgesAreSummedAndSelfLoopsNeverCount() {
    int[] u = {0, 1, 0, 2, 2};
    int[] v = {1, 0, 2, 2, 1};
    double[] w = {2.0, -3.0, 0.5, 9.0, -0.2};
    MulticutResult result = Multicut.solve(3, u, v, w);
    assertEquals(bruteOptimum(new RandomSignedGraph(3, u, v, w)), result.objective(), TOLERANCE);
    assertThrows(IllegalArgumentException.class,
        () -> Multicut.solve(2, new int[] {0}, new int[] {2}, new double[] {1}));
    assertThrows(IllegalArgumentException.class,
        () -> Multicut.solve(2, new int[] {0}, new int[] {1}, new double[] {Double.NaN}));
  }

  @Test
  void isOptimalOnSmallGraphsWhereBruteForceDecides() {
    Random random = new Random(13);
    int optimal = 0;
    int trials = 40;
    for (int trial = 0; trial < trials; trial++) {
      int n = 3 + random.nextInt(6);
      RandomSignedGraph g = RandomSignedGraph.of(random, n, 0.7, 0.2);
      double best = bruteOptimum(g);
      double ours = Multicut.solve(n, g.u(), g.v(), g.w()).objective();
      assertTrue(ours >= best - TOLERANCE, "below the optimum: " + ours + " < " + best);
      optimal += ours <= best + TOLERANCE ? 1 : 0;
    }
    assertTrue(optimal >= trials * 3 / 4, optimal + " of " + trials + " optimal");
  }

  /**
   * Reference: exact optima from scipy.optimize.milp (Debian's scipy, HiGHS). Formulation: the
   * edge formulation on the COMPLETE graph — missing pairs get weight 0 — with one binary cut
   * variable per node pair and all triangle inequalities x_ij <= x_ik + x_kj, which for a
   * complete graph exactly describe the multicuts.
   */
  @Test
  void comparesWithExactOptimaFromScipyMilp(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "scipy.optimize");
    Random random = new Random(13);
    List<RandomSignedGraph> graphs = new ArrayList<>();
    graphs.add(new RandomSignedGraph(3, new int[] {0, 1, 0}, new int[] {1, 2, 2},
        new double[] {1.0, 1.0, -3.0}));
    graphs.add(new RandomSignedGraph(4, new int[] {0, 1, 2, 3}, new int[] {1, 2, 3, 0},
        new double[] {1.0, 0.5, 2.0, 0.25}));
    graphs.add(RandomSignedGraph.of(random, 9, 0.6, 0.1));
    int instances = 60;
    for (int i = 0; i < instances; i++) {
      int n = 8 + random.nextInt(7);
      double density = i % 3 == 0 ? 1.0 : 0.3 + 0.4 * random.nextDouble();
      graphs.add(RandomSignedGraph.of(random, n, density, 0.4 * random.nextGaussian()));
    }
    List<String> lines = new ArrayList<>();
    for (RandomSignedGraph g : graphs) {
      StringBuilder line = new StringBuilder().append(g.nodeCount());
      for (int e = 0; e < g.u().length; e++) {
        line.append(' ').append(g.u()[e]).append(' ').append(g.v()[e]).append(' ')
            .append(Double.toString(g.w()[e]));
      }
      lines.add(line.toString());
    }
    Files.write(dir.resolve("graphs"), lines);
    String out = PythonReference.runChecked("""
        import sys, itertools, numpy as np
        from scipy.optimize import milp, LinearConstraint, Bounds
        from scipy.sparse import lil_matrix
        for line in open(sys.argv[1]):
            t = line.split()
            n = int(t[0])
            pairs = list(itertools.combinations(range(n), 2))
            index = {p: k for k, p in enumerate(pairs)}
            c = np.zeros(len(pairs))
            for k in range(1, len(t), 3):
                a, b, w = int(t[k]), int(t[k + 1]), float(t[k + 2])
                if a != b:
                    c[index[(min(a, b), max(a, b))]] += w
            rows = []
            for i, j, k in itertools.combinations(range(n), 3):
                e = (index[(i, j)], index[(i, k)], index[(j, k)])
                for r in range(3):
                    rows.append((e[r], e[(r + 1) % 3], e[(r + 2) % 3]))
            A = lil_matrix((max(1, len(rows)), len(pairs)))
            for r, (x, y, z) in enumerate(rows):
                A[r, x] = 1; A[r, y] = -1; A[r, z] = -1
            res = milp(c, constraints=[LinearConstraint(A.tocsr(), -np.inf, 0)],
                       integrality=np.ones(len(pairs)), bounds=Bounds(0, 1))
            assert res.status == 0, res.message
            print(repr(float(res.fun)))
        """, dir.resolve("graphs").toString());
    String[] optima = out.strip().split("\\s+");
    assertEquals(graphs.size(), optima.length);
    assertEquals(-2.0, Double.parseDouble(optima[0]), 1e-9, "milp on the known triangle");
    assertEquals(0.0, Double.parseDouble(optima[1]), 1e-9, "milp on a positive cycle");
    assertEquals(bruteOptimum(graphs.get(2)), Double.parseDouble(optima[2]), 1e-7,
        "milp against brute force");
    int optimal = 0;
    int greedyOptimal = 0;
    double worstRatio = 1;
    double ratioSum = 0;
    for (int i = 3; i < graphs.size(); i++) {
      RandomSignedGraph g = graphs.get(i);
      double exact = Double.parseDouble(optima[i]);
      MulticutResult greedy = Multicut.greedyAdditive(g.nodeCount(), g.u(), g.v(), g.w());
      MulticutResult refined = Multicut.refine(g.nodeCount(), g.u(), g.v(), g.w(),
          greedy.labels());
      assertTrue(refined.objective() >= exact - 1e-7, "instance " + i + " beats the optimum");
      assertTrue(refined.objective() <= greedy.objective() + TOLERANCE);
      optimal += refined.objective() <= exact + 1e-7 ? 1 : 0;
      greedyOptimal += greedy.objective() <= exact + 1e-7 ? 1 : 0;
      double ratio = exact < 0 ? refined.objective() / exact : 1;
      worstRatio = Math.min(worstRatio, ratio);
      ratioSum += ratio;
    }
    System.out.printf("multicut vs scipy.optimize.milp on %d graphs of 8-14 nodes: GAEC+KL "
        + "optimal on %d, GAEC alone on %d; objective/optimum mean %.4f, worst %.4f%n",
        instances, optimal, greedyOptimal, ratioSum / instances, worstRatio);
    assertTrue(optimal >= instances * 7 / 10, optimal + " of " + instances + " optimal");
    assertTrue(worstRatio >= 0.8, "worst ratio " + worstRatio);
  }

  static void assertValidPartition(MulticutResult r, int n) {
    assertEquals(n, r.labels().length);
    int next = 0;
    for (int l : r.labels()) {
      assertTrue(l >= 0 && l <= next, "labels are numbered in order of first node");
      next = Math.max(next, l + 1);
    }
    assertEquals(n == 0 ? 0 : next, r.clusterCount());
  }

  private static void assertNoPositiveWeightBetweenClusters(RandomSignedGraph g, int[] labels) {
    Map<Long, Double> between = new HashMap<>();
    for (int e = 0; e < g.u().length; e++) {
      int a = labels[g.u()[e]];
      int b = labels[g.v()[e]];
      if (a != b) {
        between.merge((long) Math.min(a, b) << 32 | Math.max(a, b), g.w()[e], Double::sum);
      }
    }
    for (double w : between.values()) {
      assertTrue(w <= TOLERANCE, "greedy contraction stopped with a positive pair " + w);
    }
  }

  private static void assertNoSingleMoveOrJoinImproves(RandomSignedGraph g, int[] labels) {
    int n = g.nodeCount();
    double base = bruteObjective(g, labels);
    int clusters = 0;
    for (int l : labels) {
      clusters = Math.max(clusters, l + 1);
    }
    int[] trial = labels.clone();
    for (int x = 0; x < n; x++) {
      for (int c = 0; c <= clusters; c++) {
        trial[x] = c;
        assertTrue(bruteObjective(g, trial) >= base - 1e-7, "moving node " + x + " helps");
      }
      trial[x] = labels[x];
    }
    for (int a = 0; a < clusters; a++) {
      for (int b = a + 1; b < clusters; b++) {
        for (int x = 0; x < n; x++) {
          trial[x] = labels[x] == b ? a : labels[x];
        }
        assertTrue(bruteObjective(g, trial) >= base - 1e-7, "joining " + a + ", " + b);
      }
    }
  }

  static double bruteObjective(RandomSignedGraph g, int[] labels) {
    double sum = 0;
    for (int e = 0; e < g.u().length; e++) {
      if (labels[g.u()[e]] != labels[g.v()[e]]) {
        sum += g.w()[e];
      }
    }
    return sum;
  }

  /** The optimum over all set partitions; n <= 10. */
  static double bruteOptimum(RandomSignedGraph g) {
    return SetPartitions.least(g.nodeCount(), labels -> bruteObjective(g, labels));
  }
}
