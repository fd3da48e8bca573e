package org.sunder.blockwise.metrics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import net.imglib2.Interval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.util.Intervals;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.store.Dataset;

/**
 * Scores a segmentation dataset against a ground-truth dataset of the same shape, reading both
 * block by block so that only one block (per thread) is in memory: about
 * {@code 17 * block voxels} bytes plus the contingency table. Blocks are whole chunks of the
 * ground truth ({@link BlockGrid}, no halo); {@link #table(Block)} gives one block's table, for
 * callers (Spark) that distribute the blocks and {@link ContingencyTable#merge} the results.
 *
 * <p>Inputs are checked up front: both label datasets (and a mask) must have integer types and
 * equal shapes, the box list must be non-empty and every box inside the volume; a mask with no
 * non-zero voxel is reported once the blocks have been read. All as {@link SunderException}
 * with {@link ErrorKind#INVALID_INPUT} naming the dataset and what was expected. Thread-safe.
 */
public final class Evaluator {
  private final Dataset groundTruth;
  private final Dataset segmentation;
  private final EvaluationRegion region;
  private final BlockGrid grid;

  /**
   * @param blockShape block core shape, memory order, a multiple of the ground truth's chunk
   *     shape; {@code null} for one chunk per block
   */
  public Evaluator(Dataset groundTruth, Dataset segmentation, EvaluationRegion region,
      int[] blockShape) {
    this.groundTruth = Objects.requireNonNull(groundTruth, "groundTruth");
    this.segmentation = Objects.requireNonNull(segmentation, "segmentation");
    this.region = Objects.requireNonNull(region, "region");
    requireLabels(groundTruth, "ground truth");
    requireLabels(segmentation, "segmentation");
    requireSameShape(segmentation, "segmentation");
    if (region instanceof EvaluationRegion.Masked m) {
      requireLabels(m.mask(), "mask");
      requireSameShape(m.mask(), "mask");
    } else if (region instanceof EvaluationRegion.Boxes b) {
      requireBoxes(b.boxes());
    }
    int[] chunk = groundTruth.chunkShape();
    this.grid = BlockGrid.of(groundTruth.shape(), chunk, blockShape == null ? chunk : blockShape,
        new int[chunk.length]);
  }

  /** The blocks the volume is read in. */
  public BlockGrid grid() {
    return grid;
  }

  /** The contingency table of one block's core, inside the region. */
  public ContingencyTable table(Block block) {
    return table(block.core());
  }

  /**
   * The contingency table of any box inside the volume (for instance a block core of another
   * grid), inside the region. O(voxels of the box).
   */
  public ContingencyTable table(Interval core) {
    ContingencyTable table = new ContingencyTable();
    if (region instanceof EvaluationRegion.Boxes b && !touches(b.boxes(), core)) {
      return table;
    }
    long[] gt = LabelArrays.labels(groundTruth.read(core), groundTruth.dataType());
    long[] seg = LabelArrays.labels(segmentation.read(core), segmentation.dataType());
    if (region instanceof EvaluationRegion.Whole) {
      table.add(gt, seg);
    } else if (region instanceof EvaluationRegion.Masked m) {
      ArrayImg<?, ?> mask = m.mask().read(core);
      table.add(gt, seg, LabelArrays.mask(mask));
    } else if (region instanceof EvaluationRegion.Boxes b) {
      table.add(gt, seg, boxMask(b.boxes(), core));
    }
    return table;
  }

  /**
   * The table of the whole region, blocks read by {@code threads} threads.
   *
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} if the region selects no voxel
   */
  public ContingencyTable table(int threads) {
    if (threads < 1) {
      throw new IllegalArgumentException("threads must be >= 1, got " + threads);
    }
    ContingencyTable total = new ContingencyTable();
    if (threads == 1) {
      for (int i = 0; i < grid.blockCount(); i++) {
        total.merge(table(grid.block(i)));
      }
    } else {
      mergeInParallel(total, threads);
    }
    if (total.voxelCount() == 0) {
      throw new SunderException(ErrorKind.INVALID_INPUT, emptyRegionMessage());
    }
    return total;
  }

  /** Scores the whole region. */
  public SegmentationScores evaluate(ScoreOptions options, int threads) {
    return new Scorer(options).score(table(threads));
  }

  private void mergeInParallel(ContingencyTable total, int threads) {
    ExecutorService pool = Executors.newFixedThreadPool(threads);
    try {
      List<Future<ContingencyTable>> parts = new ArrayList<>();
      int perTask = Math.max(1, grid.blockCount() / (threads * 4));
      for (int start = 0; start < grid.blockCount(); start += perTask) {
        int from = start;
        int to = Math.min(grid.blockCount(), start + perTask);
        parts.add(pool.submit(() -> {
          ContingencyTable part = new ContingencyTable();
          for (int i = from; i < to; i++) {
            part.merge(table(grid.block(i)));
          }
          return part;
        }));
      }
      for (Future<ContingencyTable> part : parts) {
        total.merge(part.get());
      }
    } catch (InterruptedException e) {
      Thread.currentThread().interrupt();
      throw new SunderException(ErrorKind.INTERNAL, "evaluation interrupted", e);
    } catch (ExecutionException e) {
      if (e.getCause() instanceof SunderException s) {
        throw s;
      }
      throw new SunderException(ErrorKind.INTERNAL, "evaluation failed: " + e.getCause(),
          e.getCause());
    } finally {
      pool.shutdownNow();
    }
  }

  private String emptyRegionMessage() {
    if (region instanceof EvaluationRegion.Masked m) {
      return "mask " + m.mask() + " selects no voxel (all zero); expected at least one"
          + " non-zero voxel to evaluate " + segmentation + " against " + groundTruth;
    }
    if (region instanceof EvaluationRegion.Boxes) {
      return "the evaluation boxes select no voxel; expected at least one box";
    }
    return groundTruth + " is empty (shape " + Arrays.toString(groundTruth.shape()) + ")";
  }

  private static boolean touches(List<Interval> boxes, Interval core) {
    for (Interval box : boxes) {
      if (overlap(box, core)) {
        return true;
      }
    }
    return false;
  }

  private static boolean overlap(Interval a, Interval b) {
    for (int d = 0; d < a.numDimensions(); d++) {
      if (a.max(d) < b.min(d) || b.max(d) < a.min(d)) {
        return false;
      }
    }
    return true;
  }

  /** 1 inside any box, for a 3-or-fewer-dimensional core (memory order). */
  private static byte[] boxMask(List<Interval> boxes, Interval core) {
    int n = core.numDimensions();
    long[] dims = core.dimensionsAsLongArray();
    byte[] mask = new byte[(int) Intervals.numElements(core)];
    for (Interval box : boxes) {
      if (!overlap(box, core)) {
        continue;
      }
      long[] lo = new long[n];
      long[] hi = new long[n];
      for (int d = 0; d < n; d++) {
        lo[d] = Math.max(box.min(d), core.min(d)) - core.min(d);
        hi[d] = Math.min(box.max(d), core.max(d)) - core.min(d);
      }
      fill(mask, dims, lo, hi);
    }
    return mask;
  }

  private static void fill(byte[] mask, long[] dims, long[] lo, long[] hi) {
    int n = dims.length;
    long[] pos = lo.clone();
    while (true) {
      long index = 0;
      for (int d = n - 1; d >= 1; d--) {
        index = (index + pos[d]) * dims[d - 1];
      }
      int row = (int) index;
      for (long x = lo[0]; x <= hi[0]; x++) {
        mask[row + (int) x] = 1;
      }
      int d = 1;
      while (d < n && pos[d] == hi[d]) {
        pos[d] = lo[d];
        d++;
      }
      if (d >= n) {
        return;
      }
      pos[d]++;
    }
  }

  private static void requireLabels(Dataset dataset, String role) {
    if (dataset.dataType().isFloat()) {
      throw new SunderException(ErrorKind.INVALID_INPUT, role + " " + dataset + " has data type "
          + dataset.dataType().n5Name() + "; expected an integer label type (uint8 ... uint64,"
          + " int8 ... int64)");
    }
  }

  private void requireSameShape(Dataset dataset, String role) {
    if (!Arrays.equals(dataset.shape(), groundTruth.shape())) {
      throw new SunderException(ErrorKind.INVALID_INPUT, role + " " + dataset + " has shape "
          + zyx(dataset.shape()) + "; expected the ground truth's shape "
          + zyx(groundTruth.shape()) + " (" + groundTruth + ")");
    }
  }

  private void requireBoxes(List<Interval> boxes) {
    if (boxes.isEmpty()) {
      throw new SunderException(ErrorKind.INVALID_INPUT,
          "evaluation boxes: the list is empty; expected at least one box");
    }
    long[] shape = groundTruth.shape();
    for (int k = 0; k < boxes.size(); k++) {
      Interval box = boxes.get(k);
      boolean inside = box.numDimensions() == shape.length;
      for (int d = 0; inside && d < shape.length; d++) {
        inside = box.min(d) >= 0 && box.max(d) < shape[d] && box.max(d) >= box.min(d);
      }
      if (!inside) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "evaluation box " + k + " (min "
            + zyx(box.minAsLongArray()) + ", max " + zyx(box.maxAsLongArray())
            + ") is not a non-empty box inside the volume " + zyx(shape) + " of " + groundTruth);
      }
    }
  }

  /** A memory-order array written slowest axis first, labelled so users are not misled. */
  private static String zyx(long[] memoryOrder) {
    long[] reversed = new long[memoryOrder.length];
    for (int d = 0; d < reversed.length; d++) {
      reversed[d] = memoryOrder[memoryOrder.length - 1 - d];
    }
    return Arrays.toString(reversed) + (reversed.length == 3 ? " (zyx)" : " (slowest axis first)");
  }
}
