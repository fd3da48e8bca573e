package org.sunder.spark.evaluate;

import java.util.List;
import java.util.stream.IntStream;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.Function;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.spark.progress.ProgressListener;

/**
 * Scores any segmentation against any ground truth on Spark, outside a run: one task per box of
 * whole segmentation chunks (about 2^20 voxels), the partial contingency tables summed on the
 * driver. O(voxels) work, O(label pairs) driver memory.
 */
public final class EvaluateJob {
  private EvaluateJob() {}

  public static SegmentationScores score(JavaSparkContext sc, EvaluationTarget target) {
    long[] shape = BlockContingency.requireComparable(target);
    Dataset segmentation = Container.open(java.nio.file.Path.of(target.segmentationContainer()))
        .openDataset(target.segmentation());
    int[] chunks = segmentation.chunkShape();
    int[] block = boxShape(shape, chunks);
    BlockGrid grid = BlockGrid.of(shape, chunks, block, new int[shape.length]);
    List<Integer> indices = IntStream.range(0, grid.blockCount()).boxed().toList();
    sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, "evaluate");
    List<ContingencyTable.Pairs> parts;
    try {
      parts = sc.parallelize(indices, Math.max(1, Math.min(indices.size(), 20_000)))
          .map(new CountBox(target, grid)).collect();
    } finally {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
    }
    ContingencyTable table = new ContingencyTable();
    for (ContingencyTable.Pairs pairs : parts) {
      for (int i = 0; i < pairs.size(); i++) {
        table.add(pairs.groundTruth()[i], pairs.segment()[i], pairs.count()[i]);
      }
    }
    return new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(target.ignoreBackground()))
        .score(table);
  }

  static int[] boxShape(long[] shape, int[] chunks) {
    int[] box = chunks.clone();
    while (true) {
      long voxels = 1;
      int grow = -1;
      for (int d = 0; d < box.length; d++) {
        voxels *= box[d];
        if (box[d] < shape[d] && (grow < 0 || box[d] < box[grow])) {
          grow = d;
        }
      }
      if (voxels >= (1L << 20) || grow < 0) {
        return box;
      }
      box[grow] += chunks[grow];
    }
  }

  /** One box's contingency table. */
  static final class CountBox implements Function<Integer, ContingencyTable.Pairs> {
    private static final long serialVersionUID = 1L;
    private final EvaluationTarget target;
    private final BlockGrid grid;

    CountBox(EvaluationTarget target, BlockGrid grid) {
      this.target = target;
      this.grid = grid;
    }

    @Override
    public ContingencyTable.Pairs call(Integer index) {
      Block block = grid.block(index);
      return BlockContingency.count(target, block.coreMin(), block.coreMax());
    }
  }
}
