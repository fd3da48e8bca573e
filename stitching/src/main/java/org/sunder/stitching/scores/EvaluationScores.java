package org.sunder.stitching.scores;

import java.io.PrintStream;
import java.util.List;
import java.util.Locale;
import org.sunder.blockwise.metrics.ObjectOverlaps;
import org.sunder.blockwise.metrics.SegmentationScores;

/**
 * The scores of a segmentation against its ground truth as a run or a stand-alone evaluation
 * hands them on: their text for people (and, one value per line, for scripts) and the worst
 * splits and merges.
 */
public final class EvaluationScores {
  /** Worst splits and merges listed in the text, each. */
  private static final int LISTED = 5;

  private final SegmentationScores scores;

  public EvaluationScores(SegmentationScores scores) {
    this.scores = scores;
  }

  /** Ground-truth objects spread over several segments, worst first. */
  public List<Overlap> worstSplits() {
    return rows(scores.worstSplits());
  }

  /** Segments covering several ground-truth objects, worst first. */
  public List<Overlap> worstMerges() {
    return rows(scores.worstMerges());
  }

  /** Prints the scores, then the five worst splits and merges. */
  public void print(boolean ignoreBackground, PrintStream out) {
    SegmentationScores s = scores;
    out.println("scores over " + s.evaluatedVoxels() + " voxels"
        + (ignoreBackground ? " (ground-truth label 0 ignored)" : ""));
    out.println(String.format(Locale.ROOT, "  voi_split            %.6f bits", s.voiSplit()));
    out.println(String.format(Locale.ROOT, "  voi_merge            %.6f bits", s.voiMerge()));
    out.println(String.format(Locale.ROOT, "  adapted_rand_error   %.6f", s.adaptedRandError()));
    out.println(String.format(Locale.ROOT, "  rand_precision       %.6f", s.randPrecision()));
    out.println(String.format(Locale.ROOT, "  rand_recall          %.6f", s.randRecall()));
    out.println(String.format(Locale.ROOT, "  adjusted_rand_index  %.6f", s.adjustedRandIndex()));
    out.println("  segments             " + s.segmentCount());
    out.println("  ground_truth_objects " + s.groundTruthObjectCount());
    if (!s.worstSplits().isEmpty()) {
      out.println("  worst splits (ground-truth object: voxels, pieces):");
      for (ObjectOverlaps o : s.worstSplits().subList(0, Math.min(LISTED, s.worstSplits().size()))) {
        out.println("    " + Long.toUnsignedString(o.label()) + ": " + o.voxels() + " voxels in "
            + o.overlapCount() + " segments");
      }
    }
    if (!s.worstMerges().isEmpty()) {
      out.println("  worst merges (segment: voxels, objects):");
      for (ObjectOverlaps o : s.worstMerges().subList(0, Math.min(LISTED, s.worstMerges().size()))) {
        out.println("    " + Long.toUnsignedString(o.label()) + ": " + o.voxels()
            + " voxels covering " + o.overlapCount() + " objects");
      }
    }
  }

  private static List<Overlap> rows(List<ObjectOverlaps> list) {
    return list.stream().map(o -> new Overlap(o.label(), o.voxels(), o.overlapCount(),
        o.misassignedVoxels())).toList();
  }
}
