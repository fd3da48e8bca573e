package org.sunder.stitching.task;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.array.ArrayImgs;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Dataset;

/**
 * The coarser levels of a label volume for viewers: level {@code L} is level {@code L - 1}
 * reduced by a factor of 1 or 2 per axis, each voxel taking the most frequent label (the mode)
 * of the voxels it covers, ties going to the smallest label (as unsigned 64-bit values;
 * background 0 counts like any label). Factors keep voxels near isotropic: an axis whose voxel
 * is already at least twice the finest axis's keeps factor 1 until the others catch up.
 * Levels are added while the volume spans more than one chunk along some axis, at most
 * {@value #MAX_LEVELS} below level 0. Every level keeps level 0's chunk shape, and one task
 * writes one chunk, so tasks of a level are independent and idempotent.
 *
 * @param shapes per level (0 = the segmentation), the shape in memory order
 * @param factors per level {@code L >= 1}, the reduction from level {@code L - 1}
 *     ({@code factors[0]} is all ones)
 * @param voxelSizes per level, the voxel size in memory order (level 0: the input's, or 1)
 * @param chunkShape the chunk shape of every level
 */
public record LabelPyramid(long[][] shapes, int[][] factors, double[][] voxelSizes,
    int[] chunkShape) implements Serializable {
  /** The most levels below level 0. */
  public static final int MAX_LEVELS = 10;

  /**
   * Plans the levels of a volume.
   *
   * @param voxelSize level 0's voxel size, memory order, every entry {@code > 0}
   */
  public static LabelPyramid plan(long[] shape, int[] chunkShape, double[] voxelSize) {
    int n = shape.length;
    if (chunkShape.length != n || voxelSize.length != n) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "pyramid: shape "
          + Arrays.toString(shape) + ", chunks " + Arrays.toString(chunkShape) + " and voxel size "
          + Arrays.toString(voxelSize) + " differ in dimensions");
    }
    for (double v : voxelSize) {
      if (!(v > 0) || Double.isInfinite(v)) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "pyramid: voxel size "
            + Arrays.toString(voxelSize) + " has a value that is not a positive number");
      }
    }
    List<long[]> shapes = new ArrayList<>(List.of(shape.clone()));
    List<int[]> factors = new ArrayList<>(List.<int[]>of(ones(n)));
    List<double[]> sizes = new ArrayList<>(List.of(voxelSize.clone()));
    while (shapes.size() <= MAX_LEVELS && spansSeveralChunks(shapes.get(shapes.size() - 1),
        chunkShape)) {
      double[] size = sizes.get(sizes.size() - 1);
      long[] last = shapes.get(shapes.size() - 1);
      double finest = Arrays.stream(size).min().orElseThrow();
      int[] f = new int[n];
      long[] next = new long[n];
      double[] nextSize = new double[n];
      for (int d = 0; d < n; d++) {
        f[d] = size[d] >= 2 * finest || last[d] == 1 ? 1 : 2;
        next[d] = (last[d] + f[d] - 1) / f[d];
        nextSize[d] = size[d] * f[d];
      }
      shapes.add(next);
      factors.add(f);
      sizes.add(nextSize);
    }
    return new LabelPyramid(shapes.toArray(long[][]::new), factors.toArray(int[][]::new),
        sizes.toArray(double[][]::new), chunkShape.clone());
  }

  private static int[] ones(int n) {
    int[] f = new int[n];
    Arrays.fill(f, 1);
    return f;
  }

  private static boolean spansSeveralChunks(long[] shape, int[] chunkShape) {
    for (int d = 0; d < shape.length; d++) {
      if (shape[d] > chunkShape[d]) {
        return true;
      }
    }
    return false;
  }

  /** Levels including level 0. */
  public int levelCount() {
    return shapes.length;
  }

  /** The chunk count of level {@code level}. */
  public long chunkCount(int level) {
    long count = 1;
    for (int d = 0; d < chunkShape.length; d++) {
      count *= (shapes[level][d] + chunkShape[d] - 1) / chunkShape[d];
    }
    return count;
  }

  /** The grid position (memory order) of chunk {@code index} of {@code level}, dimension 0 fastest. */
  public long[] chunkPosition(int level, long index) {
    long[] p = new long[chunkShape.length];
    long rest = index;
    for (int d = 0; d < p.length; d++) {
      long cells = (shapes[level][d] + chunkShape[d] - 1) / chunkShape[d];
      p[d] = rest % cells;
      rest /= cells;
    }
    return p;
  }

  /**
   * Writes chunk {@code chunk} of {@code level} (at least 1) into {@code target} from
   * {@code source}, level {@code level - 1}. Reads at most {@code 2^n} times the chunk's voxels;
   * O(chunk voxels · 2^n). Returns the voxels written.
   */
  public long writeChunk(Dataset source, Dataset target, int level, long[] chunk) {
    int n = chunkShape.length;
    int[] f = factors[level];
    long[] min = new long[n];
    long[] max = new long[n];
    long[] srcMin = new long[n];
    long[] srcMax = new long[n];
    int[] outShape = new int[n];
    int[] inShape = new int[n];
    for (int d = 0; d < n; d++) {
      min[d] = chunk[d] * chunkShape[d];
      max[d] = Math.min(shapes[level][d], min[d] + chunkShape[d]) - 1;
      outShape[d] = (int) (max[d] - min[d] + 1);
      srcMin[d] = min[d] * f[d];
      srcMax[d] = Math.min(shapes[level - 1][d] - 1, max[d] * f[d] + f[d] - 1);
      inShape[d] = (int) (srcMax[d] - srcMin[d] + 1);
    }
    ArrayImg<?, ?> in = source.read(new FinalInterval(srcMin, srcMax));
    long[] labels = ((LongArray) in.update(null)).getCurrentStorageArray();
    long[] out = downsample(labels, inShape, f, outShape);
    target.write(ArrayImgs.unsignedLongs(out, Arrays.stream(outShape).asLongStream().toArray()),
        min);
    return out.length;
  }

  /**
   * The mode downsampling of {@code labels} (shape {@code inShape}, dimension 0 fastest) by
   * {@code factors} into {@code outShape}; output voxel {@code o} covers input voxels
   * {@code o * f .. o * f + f - 1}, clipped to the input. Allocates the result only.
   */
  public static long[] downsample(long[] labels, int[] inShape, int[] factors, int[] outShape) {
    int n = inShape.length;
    int outCount = 1;
    int window = 1;
    for (int d = 0; d < n; d++) {
      outCount *= outShape[d];
      window *= factors[d];
    }
    long[] out = new long[outCount];
    long[] values = new long[window];
    int[] o = new int[n];
    int[] w = new int[n];
    int[] inStride = new int[n];
    inStride[0] = 1;
    for (int d = 1; d < n; d++) {
      inStride[d] = inStride[d - 1] * inShape[d - 1];
    }
    for (int i = 0; i < outCount; i++) {
      int count = 0;
      Arrays.fill(w, 0);
      for (int k = 0; k < window; k++) {
        int at = 0;
        boolean inside = true;
        for (int d = 0; d < n; d++) {
          int x = o[d] * factors[d] + w[d];
          if (x >= inShape[d]) {
            inside = false;
          }
          at += x * inStride[d];
        }
        if (inside) {
          values[count++] = labels[at];
        }
        for (int d = 0; d < n && ++w[d] == factors[d]; d++) {
          w[d] = 0;
        }
      }
      out[i] = mode(values, count);
      for (int d = 0; d < n && ++o[d] == outShape[d]; d++) {
        o[d] = 0;
      }
    }
    return out;
  }

  /**
   * The most frequent of {@code values[0..count)}, ties to the smallest as unsigned values.
   * O(count²) for the small windows of a pyramid (at most {@code 2^n} values); no allocation.
   */
  static long mode(long[] values, int count) {
    long best = values[0];
    int bestCount = 0;
    for (int a = 0; a < count; a++) {
      int c = 0;
      for (int b = 0; b < count; b++) {
        if (values[b] == values[a]) {
          c++;
        }
      }
      if (c > bestCount || (c == bestCount && Long.compareUnsigned(values[a], best) < 0)) {
        best = values[a];
        bestCount = c;
      }
    }
    return best;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof LabelPyramid p && Arrays.deepEquals(shapes, p.shapes)
        && Arrays.deepEquals(factors, p.factors) && Arrays.deepEquals(voxelSizes, p.voxelSizes)
        && Arrays.equals(chunkShape, p.chunkShape);
  }

  @Override
  public int hashCode() {
    return Arrays.deepHashCode(shapes) * 31 + Arrays.hashCode(chunkShape);
  }

  @Override
  public String toString() {
    return "LabelPyramid" + Arrays.deepToString(shapes);
  }
}
