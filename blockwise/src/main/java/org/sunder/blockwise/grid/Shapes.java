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
}
