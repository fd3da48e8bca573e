package org.sunder.blockwise.store;

import java.util.Random;

/** Seeded random primitive arrays of every element type, for round-trip tests. */
final class RandomArrays {
  private RandomArrays() {}

  static Object random(DataType type, int n, Random random) {
    Object array = ElementArrays.allocate(type, n);
    if (array instanceof byte[] a) {
      random.nextBytes(a);
    } else if (array instanceof short[] a) {
      for (int i = 0; i < n; i++) {
        a[i] = (short) random.nextInt();
      }
    } else if (array instanceof int[] a) {
      for (int i = 0; i < n; i++) {
        a[i] = random.nextInt();
      }
    } else if (array instanceof long[] a) {
      for (int i = 0; i < n; i++) {
        a[i] = random.nextLong();
      }
    } else if (array instanceof float[] a) {
      for (int i = 0; i < n; i++) {
        a[i] = (float) random.nextGaussian();
      }
    } else {
      double[] a = (double[]) array;
      for (int i = 0; i < n; i++) {
        a[i] = random.nextGaussian();
      }
    }
    return array;
  }
}
