package org.sunder.stitching.task;

import java.io.Serializable;
import java.nio.file.Path;
import java.util.Arrays;
import net.imglib2.FinalInterval;
import net.imglib2.Interval;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.metrics.LabelArrays;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.metrics.SeamPlanes;
import org.sunder.blockwise.metrics.SeamTally;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.stitching.setup.EvaluationTarget;

/**
 * The seam audit ({@link SeamAudit}) of a segmentation as tasks, one per face of the block grid
 * with the given core shape: {@link #tally(int)} reads the two voxel layers around the face and
 * around its control plane ({@link SeamPlanes#slabsOf}) and returns its
 * {@link SeamAuditTally}; tallies merge in any order. With the ground truth when the target names one. Voxels outside
 * the target's mask count as segment 0 (ignored). Reads about {@code 4 * face area} voxels per
 * face (whole chunks around each slab).
 *
 * @param target the segmentation (and ground truth, mask)
 * @param grid the audited blocks (no halo)
 * @param planes the face and control planes
 */
public record SeamAuditTask(EvaluationTarget target, BlockGrid grid, SeamPlanes planes)
    implements Serializable {

  /**
   * The audit of {@code target} for blocks of {@code blockShape} (memory order), after checking
   * the datasets ({@link EvaluateTask#requireComparable} with a ground truth).
   *
   * @throws SunderException INVALID_CONFIG if the block shape has the wrong dimension
   */
  public static SeamAuditTask of(EvaluationTarget target, int[] blockShape) {
    long[] shape = target.truth() == null ? EvaluateTask.segmentationShape(target)
        : EvaluateTask.requireComparable(target);
    if (blockShape.length != shape.length) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "seam audit: block shape "
          + Arrays.toString(blockShape) + " has " + blockShape.length + " entries; the"
          + " segmentation has " + shape.length + " dimensions");
    }
    return new SeamAuditTask(target, BlockGrid.of(shape, blockShape, blockShape,
        new int[shape.length]), new SeamPlanes(shape, blockShape));
  }

  /** Number of tasks (faces). */
  public int faceCount() {
    return grid.faceCount();
  }

  /** A tally with nothing counted yet (the result when there is no face). */
  public SeamAuditTally emptyTally() {
    return new SeamAuditTally(newCounts());
  }

  private SeamTally newCounts() {
    return new SeamTally(planes, target.truth() != null);
  }

  /** The tally of face {@code faceIndex}'s slabs (read here). */
  public SeamAuditTally tally(int faceIndex) {
    Face face = grid.face(faceIndex);
    SeamTally tally = newCounts();
    Interval[] slabs = planes.slabsOf(face);
    if (slabs.length == 0) {
      return new SeamAuditTally(tally);
    }
    Dataset segmentation = Container.open(Path.of(target.segmentationContainer()))
        .openDataset(target.segmentation());
    Dataset truth = target.truth() == null ? null
        : Container.open(Path.of(target.truthContainer())).openDataset(target.truth());
    Dataset mask = target.mask() == null ? null
        : Container.open(Path.of(target.maskContainer())).openDataset(target.mask());
    for (Interval slab : slabs) {
      FinalInterval box = new FinalInterval(slab);
      long[] seg = LabelArrays.labels(segmentation.read(box), segmentation.dataType());
      long[] gt = truth == null ? null : LabelArrays.labels(truth.read(box), truth.dataType());
      if (mask != null) {
        byte[] inside = LabelArrays.mask(mask.read(box));
        for (int i = 0; i < seg.length; i++) {
          if (inside[i] == 0) {
            seg[i] = 0;
          }
        }
      }
      tally.add(face.axis(), box.minAsLongArray(), box.maxAsLongArray(), gt, seg);
    }
    return new SeamAuditTally(tally);
  }
}
