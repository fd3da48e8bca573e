package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.AgglomerativeSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.multicut.MulticutSolver;
import org.sunder.stitching.RandomReducedGraphs;

/**
 * {@link JoiningPartSolver} level by level against the single-level solve of the fragment
 * methods (continued pieces joined, then the method: {@link GlobalSolve}), on random reduced
 * graphs with continued pairs between face-adjacent blocks, noisy weights (no exact ties) and
 * driver bounds low enough for one to three levels: the same partition, for the sum linkage
 * stopped at 0 (greedy additive contraction, the multicut without refinement) and for mean
 * linkage with and without constraints.
 */
class JoiningPartSolverTest {

  private record Method(String name, ReducedGraphSolver singleLevel, LinkagePartSolver parts) {}

  private static final Method[] METHODS = {
      new Method("sum (greedy additive contraction)", new MulticutSolver(Linkage.SUM, false),
          new LinkagePartSolver(Linkage.SUM, false, 0)),
      new Method("mean", new AgglomerativeSolver(Linkage.MEAN, false, 0, "mean"),
          new LinkagePartSolver(Linkage.MEAN, false, 0)),
      new Method("mean with constraints", new AgglomerativeSolver(Linkage.MEAN, true, 0, "c"),
          new LinkagePartSolver(Linkage.MEAN, true, 0))};

  @Test
  void levelByLevelGivesTheSingleLevelPartition() {
    Random random = new Random(61);
    int leveled = 0;
    int withJoins = 0;
    for (int trial = 0; trial < 240; trial++) {
      Method method = METHODS[trial % METHODS.length];
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(6), 1 + random.nextInt(5),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      ReducedGraph graph = MulticutPartSolverTest.graph(grid, layout, random, false,
          2 + random.nextInt(10), 1 + random.nextInt(4), trial % 4 != 3);
      int[] expected = RandomReducedGraphs.canonical(
          GlobalSolve.clustersJoiningContinuations(graph, method.singleLevel()));
      long pairs = graph.edges().size();
      long bound = 1 + random.nextInt((int) Math.max(1, pairs / 2));
      HierarchicalSolver solver = HierarchicalSolverTest.fitting(
          new JoiningPartSolver(method.parts()), graph,
          new SuperBlocks(grid, layout, 2 + trial % 2), bound, 2);
      int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
      int levels = solver.lastResult().levels().size();
      assertArrayEquals(expected, actual, "trial " + trial + ", " + method.name() + ", "
          + levels + " levels");
      leveled += levels > 0 ? 1 : 0;
      withJoins += graph.continued().size() > 0 && levels > 0 ? 1 : 0;
    }
    assertTrue(leveled >= 120, "trials that used a level: " + leveled);
    assertTrue(withJoins >= 60, "trials with continued pairs that used a level: " + withJoins);
  }

  @Test
  void aGroupWhosePiecesLieInTwoPartsJoinsWhereBothAreInside() {
    // pieces 1 and 2 continue one fragment across the part boundary; 1-3 attract weakly
    SolveEdges rows = new SolveEdges(8);
    LinkagePartSolver.addPair(rows, 1, 3, 0.5, 1, 0.5, 0.5, 1, 3);
    LinkagePartSolver.addPair(rows, 2, 3, 2.0, 1, 2.0, 2.0, 2, 3);
    MulticutPartSolver.addJoined(rows, 1, 2, 5);
    JoiningPartSolver solver = new JoiningPartSolver(new LinkagePartSolver(Linkage.SUM, false,
        0));
    PartResult part = solver.solve(rows, node -> node != 2);
    assertArrayEquals(new long[0], part.merged(), "1 is held back until its piece 2 is seen");
    PartResult whole = solver.solve(rows, node -> true);
    // joined first: {1, 2} against 3 sums to 2.5 > 0, so all three form one cluster
    assertArrayEquals(new long[] {2, 3}, whole.merged());
    assertArrayEquals(new long[] {1, 1}, whole.representative());
  }
}
