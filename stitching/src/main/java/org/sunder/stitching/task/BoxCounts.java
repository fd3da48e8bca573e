package org.sunder.stitching.task;

import org.sunder.blockwise.metrics.ContingencyTable;

/**
 * The evaluate task's result: one box's contingency table as parallel arrays, one entry per
 * (ground-truth label, segment) pair that occurs in it, sorted by ground-truth label then
 * segment. Its components are those of {@link ContingencyTable.Pairs}, in the same order, so a
 * task record holds the same bytes as when the task returned the pairs themselves.
 *
 * @param groundTruth ground-truth label of each pair
 * @param segment segment label of each pair
 * @param count voxels of each pair
 */
public record BoxCounts(long[] groundTruth, long[] segment, long[] count) {
  public BoxCounts {
    if (segment.length != groundTruth.length || count.length != groundTruth.length) {
      throw new IllegalArgumentException("pair arrays differ in length");
    }
  }

  /** The counts of {@code pairs} (the arrays are shared, not copied). */
  static BoxCounts of(ContingencyTable.Pairs pairs) {
    return new BoxCounts(pairs.groundTruth(), pairs.segment(), pairs.count());
  }

  /** The number of pairs. */
  public int size() {
    return count.length;
  }
}
