package org.sunder.stitching.task;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import net.imglib2.FinalInterval;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.EvaluationRegion;
import org.sunder.blockwise.metrics.Evaluator;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.stitching.scores.EvaluationScores;
import org.sunder.stitching.setup.EvaluationTarget;

/**
 * Evaluation as tasks: {@link #count} gives one box's contingency table of a segmentation
 * against its ground truth (inside the mask, if any) through the blockwise {@link Evaluator};
 * {@link #score} sums the boxes' tables and scores them. The evaluate stage of a run counts one
 * box per block core; {@link #boxes} are the boxes of a stand-alone evaluation. O(voxels of a
 * box) per task, O(label pairs) for the sum.
 */
public final class EvaluateTask {
  /** A stand-alone evaluation's boxes hold at least this many voxels (whole chunks). */
  static final long BOX_VOXELS = 1L << 20;

  private EvaluateTask() {}

  /** Counts the voxels of the box {@code [min, max]} (memory order, inclusive). */
  public static BoxCounts count(EvaluationTarget target, long[] min, long[] max) {
    Dataset segmentation = Container.open(Path.of(target.segmentationContainer()))
        .openDataset(target.segmentation());
    Dataset truth = Container.open(Path.of(target.truthContainer())).openDataset(target.truth());
    EvaluationRegion region = target.mask() == null ? EvaluationRegion.whole()
        : EvaluationRegion.mask(Container.open(Path.of(target.maskContainer()))
            .openDataset(target.mask()));
    return BoxCounts.of(new Evaluator(truth, segmentation, region, null)
        .table(new FinalInterval(min, max)).sortedPairs());
  }

  /** The scores of the sum of the boxes' tables. */
  public static EvaluationScores score(List<BoxCounts> boxes, boolean ignoreBackground) {
    ContingencyTable table = new ContingencyTable();
    for (BoxCounts pairs : boxes) {
      for (int i = 0; i < pairs.size(); i++) {
        table.add(pairs.groundTruth()[i], pairs.segment()[i], pairs.count()[i]);
      }
    }
    return new EvaluationScores(new Scorer(ScoreOptions.DEFAULT
        .withIgnoreGroundTruthZero(ignoreBackground)).score(table));
  }

  /**
   * The boxes of a stand-alone evaluation of {@code target}: whole segmentation chunks, about
   * 2^20 voxels each; checks the datasets first ({@link #requireComparable}).
   */
  public static BlockGrid boxes(EvaluationTarget target) {
    long[] shape = requireComparable(target);
    int[] chunks = Container.open(Path.of(target.segmentationContainer()))
        .openDataset(target.segmentation()).chunkShape();
    return BlockGrid.of(shape, chunks, BlockGrid.wholeChunkShape(shape, chunks, BOX_VOXELS),
        new int[shape.length]);
  }

  /**
   * Checks that both datasets exist, hold labels and have the same shape, and that a mask is
   * uint8 of that shape; returns the shape (memory order).
   *
   * @throws SunderException INVALID_INPUT naming the dataset
   */
  public static long[] requireComparable(EvaluationTarget target) {
    Dataset segmentation = open(target.segmentationContainer(), target.segmentation(),
        "segmentation");
    Dataset truth = open(target.truthContainer(), target.truth(), "ground truth");
    if (!Arrays.equals(segmentation.shape(), truth.shape())) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "segmentation '" + target.segmentation()
          + "' has shape " + Arrays.toString(Shapes.reversed(segmentation.shape()))
          + " but ground truth '" + target.truth() + "' has shape " + Arrays.toString(Shapes.reversed(truth.shape()))
          + " (slowest axis first); they must be equal");
    }
    requireLabels(segmentation, "segmentation '" + target.segmentation() + "'");
    requireLabels(truth, "ground truth '" + target.truth() + "'");
    if (target.mask() != null) {
      Dataset mask = open(target.maskContainer(), target.mask(), "mask");
      if (mask.dataType() != DataType.UINT8) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "mask '" + target.mask() + "' in "
            + target.maskContainer() + " has data type " + mask.dataType().name()
            .toLowerCase(Locale.ROOT) + "; a mask must be uint8 (non-zero = score"
            + " this voxel)");
      }
      if (!Arrays.equals(segmentation.shape(), mask.shape())) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "mask '" + target.mask() + "' in "
            + target.maskContainer() + " has shape "
            + Arrays.toString(Shapes.reversed(mask.shape()))
            + " but segmentation '" + target.segmentation() + "' has shape "
            + Arrays.toString(Shapes.reversed(segmentation.shape()))
            + " (slowest axis first); they must be equal");
      }
    }
    return segmentation.shape();
  }

  /**
   * The shape of the segmentation (memory order).
   *
   * @throws SunderException INVALID_INPUT if it does not exist
   */
  public static long[] segmentationShape(EvaluationTarget target) {
    return open(target.segmentationContainer(), target.segmentation(), "segmentation").shape();
  }

  private static void requireLabels(Dataset dataset, String what) {
    if (dataset.dataType().isFloat()) {
      throw new SunderException(ErrorKind.INVALID_INPUT, what + " has data type "
          + dataset.dataType().name().toLowerCase(Locale.ROOT) + "; expected integer labels");
    }
  }

  private static Dataset open(String container, String dataset, String what) {
    Container c = Container.open(Path.of(container));
    if (!c.datasetExists(dataset)) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "no " + what + " dataset '" + dataset
          + "' in " + container);
    }
    return c.openDataset(dataset);
  }
}
