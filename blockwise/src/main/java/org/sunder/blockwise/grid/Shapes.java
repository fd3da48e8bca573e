package org.sunder.blockwise.grid;

/** Arithmetic on array shapes (one extent per dimension). */
public final class Shapes {

  private Shapes() {}

  /** The extents in the opposite order (memory order to slowest axis first, and back). */
  public static long[] reversed(long[] shape) {
    long[] out = new long[shape.length];
    for (int i = 0; i < shape.length; i++) {
      out[i] = shape[shape.length - 1 - i];
    }
    return out;
  }

  /** The extents in the opposite order (memory order to slowest axis first, and back). */
  public static int[] reversed(int[] shape) {
    int[] out = new int[shape.length];
    for (int i = 0; i < shape.length; i++) {
      out[i] = shape[shape.length - 1 - i];
    }
    return out;
  }

  /** The values in the opposite order (a voxel size in memory order to slowest axis first). */
  public static double[] reversed(double[] values) {
    double[] out = new double[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[values.length - 1 - i];
    }
    return out;
  }

  /** The number of elements of an array of this shape; throws when it does not fit a long. */
  public static long elementCount(long[] shape) {
    long n = 1;
    for (long s : shape) {
      if (s < 0) {
        throw new IllegalArgumentException("negative extent " + s);
      }
      n = Math.multiplyExact(n, s);
    }
    return n;
  }

  /** The number of elements of an array of this shape; throws when it does not fit a long. */
  public static long elementCount(int[] shape) {
    long n = 1;
    for (int s : shape) {
      if (s < 0) {
        throw new IllegalArgumentException("negative extent " + s);
      }
      n = Math.multiplyExact(n, s);
    }
    return n;
  }

  /**
   * The number of elements of an array of this shape, for arrays indexed by {@code int};
   * throws when it exceeds {@link Integer#MAX_VALUE}.
   */
  public static int intElementCount(int[] shape) {
    return Math.toIntExact(elementCount(shape));
  }

  /**
   * For every voxel of the sub-box ({@code subShape} starting at {@code origin} inside a box of
   * {@code outerShape}), in the sub-box's order, its index in the outer box. Allocates
   * {@code intElementCount(subShape)} ints; O(that).
   */
  public static int[] subBoxIndices(int[] outerShape, int[] origin, int[] subShape) {
    int n = outerShape.length;
    int[] indices = new int[intElementCount(subShape)];
    int[] stride = new int[n];
    int step = 1;
    for (int d = 0; d < n; d++) {
      stride[d] = step;
      step *= outerShape[d];
    }
    int[] position = new int[n];
    int rows = indices.length / subShape[0];
    int next = 0;
    for (int r = 0; r < rows; r++) {
      int start = 0;
      for (int d = 0; d < n; d++) {
        start += (origin[d] + position[d]) * stride[d];
      }
      for (int x = 0; x < subShape[0]; x++) {
        indices[next++] = start + x;
      }
      for (int d = 1; d < n; d++) {
        if (++position[d] < subShape[d]) {
          break;
        }
        position[d] = 0;
      }
    }
    return indices;
  }
}
