package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.stitching.SceneStore;
import org.sunder.stitching.TissueScene;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

/**
 * The level-by-level solve from per-part inputs gives the single-level solve's final ids,
 * number for number, on a blockwise run over degraded synthetic tissue.
 */
class SuperBlockSolveTest {
  private static final long[] SHAPE = {64, 56, 20};
  private static final int[] CHUNK = {8, 8, 4};
  private static final int[] BLOCK = {16, 8, 4};
  private static final int[] HALO = {3, 3, 2};
  private static final Degradation MILD = new Degradation(7, 0.7, 0.08, 0.01, 0.0005, 0);

  @TempDir
  Path dir;

  private record Tables(List<BlockSummary> summaries, List<SeamEdges> seams, long pairs) {}

  private static Tables tables(StitchingSetup setup) {
    setup.validateInputs();
    setup.createLabels();
    BlockGrid grid = setup.grid();
    List<BlockSummary> summaries = new ArrayList<>();
    long pairs = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
      pairs += summaries.get(b).innerEdges().size();
    }
    List<SeamEdges> seams = new ArrayList<>();
    for (int f = 0; f < grid.faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
      pairs += seams.get(f).edges().size();
    }
    return new Tables(summaries, seams, pairs);
  }

  /** With and without a size filter after the solve (a second pass of levels). */
  @Test
  void mutexWatershedAndMeanAgglomerationEqualTheSingleLevelFinalIds() {
    PartitionConfig[] configs = {PartitionConfig.mutexWatershed(null, null),
        PartitionConfig.agglomeration(Linkage.MEAN, false, null, null),
        PartitionConfig.fromJson("{\"method\": \"mutex-watershed\", \"minSegmentSize\": 40}"),
        PartitionConfig.fromJson("{\"method\": \"agglomeration\", \"linkage\": \"mean\","
            + " \"minSegmentSize\": 40}")};
    int leveled = 0;
    for (PartitionConfig config : configs) {
      TissueScene scene = TissueScene.small(11, SHAPE, MILD);
      String name = config.method().jsonName() + config.minSegmentSize();
      Path root = dir.resolve(name);
      SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
      StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
      Tables t = tables(setup);
      FinalIdMap expected = GlobalSolve.run(setup, t.summaries(), t.seams()).finalIds();
      for (long bound = t.pairs() - 1; bound >= t.pairs() / 16; bound = bound * 3 / 4) {
        GlobalSolve.Result levels;
        try {
          levels = SuperBlockSolve.run(setup, t.pairs(), bound, t.summaries()::get,
              t.seams()::get, dir.resolve("levels-" + name + "-" + bound));
        } catch (SunderException tooSmall) {
          // the rest after every level does not fit under so low a bound: a clear error
          assertEquals(ErrorKind.INVALID_CONFIG, tooSmall.kind(), tooSmall.getMessage());
          assertTrue(tooSmall.getMessage().contains("solve.maxDriverEdges"));
          continue;
        }
        assertTrue(levels.report().method().contains("levels of super-blocks"),
            levels.report().method());
        assertEquals(expected, levels.finalIds(), config.method().jsonName() + " bound "
            + bound + ": " + levels.report());
        if (!levels.report().method().contains("(0 levels")) {
          leveled++;
        }
      }
      assertTrue(leveled >= 1, config.method().jsonName() + ": no solve used a level");
      leveled = 0;
    }
  }

  @Test
  void fragmentAgglomerationAndAMulticutOnAnotherLinkageGetAClearError() {
    assertTrue(SuperBlockSolve.supports(
        PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}")));
    assertTrue(SuperBlockSolve.supports(
        PartitionConfig.fromJson("{\"method\": \"fragments-multicut\", \"minSegmentSize\": 20}")));
    for (String json : new String[] {"{\"method\": \"fragments-agglomeration\"}",
        "{\"method\": \"fragments-multicut\", \"linkage\": \"mean\"}"}) {
      PartitionConfig config = PartitionConfig.fromJson(json);
      assertTrue(!SuperBlockSolve.supports(config), json);
      SunderException e = assertThrows(SunderException.class,
          () -> SuperBlockSolve.requireFits(config, 500, 100));
      assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
      assertTrue(e.getMessage().contains(config.method().jsonName())
          && e.getMessage().contains("solve.maxDriverEdges = 100"), e.getMessage());
    }
  }

  /**
   * The default method's size filter after the multicut, level by level: the single-level
   * filter ({@link FinalSizeFilter}, as {@link GlobalSolve} runs it) applied to the level-by-level
   * multicut's segments, number for number, at every bound that fits.
   */
  @Test
  void sizeFilterAfterTheMulticutLevelByLevelIsTheSingleLevelFilter() {
    PartitionConfig config = PartitionConfig.fromJson(
        "{\"method\": \"fragments-multicut\", \"minSegmentSize\": 60}");
    PartitionConfig plain = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}");
    TissueScene scene = TissueScene.small(11, SHAPE, MILD);
    Path root = dir.resolve("multicut-filtered");
    SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
    StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
    StitchingSetup plainSetup = new StitchingSetup(setup.inputRoot(), setup.affinitiesPath(),
        setup.maskPath(), setup.outputRoot(), setup.labelsPath(), setup.grid(), setup.offsets(),
        plain);
    Tables t = tables(setup);
    IdLayout layout = setup.idLayout();
    ReducedGraph graph = ReducedGraph.assemble(layout, t.summaries(), t.seams());
    long[] segmentCounts = new long[t.summaries().size()];
    for (BlockSummary s : t.summaries()) {
      segmentCounts[s.block()] = s.segmentCount();
    }
    int leveled = 0;
    for (long bound = t.pairs() - 1; bound >= t.pairs() / 16; bound = bound * 3 / 4) {
      GlobalSolve.Result filtered;
      GlobalSolve.Result multicut;
      try {
        filtered = SuperBlockSolve.run(setup, t.pairs(), bound, t.summaries()::get,
            t.seams()::get, dir.resolve("filtered-" + bound));
        multicut = SuperBlockSolve.run(plainSetup, t.pairs(), bound, t.summaries()::get,
            t.seams()::get, dir.resolve("plain-" + bound));
      } catch (SunderException tooSmall) {
        assertEquals(ErrorKind.INVALID_CONFIG, tooSmall.kind(), tooSmall.getMessage());
        continue;
      }
      FinalIdMap segments = multicut.finalIds();
      int[] clusters = new int[graph.nodeCount()];
      for (int i = 0; i < clusters.length; i++) {
        clusters[i] = (int) segments.apply(graph.nodeIds()[i]);
      }
      FinalSizeFilter.Result expected = FinalSizeFilter.apply(layout, t.summaries(), graph,
          clusters, config);
      FinalIdMap expectedIds = GlobalSolve.solvedWithJoined(layout, segmentCounts,
          graph.nodeIds(), expected.clusterOfNode(), expected.joinedIds(),
          expected.joinedCluster()).toMap();
      assertEquals(expectedIds, filtered.finalIds(), "bound " + bound);
      assertTrue(filtered.finalIds().finalIdCount() < segments.finalIdCount(),
          "the filter merged nothing");
      leveled++;
    }
    assertTrue(leveled >= 2, leveled + " bounds fitted");
  }

  /**
   * The default method's multicut, level by level from per-part inputs, on a blockwise run over
   * synthetic tissue with and without degradation: every level-by-level solve that fits is a
   * partition whose multicut objective on the reduced graph is within 3% of the single-level
   * one's. Measured at two levels: 99.3% of it undegraded, 98.8% with mild degradation. (Even
   * undegraded tissue gives fragment pairs across objects a positive summed weight, so a part's
   * multicut need not agree with the whole graph's; the identity on inputs where they agree is
   * checked in {@link MulticutPartSolverTest}.)
   */
  @Test
  void multicutLevelByLevelIsCloseToTheSingleLevelOnTissue() {
    PartitionConfig config = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}");
    for (Degradation degradation : new Degradation[] {Degradation.none(), MILD}) {
      TissueScene scene = TissueScene.small(11, SHAPE, degradation);
      String name = degradation.isNone() ? "multicut-exact" : "multicut-mild";
      Path root = dir.resolve(name);
      SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
      StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
      Tables t = tables(setup);
      GlobalSolve.Result single = GlobalSolve.run(setup, t.summaries(), t.seams());
      ReducedGraph graph = ReducedGraph.assemble(setup.idLayout(), t.summaries(), t.seams());
      double expected = objective(graph, single.finalIds());
      int leveled = 0;
      for (long bound = t.pairs() / 2; bound >= t.pairs() / 64; bound /= 2) {
        GlobalSolve.Result levels;
        try {
          levels = SuperBlockSolve.run(setup, t.pairs(), bound, t.summaries()::get,
              t.seams()::get, dir.resolve("levels-" + name + bound));
        } catch (SunderException tooSmall) {
          assertEquals(ErrorKind.INVALID_CONFIG, tooSmall.kind(), tooSmall.getMessage());
          assertTrue(tooSmall.getMessage().contains("solve.maxDriverEdges"));
          continue;
        }
        String what = name + " bound " + bound + ": " + levels.report();
        assertTrue(levels.report().method().contains("domain decomposition"), what);
        leveled++;
        double actual = objective(graph, levels.finalIds());
        // both negative: at most 3% less gain than the single-level solve, or more
        assertTrue(actual <= expected + 0.03 * Math.abs(expected), what + ": objective "
            + actual + " against " + expected);
      }
      assertTrue(leveled >= 1, name + ": no solve used a level");
    }
  }

  /** The multicut objective (summed weights of cut pairs) of final ids on a reduced graph. */
  private static double objective(ReducedGraph graph, FinalIdMap ids) {
    org.sunder.blockwise.graph.EdgeStatistics edges = graph.edges();
    double sum = 0;
    for (int e = 0; e < edges.size(); e++) {
      long a = ids.apply(graph.nodeIds()[(int) edges.u(e)]);
      long b = ids.apply(graph.nodeIds()[(int) edges.v(e)]);
      sum += a != b ? edges.sum(e) : 0;
    }
    return sum;
  }
}
