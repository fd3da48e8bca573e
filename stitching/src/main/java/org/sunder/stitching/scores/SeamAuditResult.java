package org.sunder.stitching.scores;

import java.io.PrintStream;
import java.util.Locale;
import org.sunder.blockwise.metrics.SeamAudit;

/**
 * The seam audit of a segmentation ({@link SeamAudit}: objects cut at block faces against
 * control planes half a block away) as a run or a stand-alone evaluation hands it on, with its
 * text.
 */
public final class SeamAuditResult {
  private final SeamAudit audit;

  public SeamAuditResult(SeamAudit audit) {
    this.audit = audit;
  }

  /**
   * Prints the audit: with ground truth the objects cut at block faces against the control
   * planes, always the boundary share at both, and a verdict line that says whether the seams
   * are worse than the control.
   *
   * @param blocks the block core shape as the user writes it, e.g. {@code "[10, 28, 32] (zyx)"}
   */
  public void print(String blocks, PrintStream out) {
    SeamAudit a = audit;
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
