package org.sunder.blockwise.metrics;

/**
 * Whether a blockwise segmentation is cut along its block faces more than along planes that
 * merely lie between voxel layers: a stitching defect shows as objects cut exactly on the faces.
 * Every figure is taken twice, on the block faces and on as many control planes half a block
 * away ({@link SeamPlanes}); a seam-free result scores about the same on both.
 *
 * <p>Definitions. A pair is two face-adjacent voxels on either side of a plane, both with a
 * non-zero segment label (see {@link SeamTally}).
 * <ul>
 *   <li>With ground truth: object {@code O} (ground-truth label {@code != 0}) is <em>cut</em> at
 *       a plane when at least {@value #MIN_PAIRS} pairs across it lie inside {@code O} (both
 *       voxels labelled {@code O}, so a grazing touch does not count) and at least half of those
 *       have different segment labels. An object counts once however many planes cut it. The
 *       seams are worse than the control when more than {@value #OBJECT_TOLERANCE} more objects
 *       are cut at faces than at control planes.
 *   <li>Always: the boundary share of a set of planes is the fraction of its pairs with
 *       different segment labels. Faces and control planes have equal numbers and areas, so
 *       the shares compare like for like. The seams are worse than the control when the face
 *       share exceeds the control share by more than {@link #SHARE_MARGIN} of it and the faces
 *       hold at least {@value #MIN_PAIRS} boundary pairs more than the control share predicts
 *       (so that a nearly boundary-free volume is not flagged for a handful of pairs).
 * </ul>
 *
 * @param withGroundTruth whether the object counts were taken (else they are 0)
 * @param facePlanes audited block-face planes (as many control planes)
 * @param objectsCrossingFaces objects with at least {@value #MIN_PAIRS} pairs across some face
 * @param objectsCutAtFaces objects cut at some face
 * @param objectsCrossingControl objects with at least {@value #MIN_PAIRS} pairs across some
 *     control plane
 * @param objectsCutAtControl objects cut at some control plane
 * @param facePairs pairs across faces
 * @param faceBoundaryPairs of those, pairs with different segment labels
 * @param controlPairs pairs across control planes
 * @param controlBoundaryPairs of those, pairs with different segment labels
 */
public record SeamAudit(boolean withGroundTruth, int facePlanes, long objectsCrossingFaces,
    long objectsCutAtFaces, long objectsCrossingControl, long objectsCutAtControl,
    long facePairs, long faceBoundaryPairs, long controlPairs, long controlBoundaryPairs) {

  /** Fewest pairs of one object across a plane for a cut to count. */
  public static final int MIN_PAIRS = 4;
  /** Objects cut at faces beyond the control count that are still tolerated. */
  public static final int OBJECT_TOLERANCE = 2;
  /**
   * Relative excess of the face boundary share over the control share that is tolerated.
   * Measured: with the ground truth itself as segmentation (no seam at all) on synthetic tissue
   * of 64 x 56 x 20 voxels, 40 seeds times blocks 16 x 14 x 10, 32 x 28 x 10 and 8 x 8 x 4 (x y z),
   * the face share exceeded the control share by more than 25 % in 8 of 120 cases, by more than
   * 50 % in 1 (by 69 %, on 3 face planes); boundaries lying in a plane are correlated, so small
   * volumes scatter widely. A block face that cuts every object raises the share about
   * five-fold.
   */
  public static final double SHARE_MARGIN = 0.5;

  /**
   * Audits a whole volume held in memory: {@code new SeamTally(...)}, {@link SeamTally#addVolume},
   * {@link SeamTally#audit}. O(pairs across the planes).
   *
   * @param groundTruth ground-truth labels (dimension 0 fastest), or {@code null} for the
   *     boundary shares only
   * @param segmentation segment labels of the same shape; 0 is ignored
   * @param volumeShape voxels per dimension, memory order
   * @param blockShape the block core shape of the run that produced the segmentation
   * @throws org.sunder.blockwise.SunderException if a shape or an array length is wrong
   */
  public static SeamAudit of(long[] groundTruth, long[] segmentation, long[] volumeShape,
      int[] blockShape) {
    SeamTally tally = new SeamTally(new SeamPlanes(volumeShape, blockShape), groundTruth != null);
    tally.addVolume(groundTruth, segmentation);
    return tally.audit();
  }

  /** Boundary pairs per pair across faces; 0 without pairs. */
  public double faceBoundaryShare() {
    return facePairs == 0 ? 0 : (double) faceBoundaryPairs / facePairs;
  }

  /** Boundary pairs per pair across control planes; 0 without pairs. */
  public double controlBoundaryShare() {
    return controlPairs == 0 ? 0 : (double) controlBoundaryPairs / controlPairs;
  }

  /** With ground truth: more than {@value #OBJECT_TOLERANCE} more objects cut at faces. */
  public boolean objectsWorseThanControl() {
    return withGroundTruth && objectsCutAtFaces > objectsCutAtControl + OBJECT_TOLERANCE;
  }

  /** The face boundary share beyond the control share by the documented margin. */
  public boolean boundariesWorseThanControl() {
    double control = controlBoundaryShare();
    double expected = control * facePairs;
    return faceBoundaryShare() > control * (1 + SHARE_MARGIN)
        && faceBoundaryPairs - expected >= MIN_PAIRS;
  }

  /** Either verdict: with ground truth the object count decides, else the boundary share. */
  public boolean worseThanControl() {
    return withGroundTruth ? objectsWorseThanControl() : boundariesWorseThanControl();
  }
}
