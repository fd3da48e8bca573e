package org.sunder.blockwise.grid;

/** Arithmetic on array shapes (one extent per dimension). */
public final class Shapes {

  private Shapes() {}

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
