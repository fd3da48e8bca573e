package org.sunder.stitching.solve;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.IntFunction;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.AgglomerationMethod;
import org.sunder.blockwise.partition.config.FragmentsMulticutMethod;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * The global solve of a reduced graph larger than the driver bound, without assembling it:
 * level by level over super-blocks, each part of a level a task ({@link LevelTasks}) that reads
 * its input from its own blocks' summaries and nearby seam edges ({@link PartInputs}) or from
 * the files its sub-parts wrote, the driver solving only what the top level hands up, and the
 * final ids composed on the way down and numbered per block, from files. Gives the clusters,
 * and so the final ids, of the single-level solve of the method (Mutex Watershed, or
 * agglomeration of voxels with its linkage). The multicut of {@code fragments-multicut} on
 * summed weights runs level by level by domain decomposition ({@link MulticutPartSolver}): a
 * valid partition whose objective is close to, not equal to, the single-level one's.
 * Fragment agglomeration, whose solve first joins continued pieces, the multicut on another
 * linkage, and a size filter (it needs every final segment's neighbours) get a clear error.
 *
 * <p>The levels bound rows, not pairs: a pair is at most 2 Mutex Watershed rows (its largest and
 * smallest weight), 4 linkage rows and 1 multicut row, so the bound of
 * {@code solve.maxDriverEdges} pairs becomes that many times as many rows
 * ({@link LevelTasks#rows}).
 */
public final class SuperBlockSolve {
  /** Blocks per axis of a level's super-block in those of the level below. */
  public static final int FACTOR = 2;

  private SuperBlockSolve() {}

  /** Whether the method's solve can run level by level (else {@link #requireFits} applies). */
  public static boolean supports(PartitionConfig config) {
    return config.minSegmentSize() <= 1 && (config.isMutexWatershed()
        || config.method() instanceof AgglomerationMethod || isMulticut(config));
  }

  /**
   * Whether the run's solve is a multicut on summed weights (the default of
   * {@code fragments-multicut}), solved level by level by domain decomposition
   * ({@link MulticutPartSolver}); a multicut on another linkage has no additive contracted
   * problem and stays on the driver.
   */
  static boolean isMulticut(PartitionConfig config) {
    return config.method() instanceof FragmentsMulticutMethod && config.linkage() == Linkage.SUM;
  }

  /** The clear error for a method without a level-by-level solve whose graph is too large. */
  public static void requireFits(PartitionConfig config, long pairs, long maxDriverEdges) {
    String method = config.method().jsonName()
        + (config.minSegmentSize() > 1 ? " with minSegmentSize " + config.minSegmentSize()
            : "");
    HierarchicalSolve.requireDriverFits(method, pairs, maxDriverEdges);
  }

  /**
   * Solves the run level by level in this thread, through the same task functions and files a
   * cluster run uses ({@link LevelTasks}), one task after another (the in-process runner and
   * tests; the Spark runner schedules each level's parts as tasks).
   *
   * @param pairs an upper bound of the reduced graph's pairs (from the tasks' records)
   * @param summaryOf reads one block's summary
   * @param seamsOf reads one face's seam edges
   * @param workDir where the levels' files go ({@link LevelFiles})
   */
  public static GlobalSolve.Result run(StitchingSetup setup, long pairs, long maxDriverEdges,
      IntFunction<BlockSummary> summaryOf, IntFunction<SeamEdges> seamsOf, Path workDir) {
    long start = System.nanoTime();
    PartitionConfig config = setup.partition();
    if (!supports(config)) {
      requireFits(config, pairs, maxDriverEdges);
    }
    BlockGrid grid = setup.grid();
    LevelFiles files = new LevelFiles(workDir);
    SuperBlocks superBlocks = LevelTasks.superBlocks(setup);
    long maxRows = LevelTasks.rows(config, maxDriverEdges);
    long rows = LevelTasks.rows(config, pairs);
    List<long[]> mergesChecksums = new ArrayList<>();
    long[] below = new long[0];
    int level = 1;
    while (LevelTasks.needsLevel(superBlocks, level, rows, maxRows)) {
      int parts = superBlocks.partCount(level);
      List<LevelTasks.PartRecord> records = new ArrayList<>();
      long[] edges = new long[parts];
      long[] merges = new long[parts];
      for (int p = 0; p < parts; p++) {
        LevelTasks.PartRecord r = LevelTasks.up(setup, files, level, p, below, summaryOf,
            seamsOf);
        records.add(r);
        edges[p] = r.edgesChecksum();
        merges[p] = r.mergesChecksum();
      }
      mergesChecksums.add(merges);
      below = edges;
      rows = LevelTasks.nextLevelEdges(records);
      level++;
    }
    int levels = level - 1;
    LevelTasks.requireDriverFits(config, levels, rows, maxDriverEdges);
    if (levels == 0) {
      throw new IllegalArgumentException(pairs + " pairs fit under solve.maxDriverEdges = "
          + maxDriverEdges + ": solve them whole (GlobalSolve)");
    }
    long[] finals = LevelTasks.driver(setup, files, levels, below).finalsChecksums();
    long[] blockChecksums = new long[grid.blockCount()];
    long[] notOwned = new long[grid.blockCount()];
    for (int l = levels; l >= 1; l--) {
      long[] next = new long[superBlocks.partCount(l - 1 == 0 ? 1 : l - 1)];
      for (int p = 0; p < superBlocks.partCount(l); p++) {
        LevelTasks.DownRecord r = LevelTasks.down(setup, files, l, p, finals[p],
            mergesChecksums.get(l - 1)[p]);
        for (int c = 0; c < r.children().length; c++) {
          if (l == 1) {
            blockChecksums[r.children()[c]] = r.checksums()[c];
            notOwned[r.children()[c]] = r.entries()[c];
          } else {
            next[r.children()[c]] = r.checksums()[c];
          }
        }
      }
      finals = next;
    }
    long[] segmentCounts = new long[grid.blockCount()];
    long nodes = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      BlockSummary s = summaryOf.apply(b);
      segmentCounts[b] = s.segmentCount();
      nodes += s.boundaryLocalIds().length;
    }
    long[] offsets = LevelTasks.offsets(segmentCounts, notOwned);
    List<SolvedFinalIds.BlockPart> parts = new ArrayList<>();
    Path shares = workDir.resolve("ids");
    for (int b = 0; b < grid.blockCount(); b++) {
      Path file = shares.resolve(b + ".part");
      LevelTasks.blockIds(setup, files, b, offsets, blockChecksums, file);
      parts.add(BlockIdMapFile.readPart(file, b));
    }
    long finalIds = offsets[grid.blockCount()];
    SolvedFinalIds solved = SolvedFinalIds.ofParts(setup.idLayout(), segmentCounts, parts,
        finalIds);
    SolveReport report = new SolveReport(LevelTasks.partSolver(config).name() + " (" + levels
        + " levels of super-blocks)", Arrays.stream(segmentCounts).sum(),
        (int) Math.min(Integer.MAX_VALUE, nodes), (int) Math.min(Integer.MAX_VALUE, pairs),
        finalIds, (System.nanoTime() - start) / 1e9);
    return new GlobalSolve.Result(solved, report);
  }
}
