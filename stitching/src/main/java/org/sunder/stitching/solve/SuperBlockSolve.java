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
 * Fragment agglomeration, whose solve first joins continued pieces, and the multicut on another
 * linkage get a clear error. A size filter ({@code minSegmentSize}) runs after the solve as a
 * second pass of the same steps, its own folder ({@link LevelFiles#sizeFilter}) and part solver
 * ({@link SizeFilterPartSolver}), whose final representatives replace the solve's: the
 * single-level filter's result on the solve's segments.
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
    return config.isMutexWatershed() || config.method() instanceof AgglomerationMethod
        || isMulticut(config);
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
    Pass solve = pass(setup, files, LevelTasks.rows(config, pairs),
        LevelTasks.rows(config, maxDriverEdges),
        (level, part, below) -> LevelTasks.up(setup, files, level, part, below, summaryOf,
            seamsOf),
        LevelTasks.partSolver(config),
        (levels, rows) -> LevelTasks.requireDriverFits(config, levels, rows, maxDriverEdges));
    if (solve.levels == 0) {
      throw new IllegalArgumentException(pairs + " pairs fit under solve.maxDriverEdges = "
          + maxDriverEdges + ": solve them whole (GlobalSolve)");
    }
    Pass result = solve;
    LevelFiles idFiles = files;
    if (config.minSegmentSize() > 1) {
      // its rows are above its bound whenever the solve's were: it runs at least one level
      LevelFiles filterFiles = files.sizeFilter();
      long[] solvedChecksums = solve.blockChecksums;
      result = pass(setup, filterFiles, LevelTasks.sizeFilterRows(pairs),
          LevelTasks.sizeFilterRows(maxDriverEdges),
          (level, part, below) -> LevelTasks.sizeFilterUp(setup, filterFiles, level, part,
              below, summaryOf, seamsOf,
              b -> MergeMapFile.read(files.finals(0, b), solvedChecksums[b])),
          LevelTasks.sizeFilterSolver(config),
          (levels, rows) -> LevelTasks.requireSizeFilterFits(levels, rows, maxDriverEdges));
      // the filter's representatives include the solve's: its finals replace the solve's
      idFiles = filterFiles;
    }
    long[] blockChecksums = result.blockChecksums;
    long[] notOwned = result.notOwned;
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
      LevelTasks.blockIds(setup, idFiles, b, offsets, blockChecksums, file);
      parts.add(BlockIdMapFile.readPart(file, b));
    }
    long finalIds = offsets[grid.blockCount()];
    SolvedFinalIds solved = SolvedFinalIds.ofParts(setup.idLayout(), segmentCounts, parts,
        finalIds);
    SolveReport report = new SolveReport(
        LevelTasks.methodName(config, solve.levels, result.levels),
        Arrays.stream(segmentCounts).sum(),
        (int) Math.min(Integer.MAX_VALUE, nodes), (int) Math.min(Integer.MAX_VALUE, pairs),
        finalIds, (System.nanoTime() - start) / 1e9);
    return new GlobalSolve.Result(solved, report);
  }

  /**
   * One pass's level-0 representatives: per block the checksum of its {@link LevelFiles#finals}
   * file and its entries (segments another one represents).
   */
  private record Pass(int levels, long[] blockChecksums, long[] notOwned) {}

  /** Step 1 of a pass for one part. */
  private interface UpStep {
    LevelTasks.PartRecord run(int level, int part, long[] belowChecksums);
  }

  /** The check that what the levels leave fits the driver. */
  private interface FitCheck {
    void require(int levels, long rows);
  }

  /**
   * Runs a pass's steps one after another: levels up while its rows are above {@code maxRows},
   * the driver, levels down. No level when the rows fit at once (nothing is written).
   */
  private static Pass pass(StitchingSetup setup, LevelFiles files, long rows, long maxRows,
      UpStep up, PartSolver solver, FitCheck fits) {
    SuperBlocks superBlocks = LevelTasks.superBlocks(setup);
    int blocks = setup.grid().blockCount();
    List<long[]> mergesChecksums = new ArrayList<>();
    long[] below = new long[0];
    int level = 1;
    while (LevelTasks.needsLevel(superBlocks, level, rows, maxRows)) {
      int parts = superBlocks.partCount(level);
      List<LevelTasks.PartRecord> records = new ArrayList<>();
      long[] edges = new long[parts];
      long[] merges = new long[parts];
      for (int p = 0; p < parts; p++) {
        LevelTasks.PartRecord r = up.run(level, p, below);
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
    fits.require(levels, rows);
    if (levels == 0) {
      return new Pass(0, null, null);
    }
    long[] finals = LevelTasks.driver(setup, files, levels, below, solver).finalsChecksums();
    long[] blockChecksums = new long[blocks];
    long[] notOwned = new long[blocks];
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
    return new Pass(levels, blockChecksums, notOwned);
  }
}
