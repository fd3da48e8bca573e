package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import java.util.stream.LongStream;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.multicut.MulticutSolver;
import org.sunder.blockwise.partition.multicut.SetPartitions;
import org.sunder.stitching.RandomReducedGraphs;

/**
 * The multicut by domain decomposition ({@link MulticutPartSolver}): with one part holding
 * everything it is the single-level multicut; decomposed over super-blocks it gives a valid
 * partition (joined pairs together, every cluster named by its smallest id) whose objective is
 * close to the single-level one's, and no better than the optimum found by enumerating every
 * partition of a small graph; on clean inputs it gives the single-level partition.
 */
class MulticutPartSolverTest {
  private static final MulticutSolver SINGLE_LEVEL = new MulticutSolver(Linkage.SUM, false);

  /** A random graph with, on some trials, continued pairs between face-adjacent blocks. */
  private static ReducedGraph graph(BlockGrid grid, IdLayout layout, Random random,
      boolean exact, int maxSegments, double pairsPerSegment, boolean continued) {
    ReducedGraph g = RandomReducedGraphs.graph(grid, layout, random, exact, maxSegments,
        pairsPerSegment);
    if (!continued) {
      return g;
    }
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(16);
    EdgeStatistics edges = g.edges();
    for (int e = 0; e < edges.size(); e++) {
      long a = g.nodeIds()[(int) edges.u(e)];
      long b = g.nodeIds()[(int) edges.v(e)];
      if (layout.blockOf(a) != layout.blockOf(b) && random.nextInt(6) == 0) {
        // some pairs above the joining threshold, some below it
        long voxelPairs = 1 + random.nextInt(2 * (int) GlobalSolve.MIN_CONTINUED_PAIRS);
        acc.add(edges.u(e), edges.v(e), voxelPairs, voxelPairs, 1, 1);
      }
    }
    return new ReducedGraph(g.nodeIds(), g.edges(), g.separatedU(), g.separatedV(),
        acc.build());
  }

  /** The single-level solve's clusters: continued pieces joined, then the multicut. */
  private static int[] singleLevel(ReducedGraph graph) {
    return RandomReducedGraphs.canonical(
        GlobalSolve.clustersJoiningContinuations(graph,
            LongStream.range(0, graph.nodeCount()).toArray(), SINGLE_LEVEL));
  }

  /** The multicut objective of {@code clusters} on the graph's summed weights. */
  private static double objective(ReducedGraph graph, int[] clusters) {
    EdgeStatistics edges = graph.edges();
    double sum = 0;
    for (int e = 0; e < edges.size(); e++) {
      if (clusters[(int) edges.u(e)] != clusters[(int) edges.v(e)]) {
        sum += edges.sum(e);
      }
    }
    return sum;
  }

  /** Checks the partition is valid: joined pairs together, clusters named by smallest id. */
  private static void assertValid(ReducedGraph graph, HierarchicalSolver solver, int[] clusters,
      String what) {
    long[] ids = graph.nodeIds();
    RepresentativeMaps reps = solver.lastResult().representatives();
    for (int i = 0; i < ids.length; i++) {
      long rep = reps.resolve(ids[i]);
      int r = Arrays.binarySearch(ids, rep);
      assertTrue(r >= 0 && r <= i && clusters[r] == clusters[i], what + ": node " + i
          + " has representative " + rep);
    }
    EdgeStatistics continued = graph.continued();
    for (int e = 0; e < continued.size(); e++) {
      if (continued.count(e) >= GlobalSolve.MIN_CONTINUED_PAIRS) {
        assertEquals(clusters[(int) continued.u(e)], clusters[(int) continued.v(e)],
            what + ": continued pair " + e + " not joined");
      }
    }
  }

  private static HierarchicalSolver fitting(ReducedGraph graph, SuperBlocks superBlocks,
      long bound) {
    return HierarchicalSolverTest.fitting(new MulticutPartSolver(false), graph, superBlocks,
        bound, 2);
  }

  @Test
  void onePartHoldingEverythingIsTheSingleLevelMulticut() {
    Random random = new Random(41);
    for (int trial = 0; trial < 120; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(1 + random.nextInt(5), 1 + random.nextInt(4),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      ReducedGraph graph = graph(grid, layout, random, trial % 3 == 0, 2 + random.nextInt(12),
          1 + random.nextInt(4), trial % 2 == 1);
      int[] expected = singleLevel(graph);
      // a bound the whole graph fits under: no level, the driver's part holds every node
      HierarchicalSolver whole = new HierarchicalSolver(new MulticutPartSolver(false),
          new SuperBlocks(grid, layout, 2), Long.MAX_VALUE, null);
      int[] actual = RandomReducedGraphs.canonical(whole.clusters(graph));
      assertArrayEquals(expected, actual, "trial " + trial);
      assertTrue(whole.lastResult().levels().isEmpty());
      // the part solver called directly with a part that holds every node
      PartResult part = new MulticutPartSolver(false).solve(HierarchicalSolver.multicutEdges(graph),
          node -> true);
      assertEquals(0, part.remaining().size(), "trial " + trial + ": the whole part hands up");
      java.util.List<long[][]> levels = new java.util.ArrayList<>();
      levels.add(RepresentativeMaps.levelOf(java.util.List.of(part)));
      RepresentativeMaps reps = new RepresentativeMaps(levels);
      int[] direct = new int[graph.nodeCount()];
      for (int i = 0; i < direct.length; i++) {
        direct[i] = Arrays.binarySearch(graph.nodeIds(), reps.resolve(graph.nodeIds()[i]));
      }
      assertArrayEquals(expected, RandomReducedGraphs.canonical(direct), "trial " + trial
          + " direct");
    }
  }

  /**
   * Tolerance: the decomposed objective summed over the trials is at least 99% of the
   * single-level one's (both negative: a larger magnitude is better), each trial's at least 90%,
   * and at most 10 of the 200 trials differ from the single-level partition. A part decides its
   * inner pairs without the pairs leaving it, so a contraction it makes can be one the whole
   * graph would not make; on graphs of a few dozen nodes one such contraction is a large share
   * of the objective. Measured on these graphs (noisy weights, 15% of signs flipped, 1 to 3
   * levels): 100.0% summed, worst trial 99.99%, 1 trial differs (99.4% and 3 before the open
   * groups' neighbours were held back too; 99.9%, 93% and 24 while open groups were left out of
   * the part's multicut; 99.8%, 81% and 39 before they were held back at all). A cost lost or
   * counted twice on the way up moves the sum by far more.
   */
  @Test
  void decomposedIsAValidPartitionNearTheSingleLevelObjective() {
    Random random = new Random(7);
    double single = 0;
    double decomposed = 0;
    double worst = 1;
    int leveled = 0;
    int differ = 0;
    for (int trial = 0; trial < 200; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(6), 1 + random.nextInt(5),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      ReducedGraph graph = graph(grid, layout, random, false, 2 + random.nextInt(10),
          1 + random.nextInt(4), trial % 2 == 0);
      int[] expected = singleLevel(graph);
      long pairs = graph.edges().size();
      long bound = 1 + random.nextInt((int) Math.max(1, pairs / 2));
      HierarchicalSolver solver = fitting(graph,
          new SuperBlocks(grid, layout, 2 + trial % 2), bound);
      int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
      String what = "trial " + trial + ", levels " + solver.lastResult().levels().size();
      assertValid(graph, solver, actual, what);
      double s = objective(graph, expected);
      double d = objective(graph, actual);
      single += s;
      decomposed += d;
      if (s < 0) {
        worst = Math.min(worst, d / s);
      }
      leveled += solver.lastResult().levels().isEmpty() ? 0 : 1;
      differ += Arrays.equals(expected, actual) ? 0 : 1;
    }
    // open groups and their neighbours are held back, so on graphs this small many trials fit
    // the driver only without levels; 88 of the 200 use one
    assertTrue(leveled >= 75, "trials that used a level: " + leveled);
    assertTrue(decomposed / single >= 0.99, "objective ratio " + decomposed / single);
    assertTrue(worst >= 0.9, "worst trial's objective ratio " + worst);
    assertTrue(differ <= 10, "trials whose partition differs: " + differ);
  }

  /**
   * Against the optimum found by enumerating every partition of graphs of at most 10 nodes (an
   * exhaustive search, independent of the solvers): the decomposed objective is never below the
   * optimum (its partition is scored on the original weights, so a cost lost on the way up
   * would show as a gain no partition has); it reaches the optimum on at least 90% of the graphs
   * and summed over them is within 5% of it (measured: 165 of 166 graphs, 99.9%).
   */
  @Test
  void smallGraphsAgainstTheEnumeratedOptimum() {
    Random random = new Random(23);
    double optimum = 0;
    double decomposed = 0;
    int solved = 0;
    int atOptimum = 0;
    for (int trial = 0; trial < 300; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(4, 1 + random.nextInt(2), 1);
      IdLayout layout = IdLayout.forGrid(grid);
      ReducedGraph graph = graph(grid, layout, random, false, 2, 2 + random.nextInt(3), false);
      if (graph.nodeCount() > 10) {
        continue;
      }
      double best = enumeratedOptimum(graph);
      HierarchicalSolver solver = fitting(graph, new SuperBlocks(grid, layout, 2), 1);
      int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
      double d = objective(graph, actual);
      assertTrue(d >= best - 1e-9, "trial " + trial + ": " + d + " below the optimum " + best);
      optimum += best;
      decomposed += d;
      atOptimum += d <= best + 1e-9 ? 1 : 0;
      solved++;
    }
    assertTrue(solved >= 100, "graphs enumerated: " + solved);
    assertTrue(atOptimum >= 0.9 * solved, "at the optimum: " + atOptimum + " of " + solved);
    assertTrue(decomposed / optimum >= 0.95, "objective against the optimum "
        + decomposed / optimum);
  }

  /** The least multicut objective over every partition. */
  private static double enumeratedOptimum(ReducedGraph graph) {
    return SetPartitions.least(graph.nodeCount(), labels -> objective(graph, labels));
  }

  @Test
  void enumerationFindsTheOptimumOfAWorkedExample() {
    // a triangle with two attractive edges (+1 each) and a repulsive one (-3): cutting the
    // repulsive edge forces cutting one attractive edge, objective -3 + 1 = -2 (worked by hand)
    long[] ids = {1, 2, 3};
    EdgeStatistics edges = EdgeStatistics.ofEdges(new long[] {0, 1, 0}, new long[] {1, 2, 2},
        new double[] {1, 1, -3});
    ReducedGraph triangle = new ReducedGraph(ids, edges, new int[0], new int[0]);
    assertEquals(-2, enumeratedOptimum(triangle), 1e-12);
  }

  @Test
  void cleanInputsGiveTheSingleLevelPartition() {
    Random random = new Random(19);
    int leveled = 0;
    for (int trial = 0; trial < 80; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(6), 1 + random.nextInt(5),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      ReducedGraph graph = graph(grid, layout, random, true, 2 + random.nextInt(10),
          1 + random.nextInt(4), false);
      int[] expected = singleLevel(graph);
      long bound = 1 + random.nextInt((int) Math.max(1, graph.edges().size() / 2));
      HierarchicalSolver solver = fitting(graph, new SuperBlocks(grid, layout, 2 + trial % 2),
          bound);
      assertArrayEquals(expected, RandomReducedGraphs.canonical(solver.clusters(graph)),
          "trial " + trial + ", levels " + solver.lastResult().levels().size());
      leveled += solver.lastResult().levels().isEmpty() ? 0 : 1;
    }
    assertTrue(leveled >= 30, "trials that used a level: " + leveled);  // 41 of the 80
  }

  /**
   * An open node (3, with a pair to node 9 outside the part) takes part in the part's multicut:
   * it draws its neighbours 4 and 5 together (+10 each), and the three then pull node 1 (3 + 3)
   * away from node 2, which they repel (-5 - 5), so 1 and 2 end apart; left out, 3 would let 1
   * and 2 contract first on their own cost of 4. Worked by hand.
   */
  @Test
  void anOpenNodeTakesPartInThePartsMulticut() {
    SolveEdges rows = new SolveEdges(8);
    MulticutPartSolver.addPair(rows, 1, 2, 4);
    MulticutPartSolver.addPair(rows, 1, 4, 3);
    MulticutPartSolver.addPair(rows, 1, 5, 3);
    MulticutPartSolver.addPair(rows, 2, 4, -5);
    MulticutPartSolver.addPair(rows, 2, 5, -5);
    MulticutPartSolver.addPair(rows, 3, 4, 10);
    MulticutPartSolver.addPair(rows, 3, 5, 10);
    MulticutPartSolver.addPair(rows, 3, 9, 1);
    PartResult part = new MulticutPartSolver(false).solve(rows, node -> node < 9);
    assertArrayEquals(new long[0], part.merged());

    SolveEdges without = new SolveEdges(8);
    for (int e = 0; e < rows.size(); e++) {
      if (rows.u(e) != 3 && rows.v(e) != 3) {
        without.add(rows, e, rows.u(e), rows.v(e));
      }
    }
    PartResult closed = new MulticutPartSolver(false).solve(without, node -> node < 9);
    assertArrayEquals(new long[] {2}, closed.merged());
    assertArrayEquals(new long[] {1}, closed.representative());
  }

  /**
   * An open node (3) and its neighbour in the part (4) are never contracted, though the part's
   * multicut puts them in one cluster with 1 and 2; the rest of the cluster is, piece by piece:
   * 1 and 2 join when a pair of their own connects them, and stay apart when they touch only
   * through 4. Worked by hand.
   */
  @Test
  void anOpenNodeAndItsNeighboursStayTheirOwnNodes() {
    SolveEdges joined = new SolveEdges(4);
    MulticutPartSolver.addPair(joined, 1, 2, 5);
    MulticutPartSolver.addPair(joined, 2, 4, 1);
    MulticutPartSolver.addPair(joined, 3, 4, 1);
    MulticutPartSolver.addPair(joined, 3, 9, 1);
    PartResult rest = new MulticutPartSolver(false).solve(joined, node -> node < 9);
    assertArrayEquals(new long[] {2}, rest.merged());
    assertArrayEquals(new long[] {1}, rest.representative());

    SolveEdges through = new SolveEdges(4);
    MulticutPartSolver.addPair(through, 1, 4, 5);
    MulticutPartSolver.addPair(through, 2, 4, 5);
    MulticutPartSolver.addPair(through, 3, 4, 1);
    MulticutPartSolver.addPair(through, 3, 9, 1);
    PartResult apart = new MulticutPartSolver(false).solve(through, node -> node < 9);
    assertArrayEquals(new long[0], apart.merged());
  }

  @Test
  void aRowOfAnotherSolverIsRefused() {
    SolveEdges rows = new SolveEdges(1);
    rows.add(1, 2, 0.5, 1, 2, SolveEdges.MAX);
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> new MulticutPartSolver(false).solve(rows, node -> true));
    assertTrue(e.getMessage().contains("not a multicut row"), e.getMessage());
  }
}
