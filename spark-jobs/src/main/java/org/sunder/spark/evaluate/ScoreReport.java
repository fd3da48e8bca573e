package org.sunder.spark.evaluate;

import java.io.PrintStream;
import java.util.Locale;
import org.sunder.blockwise.metrics.ObjectOverlaps;
import org.sunder.blockwise.metrics.SegmentationScores;

/** Prints {@link SegmentationScores} for people (and, one value per line, for scripts). */
public final class ScoreReport {
  private ScoreReport() {}

  public static void print(SegmentationScores s, boolean ignoreBackground, PrintStream out) {
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
      for (ObjectOverlaps o : s.worstSplits().subList(0, Math.min(5, s.worstSplits().size()))) {
        out.println("    " + Long.toUnsignedString(o.label()) + ": " + o.voxels() + " voxels in "
            + o.overlapCount() + " segments");
      }
    }
    if (!s.worstMerges().isEmpty()) {
      out.println("  worst merges (segment: voxels, objects):");
      for (ObjectOverlaps o : s.worstMerges().subList(0, Math.min(5, s.worstMerges().size()))) {
        out.println("    " + Long.toUnsignedString(o.label()) + ": " + o.voxels()
            + " voxels covering " + o.overlapCount() + " objects");
      }
    }
  }
}
