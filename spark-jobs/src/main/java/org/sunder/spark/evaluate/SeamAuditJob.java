package org.sunder.spark.evaluate;

import java.util.List;
import java.util.stream.IntStream;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.Function;
import org.apache.spark.api.java.function.Function2;
import org.sunder.spark.progress.ProgressListener;
import org.sunder.stitching.scores.SeamAuditResult;
import org.sunder.stitching.setup.EvaluationTarget;
import org.sunder.stitching.task.SeamAuditTally;
import org.sunder.stitching.task.SeamAuditTask;

/**
 * Audits the seams of a segmentation on Spark ({@link SeamAuditResult}): one {@link SeamAuditTask}
 * per face; tallies are merged per partition on the executors and then on the driver. No voxel
 * array leaves a task; a tally holds two counts per plane and one entry per (plane, object) met.
 */
public final class SeamAuditJob {
  private SeamAuditJob() {}

  /**
   * Audits {@code target}'s segmentation; with its ground truth when {@code target.truth()} is
   * not null (then both must have the same shape).
   *
   * @param blockShape block core shape, memory order
   */
  public static SeamAuditResult audit(JavaSparkContext sc, EvaluationTarget target, int[] blockShape) {
    SeamAuditTask task = SeamAuditTask.of(target, blockShape);
    if (task.faceCount() == 0) {
      return task.emptyTally().audit();
    }
    List<Integer> faces = IntStream.range(0, task.faceCount()).boxed().toList();
    sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, "seam audit");
    try {
      return sc.parallelize(faces, Math.min(faces.size(), 20_000))
          .map(new TallyFace(task))
          .reduce(new MergeTallies())
          .audit();
    } finally {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
    }
  }

  /** Face index to the tally of its slabs. */
  static final class TallyFace implements Function<Integer, SeamAuditTally> {
    private static final long serialVersionUID = 1L;
    private final SeamAuditTask task;

    TallyFace(SeamAuditTask task) {
      this.task = task;
    }

    @Override
    public SeamAuditTally call(Integer face) {
      return task.tally(face);
    }
  }

  /** Merges the second tally into the first. */
  static final class MergeTallies implements Function2<SeamAuditTally, SeamAuditTally, SeamAuditTally> {
    private static final long serialVersionUID = 1L;

    @Override
    public SeamAuditTally call(SeamAuditTally a, SeamAuditTally b) {
      return a.merge(b);
    }
  }
}
