package org.sunder.spark.evaluate;

import java.nio.file.Path;
import java.util.Arrays;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;

/**
 * The contingency table of one box of a segmentation against the ground truth (inside the mask,
 * if any): the per-task step of evaluation, summed over boxes by the driver. O(voxels of the box).
 */
public final class BlockContingency {
  private BlockContingency() {}

  /** Counts the voxels of the box {@code [min, max]} (memory order, inclusive). */
  public static ContingencyTable.Pairs count(EvaluationTarget target, long[] min, long[] max) {
    FinalInterval box = new FinalInterval(min, max);
    Dataset segmentation = Container.open(Path.of(target.segmentationContainer()))
        .openDataset(target.segmentation());
    Dataset truth = Container.open(Path.of(target.truthContainer())).openDataset(target.truth());
    long[] s = LabelArrays.toLongs(segmentation.read(box), segmentation.dataType(),
        "segmentation '" + target.segmentation() + "'");
    long[] g = LabelArrays.toLongs(truth.read(box), truth.dataType(),
        "ground truth '" + target.truth() + "'");
    ContingencyTable table = new ContingencyTable();
    if (target.mask() == null) {
      table.add(g, s);
    } else {
      Dataset mask = Container.open(Path.of(target.maskContainer())).openDataset(target.mask());
      ArrayImg<?, ?> m = mask.read(box);
      table.add(g, s, LabelArrays.toBytes(m));
    }
    return table.sortedPairs();
  }

  /** Checks that both datasets exist, hold labels and have the same shape. */
  public static long[] requireComparable(EvaluationTarget target) {
    Dataset segmentation = open(target.segmentationContainer(), target.segmentation(), "segmentation");
    Dataset truth = open(target.truthContainer(), target.truth(), "ground truth");
    if (!Arrays.equals(segmentation.shape(), truth.shape())) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "segmentation '" + target.segmentation()
          + "' has shape " + Arrays.toString(reverse(segmentation.shape())) + " but ground truth '"
          + target.truth() + "' has shape " + Arrays.toString(reverse(truth.shape()))
          + " (slowest axis first); they must be equal");
    }
    if (target.mask() != null) {
      Dataset mask = open(target.maskContainer(), target.mask(), "mask");
      if (mask.dataType() != DataType.UINT8) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "mask '" + target.mask() + "' in "
            + target.maskContainer() + " has data type " + mask.dataType().name()
            .toLowerCase(java.util.Locale.ROOT) + "; a mask must be uint8 (non-zero = score"
            + " this voxel)");
      }
      if (!Arrays.equals(segmentation.shape(), mask.shape())) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "mask '" + target.mask() + "' in "
            + target.maskContainer() + " has shape " + Arrays.toString(reverse(mask.shape()))
            + " but segmentation '" + target.segmentation() + "' has shape "
            + Arrays.toString(reverse(segmentation.shape()))
            + " (slowest axis first); they must be equal");
      }
    }
    return segmentation.shape();
  }

  private static Dataset open(String container, String dataset, String what) {
    Container c = Container.open(Path.of(container));
    if (!c.datasetExists(dataset)) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "no " + what + " dataset '" + dataset
          + "' in " + container);
    }
    return c.openDataset(dataset);
  }

  private static long[] reverse(long[] shape) {
    long[] out = new long[shape.length];
    for (int i = 0; i < shape.length; i++) {
      out[i] = shape[shape.length - 1 - i];
    }
    return out;
  }
}
