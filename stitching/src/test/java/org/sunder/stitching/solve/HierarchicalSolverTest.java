package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.agglomeration.AgglomerativeSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.mutex.MutexWatershedSolver;
import org.sunder.stitching.HierarchicalTissueTest;
import org.sunder.stitching.RandomReducedGraphs;

/**
 * The hierarchical solve gives exactly the single-level solve's partition: on random reduced
 * graphs with exact weights (ties everywhere) and noisy ones, with driver bounds that force one,
 * two or more levels, super-blocks of 2 and 3 blocks per axis.
 */
class HierarchicalSolverTest {

  @Test
  void mutexWatershedEqualsSingleLevelOnRandomGraphs() {
    Random random = new Random(13);
    int levelsSeen = 0;
    for (int trial = 0; trial < 400; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(6), 1 + random.nextInt(5),
          1 + random.nextInt(4));
      IdLayout layout = IdLayout.forGrid(grid);
      boolean exact = trial % 2 == 0;
      ReducedGraph graph = RandomReducedGraphs.graph(grid, layout, random, exact,
          2 + random.nextInt(12), 1 + random.nextInt(4));
      int[] expected = RandomReducedGraphs.canonical(new MutexWatershedSolver().clusters(graph));
      int factor = 2 + trial % 2;
      long bound = 1 + random.nextInt(Math.max(1, 2 * graph.edges().size() / 3));
      HierarchicalSolver solver = fitting(new MutexPartSolver(), graph,
          new SuperBlocks(grid, layout, factor), bound, 4);
      int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
      assertArrayEquals(expected, actual, "trial " + trial + (exact ? " exact" : " noisy")
          + ", grid " + java.util.Arrays.toString(grid.gridShape()) + ", bound " + bound);
      levelsSeen = Math.max(levelsSeen, solver.lastResult().levels().size());
    }
    assertTrue(levelsSeen >= 2, "most levels in one run: " + levelsSeen);
  }

  @Test
  void linkageAgglomerationEqualsSingleLevelOnRandomGraphs() {
    Random random = new Random(31);
    long settledBelowDriver = 0;
    for (int trial = 0; trial < 300; trial++) {
      Linkage linkage = Linkage.values()[trial % Linkage.values().length];
      boolean constraints = trial / 5 % 2 == 1 && linkage != Linkage.ABS_MAX;
      double threshold = constraints ? 0 : trial / 10 % 3 == 0 ? 0 : random.nextGaussian() * 0.3;
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(5), 1 + random.nextInt(4),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      boolean exact = trial / 30 % 2 == 0;
      ReducedGraph graph = RandomReducedGraphs.graph(grid, layout, random, exact,
          2 + random.nextInt(10), 1 + random.nextInt(4));
      int[] expected = RandomReducedGraphs.canonical(
          new AgglomerativeSolver(linkage, constraints, threshold, "reference").clusters(graph));
      SuperBlocks superBlocks = new SuperBlocks(grid, layout, 2 + trial % 2);
      LinkagePartSolver parts = new LinkagePartSolver(linkage, constraints, threshold);
      long bound = 1 + random.nextInt(Math.max(1, graph.edges().size()));
      HierarchicalSolver solver = fitting(parts, graph, superBlocks, 4 * bound, 4);
      int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
      String what = "trial " + trial + " " + linkage + (constraints ? " constrained" : "")
          + " threshold " + threshold + (exact ? " exact" : " noisy") + ", levels "
          + solver.lastResult().levels();
      assertArrayEquals(expected, actual, what);
      for (HierarchicalSolve.LevelFigures f : solver.lastResult().levels()) {
        settledBelowDriver += f.decidedEdges();
      }
    }
    assertTrue(settledBelowDriver > 0, "no part settled anything below the driver");
  }

  /**
   * A solver with the smallest bound, from {@code bound} up by factors of {@code growth}, for
   * which the last level's rest fits (below that the solve stops with a clear error, checked
   * here).
   */
  static HierarchicalSolver fitting(PartSolver parts, ReducedGraph graph,
      SuperBlocks superBlocks, long bound, int growth) {
    while (true) {
      HierarchicalSolver solver = new HierarchicalSolver(parts, superBlocks, bound, null);
      try {
        solver.clusters(graph);
        return solver;
      } catch (SunderException tooLarge) {
        assertTrue(tooLarge.getMessage().contains("solve.maxDriverEdges = " + bound),
            tooLarge.getMessage());
        bound *= growth;
      }
    }
  }

  @Test
  void edgeFilesInTheWorkDirGiveTheSameResult(@TempDir Path dir) {
    Random random = new Random(17);
    BlockGrid grid = RandomReducedGraphs.grid(6, 5, 3);
    IdLayout layout = IdLayout.forGrid(grid);
    ReducedGraph graph = RandomReducedGraphs.graph(grid, layout, random, false, 10, 3);
    SuperBlocks superBlocks = new SuperBlocks(grid, layout, 2);
    long bound = HierarchicalTissueTest.boundForLevels(graph, superBlocks,
        HierarchicalSolver.mutexEdges(graph).size(), 3);
    HierarchicalSolver inMemory = new HierarchicalSolver(new MutexPartSolver(), superBlocks,
        bound, null);
    HierarchicalSolver onDisk = new HierarchicalSolver(new MutexPartSolver(), superBlocks,
        bound, dir);
    assertArrayEquals(inMemory.clusters(graph), onDisk.clusters(graph));
    assertTrue(dir.resolve("level-1").toFile().list().length > 0);
    HierarchicalSolve.Result figures = onDisk.lastResult();
    assertTrue(figures.levels().size() >= 2, "levels: " + figures.levels());
    assertTrue(figures.levels().get(0).decidedEdges() > 0, "level 1 settled nothing");
  }

  @Test
  void aMethodWithoutALevelSolveOverTheBoundIsAClearError() {
    HierarchicalSolve.requireDriverFits("fragments-agglomeration", 100, 100);
    SunderException error = assertThrows(SunderException.class,
        () -> HierarchicalSolve.requireDriverFits("fragments-agglomeration", 101, 100));
    assertTrue(error.getMessage().contains("fragments-agglomeration")
        && error.getMessage().contains("101 edges")
        && error.getMessage().contains("solve.maxDriverEdges = 100"), error.getMessage());
  }

  @Test
  void aSingleSuperBlockOverTheBoundIsAClearError() {
    Random random = new Random(5);
    BlockGrid grid = RandomReducedGraphs.grid(2, 2, 1);
    IdLayout layout = IdLayout.forGrid(grid);
    ReducedGraph graph = RandomReducedGraphs.graph(grid, layout, random, false, 8, 3);
    HierarchicalSolver solver = new HierarchicalSolver(new MutexPartSolver(),
        new SuperBlocks(grid, layout, 2), 1, null);
    SunderException error = assertThrows(SunderException.class, () -> solver.clusters(graph));
    assertTrue(error.getMessage().contains("solve.maxDriverEdges = 1"), error.getMessage());
  }
}
