package org.sunder.spark.report;

import java.util.List;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;

/**
 * What one stage cost, from the task timings in the work dir (whichever runs recorded them).
 *
 * @param tasks tasks of the stage
 * @param timed recorded tasks that carry a timing
 * @param wallSeconds from the first timed task's start to the last one's end
 * @param coreSeconds the timed tasks' durations added up (one task holds one core)
 * @param voxels voxels the timed tasks covered
 */
public record StageFigures(Stage stage, int tasks, int timed, double wallSeconds,
    double coreSeconds, long voxels) {

  /** Millions of voxels per second per core, or NaN without timed work. */
  public double megavoxelsPerCoreSecond() {
    return coreSeconds > 0 ? voxels / coreSeconds / 1e6 : Double.NaN;
  }

  /**
   * The figures of {@code ledger}'s stage. {@code voxelsOfTask} gives the voxels task {@code i}
   * covers. O(tasks).
   */
  public static StageFigures of(StageLedger ledger, int tasks,
      java.util.function.IntToLongFunction voxelsOfTask) {
    List<long[]> rows = ledger.timings();
    long first = Long.MAX_VALUE;
    long last = Long.MIN_VALUE;
    long millis = 0;
    long voxels = 0;
    for (long[] row : rows) {
      first = Math.min(first, row[1]);
      last = Math.max(last, row[2]);
      millis += row[2] - row[1];
      voxels += voxelsOfTask.applyAsLong((int) row[0]);
    }
    double wall = rows.isEmpty() ? 0 : (last - first) / 1000.0;
    return new StageFigures(ledger.stage(), tasks, rows.size(), wall, millis / 1000.0, voxels);
  }
}
