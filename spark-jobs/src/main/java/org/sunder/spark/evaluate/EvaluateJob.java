package org.sunder.spark.evaluate;

import java.util.List;
import java.util.stream.IntStream;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.Function;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.spark.progress.ProgressListener;
import org.sunder.stitching.scores.EvaluationScores;
import org.sunder.stitching.setup.EvaluationTarget;
import org.sunder.stitching.task.BoxCounts;
import org.sunder.stitching.task.EvaluateTask;

/**
 * Scores any segmentation against any ground truth on Spark, outside a run: one
 * {@link EvaluateTask} per box of whole segmentation chunks ({@link EvaluateTask#boxes}), the
 * partial contingency tables summed on the driver. O(voxels) work, O(label pairs) driver memory.
 */
public final class EvaluateJob {
  private EvaluateJob() {}

  public static EvaluationScores score(JavaSparkContext sc, EvaluationTarget target) {
    BlockGrid grid = EvaluateTask.boxes(target);
    List<Integer> indices = IntStream.range(0, grid.blockCount()).boxed().toList();
    sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, "evaluate");
    List<BoxCounts> parts;
    try {
      parts = sc.parallelize(indices, Math.max(1, Math.min(indices.size(), 20_000)))
          .map(new CountBox(target, grid)).collect();
    } finally {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
    }
    return EvaluateTask.score(parts, target.ignoreBackground());
  }

  /** One box's contingency table. */
  static final class CountBox implements Function<Integer, BoxCounts> {
    private static final long serialVersionUID = 1L;
    private final EvaluationTarget target;
    private final BlockGrid grid;

    CountBox(EvaluationTarget target, BlockGrid grid) {
      this.target = target;
      this.grid = grid;
    }

    @Override
    public BoxCounts call(Integer index) {
      Block block = grid.block(index);
      return EvaluateTask.count(target, block.coreMin(), block.coreMax());
    }
  }
}
