package org.sunder.spark.evaluate;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.stream.IntStream;
import net.imglib2.FinalInterval;
import net.imglib2.Interval;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.Function;
import org.apache.spark.api.java.function.Function2;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.metrics.SeamPlanes;
import org.sunder.blockwise.metrics.SeamTally;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.spark.progress.ProgressListener;

/**
 * Audits the seams of a segmentation on Spark ({@link SeamAudit}): one task per face of the
 * block grid with the given core shape reads the two voxel layers around the face and around its
 * control plane ({@link SeamPlanes#slabsOf}) and returns its {@link SeamTally}; tallies are
 * merged per partition on the executors and then on the driver. No voxel array leaves a task;
 * a tally holds two counts per plane and one entry per (plane, object) met. Reads about
 * {@code 4 * face area} voxels per face (whole chunks around each slab).
 */
public final class SeamAuditJob {
  private SeamAuditJob() {}

  /**
   * Audits {@code target}'s segmentation; with its ground truth when {@code target.truth()} is
   * not null (then both must have the same shape). Voxels outside the target's mask count as
   * segment 0 (ignored).
   *
   * @param blockShape block core shape, memory order
   */
  public static SeamAudit audit(JavaSparkContext sc, EvaluationTarget target, int[] blockShape) {
    long[] shape = target.truth() == null ? labelShape(target)
        : BlockContingency.requireComparable(target);
    if (blockShape.length != shape.length) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "seam audit: block shape "
          + Arrays.toString(blockShape) + " has " + blockShape.length + " entries; the"
          + " segmentation has " + shape.length + " dimensions");
    }
    SeamPlanes planes = new SeamPlanes(shape, blockShape);
    BlockGrid grid = BlockGrid.of(shape, blockShape, blockShape, new int[shape.length]);
    boolean withTruth = target.truth() != null;
    if (grid.faceCount() == 0) {
      return new SeamTally(planes, withTruth).audit();
    }
    List<Integer> faces = IntStream.range(0, grid.faceCount()).boxed().toList();
    sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, "seam audit");
    try {
      return sc.parallelize(faces, Math.min(faces.size(), 20_000))
          .map(new TallyFace(target, grid, planes))
          .reduce(new MergeTallies())
          .audit();
    } finally {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
    }
  }

  private static long[] labelShape(EvaluationTarget target) {
    Container c = Container.open(Path.of(target.segmentationContainer()));
    if (!c.datasetExists(target.segmentation())) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "no segmentation dataset '"
          + target.segmentation() + "' in " + target.segmentationContainer());
    }
    return c.openDataset(target.segmentation()).shape();
  }

  /** The tally of one face's two slabs (read inside the task). */
  static SeamTally tally(EvaluationTarget target, SeamPlanes planes, Face face) {
    boolean withTruth = target.truth() != null;
    SeamTally tally = new SeamTally(planes, withTruth);
    Interval[] slabs = planes.slabsOf(face);
    if (slabs.length == 0) {
      return tally;
    }
    Dataset segmentation = Container.open(Path.of(target.segmentationContainer()))
        .openDataset(target.segmentation());
    Dataset truth = withTruth
        ? Container.open(Path.of(target.truthContainer())).openDataset(target.truth()) : null;
    Dataset mask = target.mask() == null ? null
        : Container.open(Path.of(target.maskContainer())).openDataset(target.mask());
    for (Interval slab : slabs) {
      FinalInterval box = new FinalInterval(slab);
      long[] seg = LabelArrays.toLongs(segmentation.read(box), segmentation.dataType(),
          "segmentation '" + target.segmentation() + "'");
      long[] gt = truth == null ? null : LabelArrays.toLongs(truth.read(box), truth.dataType(),
          "ground truth '" + target.truth() + "'");
      if (mask != null) {
        byte[] inside = LabelArrays.toBytes(mask.read(box));
        for (int i = 0; i < seg.length; i++) {
          if (inside[i] == 0) {
            seg[i] = 0;
          }
        }
      }
      tally.add(face.axis(), box.minAsLongArray(), box.maxAsLongArray(), gt, seg);
    }
    return tally;
  }

  /** Face index to the tally of its slabs. */
  static final class TallyFace implements Function<Integer, SeamTally> {
    private static final long serialVersionUID = 1L;
    private final EvaluationTarget target;
    private final BlockGrid grid;
    private final SeamPlanes planes;

    TallyFace(EvaluationTarget target, BlockGrid grid, SeamPlanes planes) {
      this.target = target;
      this.grid = grid;
      this.planes = planes;
    }

    @Override
    public SeamTally call(Integer face) {
      return tally(target, planes, grid.face(face));
    }
  }

  /** Merges the second tally into the first. */
  static final class MergeTallies implements Function2<SeamTally, SeamTally, SeamTally> {
    private static final long serialVersionUID = 1L;

    @Override
    public SeamTally call(SeamTally a, SeamTally b) {
      a.merge(b);
      return a;
    }
  }
}
