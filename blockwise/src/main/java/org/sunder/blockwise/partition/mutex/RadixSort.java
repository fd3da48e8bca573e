package org.sunder.blockwise.partition.mutex;

/**
 * A stable least-significant-digit radix sort of 64-bit keys compared as <em>unsigned</em>
 * numbers, carrying {@code int} values, without boxing: {@code O(n)} per varying byte, two
 * temporary arrays.
 */
final class RadixSort {
  private RadixSort() {}

  /**
   * Sorts {@code keys} ascending as unsigned longs and permutes {@code values} alike; stable, so
   * equal keys keep their order.
   */
  static void sortByKeyUnsigned(long[] keys, int[] values) {
    int n = keys.length;
    long[] k2 = new long[n];
    int[] v2 = new int[n];
    int[] count = new int[257];
    for (int shift = 0; shift < 64; shift += 8) {
      java.util.Arrays.fill(count, 0);
      for (long k : keys) {
        count[(int) (k >>> shift) & 0xFF]++;
      }
      if (n == 0 || count[(int) (keys[0] >>> shift) & 0xFF] == n) {
        continue;
      }
      int sum = 0;
      for (int b = 0; b < 256; b++) {
        int c = count[b];
        count[b] = sum;
        sum += c;
      }
      for (int i = 0; i < n; i++) {
        int at = count[(int) (keys[i] >>> shift) & 0xFF]++;
        k2[at] = keys[i];
        v2[at] = values[i];
      }
      System.arraycopy(k2, 0, keys, 0, n);
      System.arraycopy(v2, 0, values, 0, n);
    }
  }
}
