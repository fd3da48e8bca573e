package org.sunder.stitching.solve;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.function.IntFunction;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.config.AgglomerationMethod;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * The global solve of a reduced graph larger than the driver bound, without assembling it: the
 * level driver ({@link HierarchicalSolve}) reads each level-1 part's input from that part's own
 * block summaries and nearby seam edges ({@link PartInputs}), the parts' outputs go to edge
 * files in the work dir, and the final ids are numbered from each block's representatives
 * ({@link SolvedFinalIds}). Gives the clusters, and so the final ids, of the single-level solve
 * of the method (Mutex Watershed, or agglomeration of voxels with its linkage); the fragment
 * methods, whose solve first joins continued pieces, and the multicut, which needs the whole
 * graph, get a clear error, as does a size filter (it needs every final segment's neighbours).
 *
 * <p>The level driver bounds rows, not pairs: a pair is at most 2 Mutex Watershed rows (its
 * largest and smallest weight) and 4 linkage rows, so the bound of {@code solve.maxDriverEdges}
 * pairs becomes that many times as many rows.
 */
public final class SuperBlockSolve {
  /** Blocks per axis of a level's super-block in those of the level below. */
  public static final int FACTOR = 2;

  private SuperBlockSolve() {}

  /** Whether the method's solve can run level by level (else {@link #requireFits} applies). */
  public static boolean supports(PartitionConfig config) {
    return config.minSegmentSize() <= 1 && (config.isMutexWatershed()
        || config.method() instanceof AgglomerationMethod);
  }

  /** The clear error for a method without a level-by-level solve whose graph is too large. */
  public static void requireFits(PartitionConfig config, long pairs, long maxDriverEdges) {
    String method = config.method().jsonName()
        + (config.minSegmentSize() > 1 ? " with minSegmentSize " + config.minSegmentSize()
            : "");
    HierarchicalSolve.requireDriverFits(method, pairs, maxDriverEdges);
  }

  /**
   * Solves the run level by level.
   *
   * @param pairs an upper bound of the reduced graph's pairs (from the tasks' records)
   * @param summaryOf reads one block's summary (each read at most twice)
   * @param seamsOf reads one face's seam edges
   * @param workDir where the levels' edge files go
   */
  public static GlobalSolve.Result run(StitchingSetup setup, long pairs, long maxDriverEdges,
      IntFunction<BlockSummary> summaryOf, IntFunction<SeamEdges> seamsOf, Path workDir) {
    long start = System.nanoTime();
    PartitionConfig config = setup.partition();
    if (!supports(config)) {
      requireFits(config, pairs, maxDriverEdges);
    }
    BlockGrid grid = setup.grid();
    IdLayout layout = setup.idLayout();
    boolean linkage = !config.isMutexWatershed();
    PartSolver parts = linkage
        ? new LinkagePartSolver(config.linkage(), config.constraints(), config.threshold())
        : new MutexPartSolver();
    int rowsPerPair = linkage ? 4 : 2;
    SuperBlocks superBlocks = new SuperBlocks(grid, layout, FACTOR);
    HierarchicalSolve.Result levels;
    try {
      levels = HierarchicalSolve.run(superBlocks,
          Math.multiplyHigh(pairs, rowsPerPair) != 0 ? Long.MAX_VALUE : pairs * rowsPerPair,
          p -> PartInputs.levelOne(grid, superBlocks, Math.max(p, 0), linkage, summaryOf,
              seamsOf),
          Math.multiplyHigh(maxDriverEdges, rowsPerPair) != 0 ? Long.MAX_VALUE
              : maxDriverEdges * rowsPerPair,
          parts, workDir);
    } catch (SunderException e) {
      if (e.kind() != ErrorKind.INVALID_CONFIG) {
        throw e;
      }
      throw new SunderException(ErrorKind.INVALID_CONFIG, "the " + parts.name() + " solve,"
          + " level by level over super-blocks of " + FACTOR + "^level blocks per axis, still"
          + " leaves the driver a graph with more than solve.maxDriverEdges = " + maxDriverEdges
          + " pairs (" + e.getMessage() + "); raise solve.maxDriverEdges", e);
    }
    RepresentativeMaps reps = levels.representatives();
    long[] segmentCounts = new long[grid.blockCount()];
    int nodes = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      BlockSummary s = summaryOf.apply(b);
      segmentCounts[b] = s.segmentCount();
      nodes += s.boundaryLocalIds().length;
    }
    long[] nodeIds = new long[nodes];
    int at = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      for (int local : summaryOf.apply(b).boundaryLocalIds()) {
        nodeIds[at++] = layout.provisional(b, local);
      }
    }
    long[] representative = reps.resolve(nodeIds);
    SolvedFinalIds solved = SolvedFinalIds.number(layout, segmentCounts, nodeIds,
        denseClusters(representative));
    long segments = Arrays.stream(segmentCounts).sum();
    SolveReport report = new SolveReport(parts.name() + " (" + levels.levels().size()
        + " levels of super-blocks)", segments, nodes, (int) Math.min(Integer.MAX_VALUE, pairs),
        solved.finalIdCount(), (System.nanoTime() - start) / 1e9);
    return new GlobalSolve.Result(solved, report);
  }

  /** Equal values get equal cluster indices (0, 1, ...). O(n log n). */
  static int[] denseClusters(long[] values) {
    long[] sorted = values.clone();
    Arrays.sort(sorted);
    int unique = 0;
    for (int i = 0; i < sorted.length; i++) {
      if (i == 0 || sorted[i] != sorted[i - 1]) {
        sorted[unique++] = sorted[i];
      }
    }
    int[] out = new int[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = Arrays.binarySearch(sorted, 0, unique, values[i]);
    }
    return out;
  }
}
