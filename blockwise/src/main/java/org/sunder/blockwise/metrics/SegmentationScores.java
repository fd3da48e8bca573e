package org.sunder.blockwise.metrics;

import java.util.List;
import java.util.Objects;

/**
 * Scores of a segmentation against ground truth, as computed by {@link Scorer}. Entropies are in
 * bits; every score is a function of the contingency table of evaluated voxels.
 *
 * @param voiSplit conditional entropy H(segmentation | ground truth): the split part of the
 *     variation of information; 0 when no object is broken
 * @param voiMerge conditional entropy H(ground truth | segmentation): the merge part; 0 when no
 *     segment covers two objects
 * @param adaptedRandError 1 - F-score of Rand precision and recall
 * @param randPrecision pairs of distinct voxels together in both / pairs together in the
 *     segmentation (falls below 1 with merges)
 * @param randRecall pairs of distinct voxels together in both / pairs together in the ground
 *     truth (falls below 1 with splits)
 * @param adjustedRandIndex Rand index adjusted for chance; 1 for identical partitions
 * @param segmentCount distinct non-zero segment labels among evaluated voxels
 * @param groundTruthObjectCount distinct non-zero ground-truth labels among evaluated voxels
 * @param evaluatedVoxels voxels the scores are over
 * @param worstSplits ground-truth objects broken into several segments, worst first
 * @param worstMerges segments covering several ground-truth objects, worst first
 */
public record SegmentationScores(double voiSplit, double voiMerge, double adaptedRandError,
    double randPrecision, double randRecall, double adjustedRandIndex, long segmentCount,
    long groundTruthObjectCount, long evaluatedVoxels, List<ObjectOverlaps> worstSplits,
    List<ObjectOverlaps> worstMerges) {

  public SegmentationScores {
    worstSplits = List.copyOf(Objects.requireNonNull(worstSplits, "worstSplits"));
    worstMerges = List.copyOf(Objects.requireNonNull(worstMerges, "worstMerges"));
  }

  /** The variation of information, split plus merge, in bits. */
  public double voi() {
    return voiSplit + voiMerge;
  }
}
