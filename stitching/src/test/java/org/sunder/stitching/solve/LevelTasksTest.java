package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.grid.BlockGrid;
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
 * The task functions of the level-by-level solve, run in a shuffled order (seeded) within each
 * step, as a cluster may run them: each block's map equals the single-level solve's, and the
 * final ids are consecutive from 1. Also the files' damage checks and the plan's estimate.
 */
class LevelTasksTest {
  private static final long[] SHAPE = {64, 56, 20};
  private static final int[] CHUNK = {8, 8, 4};
  private static final int[] BLOCK = {8, 8, 4};
  private static final int[] HALO = {3, 3, 2};
  private static final Degradation MILD = new Degradation(7, 0.7, 0.08, 0.01, 0.0005, 0);

  @TempDir
  Path dir;

  @Test
  void shuffledTaskOrderGivesTheSingleLevelMapsAndConsecutiveIds() {
    // every long-range edge: the scene's reduced graph is then large enough for two levels
    PartitionConfig config = PartitionConfig.mutexWatershed(null, Subsampling.none());
    TissueScene scene = TissueScene.small(11, SHAPE, MILD);
    Path root = dir.resolve("scene");
    SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
    StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
    setup.validateInputs();
    setup.createLabels();
    BlockGrid grid = setup.grid();
    List<BlockSummary> summaries = new ArrayList<>();
    List<SeamEdges> seams = new ArrayList<>();
    long pairs = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
      pairs += summaries.get(b).innerEdges().size();
    }
    for (int f = 0; f < grid.faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
      pairs += seams.get(f).edges().size();
    }
    SolvedFinalIds expected = GlobalSolve.run(setup, summaries, seams).solved();
    LevelFiles files = new LevelFiles(dir.resolve("levels"));
    SuperBlocks superBlocks = LevelTasks.superBlocks(setup);
    Random random = new Random(13);
    long maxRows = LevelTasks.rows(config, pairs / 3);
    long rows = LevelTasks.rows(config, pairs);
    List<long[]> merges = new ArrayList<>();
    long[] below = new long[0];
    int level = 1;
    while (LevelTasks.needsLevel(superBlocks, level, rows, maxRows)) {
      int parts = superBlocks.partCount(level);
      long[] edges = new long[parts];
      long[] partMerges = new long[parts];
      List<LevelTasks.PartRecord> records = new ArrayList<>();
      for (int p : shuffled(parts, random)) {
        LevelTasks.PartRecord r = LevelTasks.up(setup, files, level, p, below, summaries::get,
            seams::get);
        records.add(r);
        edges[p] = r.edgesChecksum();
        partMerges[p] = r.mergesChecksum();
      }
      merges.add(partMerges);
      below = edges;
      rows = LevelTasks.nextLevelEdges(records);
      level++;
    }
    int levels = level - 1;
    assertTrue(levels >= 2, "levels " + levels);
    // the plan's model (half the edges handed up per level) predicts this run's levels
    LevelEstimate estimate = LevelEstimate.of(setup, pairs, pairs / 3);
    assertEquals(levels, estimate.levels());
    long records = 2 + grid.blockCount();
    for (int l = 1; l <= levels; l++) {
      records += 2L * superBlocks.partCount(l);
    }
    assertEquals(records, estimate.taskRecords());
    assertEquals(0, LevelEstimate.of(setup, pairs, pairs).levels());
    long[] finals = LevelTasks.driver(setup, files, levels, below).finalsChecksums();
    long[] blockChecksums = new long[grid.blockCount()];
    long[] notOwned = new long[grid.blockCount()];
    for (int l = levels; l >= 1; l--) {
      long[] next = l == 1 ? blockChecksums : new long[superBlocks.partCount(l - 1)];
      for (int p : shuffled(superBlocks.partCount(l), random)) {
        LevelTasks.DownRecord r = LevelTasks.down(setup, files, l, p, finals[p],
            merges.get(l - 1)[p]);
        for (int c = 0; c < r.children().length; c++) {
          next[r.children()[c]] = r.checksums()[c];
          notOwned[r.children()[c]] += l == 1 ? r.entries()[c] : 0;
        }
      }
      finals = next;
    }
    long[] segments = new long[grid.blockCount()];
    for (int b = 0; b < segments.length; b++) {
      segments[b] = summaries.get(b).segmentCount();
    }
    long[] offsets = LevelTasks.offsets(segments, notOwned);
    assertEquals(expected.finalIdCount(), offsets[grid.blockCount()]);
    boolean[] seen = new boolean[(int) expected.finalIdCount() + 1];
    for (int b : shuffled(grid.blockCount(), random)) {
      Path file = dir.resolve("ids").resolve(b + ".part");
      LevelTasks.blockIds(setup, files, b, offsets, blockChecksums, file);
      BlockIdMap map = BlockIdMap.of(setup.idLayout(), segments[b],
          BlockIdMapFile.readPart(file, b));
      assertEquals(expected.blockMap(b), map, "block " + b);
      for (int local = 1; local < map.finalIds().length; local++) {
        seen[(int) map.finalIds()[local]] = true;
      }
    }
    for (int id = 1; id < seen.length; id++) {
      assertTrue(seen[id], "final id " + id + " unused: ids are not consecutive");
    }
  }

  /**
   * The plan's model hands up half of a level's edges, and 0.8 for the default method's
   * multicut, whose parts hold back every node with a pair leaving them: the driver's share is
   * the method's rows times that fraction per level.
   */
  @Test
  void thePlansModelTakesTheMulticutToHandUpMorePerLevel() {
    TissueScene scene = TissueScene.small(11, SHAPE, MILD);
    Path root = dir.resolve("scene");
    SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
    long pairs = 1_000_000;
    long bound = 100_000;
    for (PartitionConfig config : List.of(PartitionConfig.mutexWatershed(null,
        Subsampling.none()), PartitionConfig.robustDefault(null))) {
      StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
      double handedUp = LevelEstimate.handedUpPerLevel(config);
      assertEquals(config.isMutexWatershed() ? 0.5 : 0.8, handedUp);
      LevelEstimate estimate = LevelEstimate.of(setup, pairs, bound);
      assertEquals(2, estimate.levels(), config.method().jsonName());  // 1 part at level 3
      assertEquals(LevelTasks.rows(config, pairs) * Math.pow(handedUp, 2),
          estimate.driverEdges(), 1.0, config.method().jsonName());
    }
  }

  @Test
  void subPartsFromTheGridsShapeAreTheChildrenFoundFromEveryBlock() {
    // a grid of 7 x 5 x 3 blocks: cut-off super-blocks along every axis
    BlockGrid grid = BlockGrid.of(new long[] {28, 15, 6}, new int[] {4, 3, 2},
        new int[] {4, 3, 2}, new int[] {1, 1, 1});
    SuperBlocks superBlocks = new SuperBlocks(grid,
        org.sunder.blockwise.grid.IdLayout.forGrid(grid), 2);
    for (int level = 2; superBlocks.partCount(level - 1) > 1; level++) {
      int[][] children = HierarchicalSolve.childrenOf(superBlocks, level - 1);
      for (int p = 0; p < superBlocks.partCount(level); p++) {
        assertEquals(java.util.Arrays.toString(children[p]),
            java.util.Arrays.toString(superBlocks.subParts(level, p)), "level " + level
            + " part " + p);
      }
    }
  }

  private static List<Integer> shuffled(int n, Random random) {
    List<Integer> order = new ArrayList<>();
    for (int i = 0; i < n; i++) {
      order.add(i);
    }
    Collections.shuffle(order, random);
    return order;
  }

  @Test
  void aMergeMapFileFromAnotherTaskOrDamagedIsRefused() throws Exception {
    MergeMap map = new MergeMap(new long[] {3, 9, 12}, new long[] {1, 3, 2});
    Path file = dir.resolve("m.reps");
    long checksum = MergeMapFile.write(file, map);
    assertEquals(map, MergeMapFile.read(file, checksum));
    assertEquals(3, map.apply(9));
    assertEquals(7, map.apply(7));
    SunderException other = assertThrows(SunderException.class,
        () -> MergeMapFile.read(file, checksum + 1));
    assertTrue(other.getMessage().contains(file.toString()), other.getMessage());
    byte[] bytes = Files.readAllBytes(file);
    bytes[20] ^= 1;
    Files.write(file, bytes);
    assertThrows(SunderException.class, () -> MergeMapFile.read(file, -1));
    assertThrows(IllegalArgumentException.class,
        () -> new MergeMap(new long[] {4, 4}, new long[] {1, 1}));
    SolveEdges edges = new SolveEdges(2);
    edges.add(5, 9, 0.25, 5, 9, SolveEdges.MAX);
    edges.add(5, 11, -0.5, 5, 11, SolveEdges.MIN);
    Path edgeFile = dir.resolve("p.edges");
    long edgesChecksum = EdgeFile.write(edgeFile, edges);
    assertEquals(edges, EdgeFile.read(edgeFile, edgesChecksum));
    SunderException stale = assertThrows(SunderException.class,
        () -> EdgeFile.read(edgeFile, edgesChecksum ^ 1));
    assertTrue(stale.getMessage().contains(edgeFile.toString())
        && stale.getMessage().contains("recorded"), stale.getMessage());
  }
}
