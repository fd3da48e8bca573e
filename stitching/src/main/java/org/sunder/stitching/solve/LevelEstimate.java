package org.sunder.stitching.solve;

import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The shape of the level-by-level solve before it runs, for {@code plan}: how many levels a
 * reduced graph of a given size needs under the driver bound, the largest task's graph, and the
 * driver's share. A model, not a measurement: each level is taken to hand up
 * {@value #HANDED_UP_PER_LEVEL} of its graph's edges ({@value #MULTICUT_HANDED_UP_PER_LEVEL} for
 * the multicut), and a part to hold its blocks' share of the level's edges times
 * {@value #LARGEST_PART_SKEW} (the largest part against the mean).
 *
 * @param levels levels of super-blocks (0 when the graph fits on the driver at once)
 * @param largestTaskEdges edges (rows) of the largest part of any level
 * @param driverEdges edges (rows) left to the driver
 * @param fits whether the driver's share is under the bound
 * @param taskRecords records the solve writes: every part of every level twice (up and down),
 *     the driver's, one per block for the final ids, and the stage's own
 */
public record LevelEstimate(int levels, long largestTaskEdges, long driverEdges, boolean fits,
    long taskRecords) {
  /**
   * Fraction of a level's edges handed up to the next: measured 0.49 at level 1 and 0.44 at
   * level 2 (Mutex Watershed, synthetic tissue with moderate degradation, 144 blocks of
   * 16 x 32 x 32 voxels; {@code LevelSolveBenchmark}), rounded up. The size filter's pass after
   * the default method's multicut handed up 0.31 and 0.39 of its rows at level 1 (the same
   * tissue, 144 and 576 blocks).
   */
  public static final double HANDED_UP_PER_LEVEL = 0.5;
  /**
   * The same for the multicut by domain decomposition, whose parts never contract a node with a
   * pair leaving them nor its neighbours: measured 0.84 and 0.74 at levels 1 and 2 (144 blocks)
   * and 0.88, 0.72 and 0.77 at levels 1 to 3 (576 blocks) on that tissue, 0.79 per level over
   * the levels at both sizes, rounded up.
   */
  public static final double MULTICUT_HANDED_UP_PER_LEVEL = 0.8;
  /** The largest part's edges against the mean part's: measured 1.4 (level 1), 1.9 (level 2). */
  public static final double LARGEST_PART_SKEW = 2.0;
  /**
   * Bytes of memory per edge of a solve held at once: the edge lists (33 bytes per edge), their
   * joined copy and the sort order; the figure the solve's error messages give.
   */
  public static final long BYTES_PER_EDGE = 150;

  /** The estimate for a reduced graph of {@code pairs} pairs. O(levels + blocks). */
  public static LevelEstimate of(StitchingSetup setup, long pairs, long maxDriverEdges) {
    PartitionConfig config = setup.partition();
    LevelEstimate e = estimate(setup, LevelTasks.rows(config, pairs),
        LevelTasks.rows(config, maxDriverEdges), handedUpPerLevel(config));
    // the per-block records of the final ids
    return e.levels() == 0 ? e : new LevelEstimate(e.levels(), e.largestTaskEdges(),
        e.driverEdges(), e.fits(), e.taskRecords() + setup.grid().blockCount());
  }

  /**
   * The estimate of the size filter's pass after a level-by-level solve (rows, not pairs:
   * {@link LevelTasks#sizeFilterRows}); its records exclude the final ids'. O(levels).
   */
  public static LevelEstimate sizeFilterOf(StitchingSetup setup, long pairs,
      long maxDriverEdges) {
    LevelEstimate e = estimate(setup, LevelTasks.sizeFilterRows(pairs),
        LevelTasks.sizeFilterRows(maxDriverEdges), HANDED_UP_PER_LEVEL);
    return new LevelEstimate(e.levels(), e.largestTaskEdges(), e.driverEdges(), e.fits(),
        e.taskRecords() - 1);
  }

  /** The fraction of a level's edges the model takes the run's method to hand up. */
  public static double handedUpPerLevel(PartitionConfig config) {
    return SuperBlockSolve.isMulticut(config) ? MULTICUT_HANDED_UP_PER_LEVEL
        : HANDED_UP_PER_LEVEL;
  }

  private static LevelEstimate estimate(StitchingSetup setup, double rows, long maxRows,
      double handedUp) {
    SuperBlocks superBlocks = LevelTasks.superBlocks(setup);
    long largest = 0;
    long records = 1;
    int level = 1;
    while (LevelTasks.needsLevel(superBlocks, level, (long) rows, maxRows)) {
      int parts = superBlocks.partCount(level);
      largest = Math.max(largest, (long) (rows / parts * LARGEST_PART_SKEW));
      records += 2L * parts;
      rows *= handedUp;
      level++;
    }
    int levels = level - 1;
    if (levels > 0) {
      records += 1;
    }
    return new LevelEstimate(levels, largest, (long) rows, rows <= maxRows, records);
  }

  /** Bytes of {@code edges} edges held by a solve. */
  public static long bytes(long edges) {
    return edges * BYTES_PER_EDGE;
  }
}
