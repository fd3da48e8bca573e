package org.sunder.spark.report;

import java.util.Arrays;
import java.util.List;
import java.util.stream.IntStream;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.api.java.function.Function;
import org.apache.spark.api.java.function.Function2;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.spark.progress.ProgressListener;

/**
 * The bounding boxes of a few labels of a label dataset, on Spark: one task per block core
 * reads the core and widens the box of each wanted label it meets; boxes are merged on the way
 * to the driver. O(voxels · log k) for k labels; each task returns {@code 6 k} numbers.
 */
final class ObjectBoxes {
  private ObjectBoxes() {}

  /**
   * Per wanted label (in the order given), {@code {minX, minY, minZ, maxX, maxY, maxZ}} in
   * memory order, or {@code null} for a label that does not occur.
   */
  static long[][] of(JavaSparkContext sc, String container, String dataset, BlockGrid grid,
      long[] labels) {
    if (labels.length == 0) {
      return new long[0][];
    }
    long[] sorted = labels.clone();
    Arrays.sort(sorted);
    List<Integer> blocks = IntStream.range(0, grid.blockCount()).boxed().toList();
    sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, "report");
    long[] merged;
    try {
      merged = sc.parallelize(blocks, Math.min(blocks.size(), 20_000))
          .map(new BoxesOfBlock(container, dataset, grid, sorted))
          .reduce(new MergeBoxes());
    } finally {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
    }
    long[][] boxes = new long[labels.length][];
    for (int i = 0; i < labels.length; i++) {
      int k = Arrays.binarySearch(sorted, labels[i]);
      if (merged[6 * k] != Long.MAX_VALUE) {
        boxes[i] = Arrays.copyOfRange(merged, 6 * k, 6 * k + 6);
      }
    }
    return boxes;
  }

  /** Empty boxes for {@code k} labels: minima at the largest value, maxima at the smallest. */
  static long[] empty(int k) {
    long[] boxes = new long[6 * k];
    for (int i = 0; i < k; i++) {
      Arrays.fill(boxes, 6 * i, 6 * i + 3, Long.MAX_VALUE);
      Arrays.fill(boxes, 6 * i + 3, 6 * i + 6, Long.MIN_VALUE);
    }
    return boxes;
  }

  /** Widens {@code boxes} by every voxel of {@code labels} (a box of the given min and shape). */
  static void widen(long[] boxes, long[] sortedWanted, long[] labels, long[] min, int[] shape) {
    int i = 0;
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++, i++) {
          long label = labels[i];
          if (label == 0) {
            continue;
          }
          int k = Arrays.binarySearch(sortedWanted, label);
          if (k < 0) {
            continue;
          }
          int o = 6 * k;
          boxes[o] = Math.min(boxes[o], min[0] + x);
          boxes[o + 1] = Math.min(boxes[o + 1], min[1] + y);
          boxes[o + 2] = Math.min(boxes[o + 2], min[2] + z);
          boxes[o + 3] = Math.max(boxes[o + 3], min[0] + x);
          boxes[o + 4] = Math.max(boxes[o + 4], min[1] + y);
          boxes[o + 5] = Math.max(boxes[o + 5], min[2] + z);
        }
      }
    }
  }

  private static final class BoxesOfBlock implements Function<Integer, long[]> {
    private static final long serialVersionUID = 1L;
    private final String container;
    private final String dataset;
    private final BlockGrid grid;
    private final long[] wanted;

    BoxesOfBlock(String container, String dataset, BlockGrid grid, long[] wanted) {
      this.container = container;
      this.dataset = dataset;
      this.grid = grid;
      this.wanted = wanted;
    }

    @Override
    public long[] call(Integer index) {
      Block block = grid.block(index);
      long[] min = block.coreMin();
      long[] max = block.coreMax();
      Plane.requireThreeDimensions(min);
      long[] labels = Plane.labelsOfBox(container, dataset, min, max);
      int[] shape = new int[3];
      for (int d = 0; d < 3; d++) {
        shape[d] = (int) (max[d] - min[d] + 1);
      }
      long[] boxes = empty(wanted.length);
      widen(boxes, wanted, labels, min, shape);
      return boxes;
    }
  }

  private static final class MergeBoxes implements Function2<long[], long[], long[]> {
    private static final long serialVersionUID = 1L;

    @Override
    public long[] call(long[] a, long[] b) {
      long[] c = a.clone();
      for (int o = 0; o < c.length; o += 6) {
        for (int d = 0; d < 3; d++) {
          c[o + d] = Math.min(a[o + d], b[o + d]);
          c[o + 3 + d] = Math.max(a[o + 3 + d], b[o + 3 + d]);
        }
      }
      return c;
    }
  }
}
