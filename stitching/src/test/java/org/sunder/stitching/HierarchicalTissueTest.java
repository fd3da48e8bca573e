package org.sunder.stitching;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.mutex.MutexWatershedSolver;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.HierarchicalSolve;
import org.sunder.stitching.solve.HierarchicalSolver;
import org.sunder.stitching.solve.LinkagePartSolver;
import org.sunder.stitching.solve.MutexPartSolver;
import org.sunder.stitching.solve.ReducedGraph;
import org.sunder.stitching.solve.SuperBlocks;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

/**
 * On the reduced graph of a blockwise run over synthetic tissue (exact and degraded
 * affinities), the hierarchical Mutex Watershed with bounds that force two and three levels,
 * and the hierarchical mean agglomeration with the lowest bounds its parts reach, give the
 * single-level solve's partition.
 */
public class HierarchicalTissueTest {
  private static final long[] SHAPE = {64, 56, 20};
  private static final int[] CHUNK = {8, 8, 4};
  private static final int[] BLOCK = {16, 8, 4};
  private static final int[] HALO = {3, 3, 2};
  private static final Degradation MILD = new Degradation(7, 0.7, 0.08, 0.01, 0.0005, 0);

  @TempDir
  Path dir;

  @Test
  void twoAndThreeLevelsEqualTheSingleLevelSolve() {
    for (Degradation degradation : new Degradation[] {Degradation.none(), MILD}) {
      TissueScene scene = TissueScene.small(11, SHAPE, degradation);
      Path root = dir.resolve(degradation.isNone() ? "exact" : "mild");
      SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
      StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO,
          PartitionConfig.mutexWatershed(null, null));
      ReducedGraph graph = reducedGraph(setup);
      int[] expected =
          RandomReducedGraphs.canonical(new MutexWatershedSolver().clusters(graph));
      SuperBlocks superBlocks = new SuperBlocks(setup.grid(), setup.idLayout(), 2);
      int edges = HierarchicalSolver.mutexEdges(graph).size();
      for (int wantLevels = 2; wantLevels <= 3; wantLevels++) {
        long bound = boundForLevels(graph, superBlocks, edges, wantLevels);
        HierarchicalSolver solver =
            new HierarchicalSolver(new MutexPartSolver(), superBlocks, bound, null);
        int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
        HierarchicalSolve.Result result = solver.lastResult();
        assertTrue(result.levels().size() + 1 >= wantLevels, "levels " + result.levels());
        assertArrayEquals(expected, actual, "levels " + result.levels());
      }
    }
  }

  @Test
  void meanAgglomerationAtTwoAndThreeLevelsEqualsTheSingleLevelSolve() {
    for (Degradation degradation : new Degradation[] {Degradation.none(), MILD}) {
      TissueScene scene = TissueScene.small(12, SHAPE, degradation);
      Path root = dir.resolve(degradation.isNone() ? "mean-exact" : "mean-mild");
      SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
      PartitionConfig config = PartitionConfig.agglomeration(Linkage.MEAN, false, null, null);
      StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
      ReducedGraph graph = reducedGraph(setup);
      int[] expected = RandomReducedGraphs.canonical(
          GlobalSolve.solverFor(config).clusters(graph));
      SuperBlocks superBlocks = new SuperBlocks(setup.grid(), setup.idLayout(), 2);
      LinkagePartSolver parts = new LinkagePartSolver(Linkage.MEAN, false, config.threshold());
      long rows = HierarchicalSolver.linkageEdges(graph).size();
      for (long bound : new long[] {rows / 2, rows / 8}) {
        HierarchicalSolver solver = null;
        for (long b = bound; solver == null; b *= 2) {
          try {
            HierarchicalSolver attempt = new HierarchicalSolver(parts, superBlocks, b, null);
            attempt.clusters(graph);
            solver = attempt;
          } catch (org.sunder.blockwise.SunderException tooSmall) {
            assertTrue(tooSmall.getMessage().contains("solve.maxDriverEdges"));
          }
        }
        int[] actual = RandomReducedGraphs.canonical(solver.clusters(graph));
        assertArrayEquals(expected, actual, "levels " + solver.lastResult().levels());
        if (!degradation.isNone()) {
          // exact affinities tie every mean inside an object: parts settle almost nothing there
          assertTrue(solver.lastResult().levels().size() >= 1, "no level below the driver");
        }
      }
    }
  }

  /** The largest bound (a power of 2) under which the solve uses {@code levels} levels. */
  public static long boundForLevels(ReducedGraph graph, SuperBlocks superBlocks, int edges,
      int levels) {
    for (long bound = Long.highestOneBit(edges); bound >= 1; bound /= 2) {
      HierarchicalSolver solver =
          new HierarchicalSolver(new MutexPartSolver(), superBlocks, bound, null);
      try {
        solver.clusters(graph);
      } catch (org.sunder.blockwise.SunderException tooSmall) {
        return bound * 2;
      }
      if (solver.lastResult().levels().size() + 1 >= levels) {
        return bound;
      }
    }
    return 1;
  }

  static ReducedGraph reducedGraph(StitchingSetup setup) {
    setup.validateInputs();
    setup.createLabels();
    BlockGrid grid = setup.grid();
    List<BlockSummary> summaries = new ArrayList<>();
    for (int b = 0; b < grid.blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
    }
    List<SeamEdges> seams = new ArrayList<>();
    for (int f = 0; f < grid.faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
    }
    return ReducedGraph.assemble(setup.idLayout(), summaries, seams);
  }
}
