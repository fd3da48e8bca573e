package org.sunder.blockwise.partition;

/**
 * Radix sorts of 64-bit keys compared as <em>unsigned</em> numbers, without boxing: an in-place
 * most-significant-digit sort of a {@code long[]} (American flag sort, {@code O(n * w / 8)} for
 * {@code w} varying bits, no extra array) and a stable least-significant-digit sort of keys that
 * carry {@code int} values ({@code O(n)} per varying byte, two temporary arrays).
 */
final class RadixSort {
  private static final int SMALL = 48;

  private RadixSort() {}

  /** Sorts {@code a[from, to)} ascending as unsigned longs, in place. */
  static void sortUnsigned(long[] a, int from, int to) {
    if (to - from < 2) {
      return;
    }
    long or = 0;
    long and = -1;
    for (int i = from; i < to; i++) {
      or |= a[i];
      and &= a[i];
    }
    long varying = or ^ and;
    if (varying == 0) {
      return;
    }
    int top = 63 - Long.numberOfLeadingZeros(varying);
    int depth = (top + 8) / 8;
    new Flag(depth).sort(a, from, to, top - 7, 0);
  }

  /** In-place MSD passes with one set of bucket arrays per recursion depth. */
  private static final class Flag {
    private final int[][] start;
    private final int[][] next;

    Flag(int depth) {
      start = new int[depth + 1][257];
      next = new int[depth + 1][256];
    }

    void sort(long[] a, int lo, int hi, int shift, int depth) {
      if (hi - lo <= SMALL) {
        insertion(a, lo, hi);
        return;
      }
      int[] s = start[depth];
      int[] nx = next[depth];
      java.util.Arrays.fill(s, 0);
      for (int i = lo; i < hi; i++) {
        s[digit(a[i], shift) + 1]++;
      }
      boolean single = false;
      for (int b = 0; b < 256; b++) {
        if (s[b + 1] == hi - lo) {
          single = true;
        }
      }
      s[0] = lo;
      for (int b = 0; b < 256; b++) {
        s[b + 1] += s[b];
      }
      if (!single) {
        permute(a, s, nx, shift);
      }
      if (shift <= 0) {
        return;
      }
      for (int b = 0; b < 256; b++) {
        if (s[b + 1] - s[b] > 1) {
          sort(a, s[b], s[b + 1], shift - 8, depth + 1);
        }
      }
    }

    private static void permute(long[] a, int[] s, int[] nx, int shift) {
      System.arraycopy(s, 0, nx, 0, 256);
      for (int b = 0; b < 256; b++) {
        int end = s[b + 1];
        while (nx[b] < end) {
          long v = a[nx[b]];
          int d = digit(v, shift);
          while (d != b) {
            long t = a[nx[d]];
            a[nx[d]++] = v;
            v = t;
            d = digit(v, shift);
          }
          a[nx[b]++] = v;
        }
      }
    }
  }

  private static int digit(long v, int shift) {
    return (int) (shift >= 0 ? v >>> shift : v << -shift) & 0xFF;
  }

  private static void insertion(long[] a, int lo, int hi) {
    for (int i = lo + 1; i < hi; i++) {
      long v = a[i];
      long flipped = v ^ Long.MIN_VALUE;
      int j = i - 1;
      while (j >= lo && (a[j] ^ Long.MIN_VALUE) > flipped) {
        a[j + 1] = a[j];
        j--;
      }
      a[j + 1] = v;
    }
  }

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
