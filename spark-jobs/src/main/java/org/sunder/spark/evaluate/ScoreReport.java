package org.sunder.spark.evaluate;

import java.io.PrintStream;
import java.util.Locale;
import org.sunder.blockwise.metrics.ObjectOverlaps;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.metrics.SegmentationScores;

/**
 * Prints {@link SegmentationScores} and {@link SeamAudit}s for people (and, one value per line,
 * for scripts).
 */
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

  /**
   * Prints a seam audit: with ground truth the objects cut at block faces against the control
   * planes, always the boundary share at both, and a verdict line that says whether the seams
   * are worse than the control.
   *
   * @param blocks the block core shape as the user writes it, e.g. {@code "[10, 28, 32] (zyx)"}
   */
  public static void printSeamAudit(SeamAudit a, String blocks, PrintStream out) {
    out.println("seam audit: blocks " + blocks + ", " + a.facePlanes() + " face planes against"
        + " as many control planes half a block away");
    if (a.facePlanes() == 0) {
      out.println("  no block face inside the volume: nothing to audit");
      return;
    }
    if (a.withGroundTruth()) {
      out.println("  objects_cut_at_faces   " + a.objectsCutAtFaces() + "  (of "
          + a.objectsCrossingFaces() + " objects crossing a face)");
      out.println("  objects_cut_at_control " + a.objectsCutAtControl() + "  (of "
          + a.objectsCrossingControl() + " objects crossing a control plane)");
    }
    out.println(String.format(Locale.ROOT, "  boundary_share_faces   %.6f  (%d of %d voxel pairs)",
        a.faceBoundaryShare(), a.faceBoundaryPairs(), a.facePairs()));
    out.println(String.format(Locale.ROOT, "  boundary_share_control %.6f  (%d of %d voxel pairs)",
        a.controlBoundaryShare(), a.controlBoundaryPairs(), a.controlPairs()));
    String objects = String.format(Locale.ROOT, "%d objects cut at faces, %d at control planes"
        + " (tolerance +%d)", a.objectsCutAtFaces(), a.objectsCutAtControl(),
        SeamAudit.OBJECT_TOLERANCE);
    String shares = String.format(Locale.ROOT, "boundary share %.4f at faces, %.4f at control"
        + " planes (tolerance +%.0f %%)", a.faceBoundaryShare(), a.controlBoundaryShare(),
        100 * SeamAudit.SHARE_MARGIN);
    String reason = a.withGroundTruth() ? objects : shares;
    if (a.worseThanControl()) {
      out.println("  SEAMS WORSE THAN THE CONTROL: " + reason
          + "; objects are cut on block faces more than elsewhere, the mark of a stitching"
          + " defect");
    } else {
      out.println("  seams no worse than the control: " + reason);
    }
    if (a.withGroundTruth() && a.boundariesWorseThanControl() != a.objectsWorseThanControl()) {
      out.println("  note: the boundary share " + (a.boundariesWorseThanControl()
          ? "alone would flag the seams: " : "alone would not flag the seams: ") + shares);
    }
  }
}
