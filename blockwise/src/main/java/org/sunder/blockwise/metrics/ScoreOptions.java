package org.sunder.blockwise.metrics;

/**
 * How {@link Scorer} reads a contingency table.
 *
 * @param ignoreGroundTruthZero voxels whose ground-truth label is 0 (unannotated) count in no
 *     score and no list; the usual setting for sparse ground truth
 * @param worstListLength how many objects the worst-split and worst-merge lists hold at most
 * @param overlapsListed how many overlapping labels each listed object shows at most (largest
 *     first); the object's total overlap count is always given
 */
public record ScoreOptions(boolean ignoreGroundTruthZero, int worstListLength, int overlapsListed) {

  /** Ignore ground-truth 0, list the 10 worst objects each with up to 8 overlaps. */
  public static final ScoreOptions DEFAULT = new ScoreOptions(true, 10, 8);

  public ScoreOptions {
    if (worstListLength < 0) {
      throw new IllegalArgumentException("worstListLength must be >= 0, got " + worstListLength);
    }
    if (overlapsListed < 1) {
      throw new IllegalArgumentException("overlapsListed must be >= 1, got " + overlapsListed);
    }
  }

  /** The same options with ground-truth label 0 treated as one more object (or ignored). */
  public ScoreOptions withIgnoreGroundTruthZero(boolean ignore) {
    return new ScoreOptions(ignore, worstListLength, overlapsListed);
  }
}
