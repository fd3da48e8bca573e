package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * Stable least-significant-digit radix sorts of 64-bit keys compared as <em>unsigned</em>
 * numbers, carrying {@code int} values, without boxing. One pass per byte position that varies
 * among the keys ({@code O(n)} each, reading and writing memory in order); a byte equal in every
 * key costs no pass. Signed longs sort by {@link #signedKey}.
 */
public final class RadixSort {
  private static final int RADIX = 256;
  private static final int BYTES = 8;

  private RadixSort() {}

  /** Per index, a 64-bit sort key compared as an unsigned number. */
  @FunctionalInterface
  public interface KeyColumn {
    long key(int index);
  }

  /** The unsigned key whose order is the signed order of {@code value}. */
  public static long signedKey(long value) {
    return value ^ Long.MIN_VALUE;
  }

  /**
   * Sorts {@code keys} ascending as unsigned longs and permutes {@code values} alike; stable, so
   * equal keys keep their order. Two scratch arrays of {@code n} keys and values.
   *
   * @throws IllegalArgumentException when the arrays' lengths differ
   */
  public static void sortByKeyUnsigned(long[] keys, int[] values) {
    int n = keys.length;
    if (values.length != n) {
      throw new IllegalArgumentException("radix sort: " + n + " keys but " + values.length
          + " values");
    }
    int[] counts = new int[BYTES * RADIX];
    for (long k : keys) {
      count(counts, k);
    }
    Pairs sorted = sortPasses(new Pairs(keys, values), new Pairs(new long[n], new int[n]),
        counts);
    if (sorted.keys != keys) {
      System.arraycopy(sorted.keys, 0, keys, 0, n);
      System.arraycopy(sorted.values, 0, values, 0, n);
    }
  }

  /**
   * The indices {@code 0..n-1} in ascending order of their keys in {@code columns}, the first
   * column most significant, ties in ascending index order (the order a stable sort by a
   * comparator of the columns gives). Sorts by the last column first, each column a gather of its
   * keys in the current order ({@code n} reads by index) and a pass per varying byte:
   * {@code O(n (c + b))} for {@code c} columns and {@code b} varying bytes in all; 24 bytes of
   * memory per index, the result included.
   *
   * @throws IllegalArgumentException when {@code n} is negative
   */
  public static int[] order(int n, KeyColumn... columns) {
    if (n < 0) {
      throw new IllegalArgumentException("radix sort: " + n + " indices; expected at least 0");
    }
    int[] identity = new int[n];
    for (int i = 0; i < n; i++) {
      identity[i] = i;
    }
    Pairs current = new Pairs(new long[n], identity);
    Pairs scratch = new Pairs(new long[n], new int[n]);
    int[] counts = new int[BYTES * RADIX];
    for (int c = columns.length - 1; c >= 0; c--) {
      KeyColumn column = columns[c];
      Arrays.fill(counts, 0);
      long[] keys = current.keys;
      int[] values = current.values;
      for (int i = 0; i < n; i++) {
        long k = column.key(values[i]);
        keys[i] = k;
        count(counts, k);
      }
      Pairs sorted = sortPasses(current, scratch, counts);
      scratch = sorted == current ? scratch : current;
      current = sorted;
    }
    return current.values;
  }

  /** Adds the bytes of {@code key} to the per-position histograms. */
  private static void count(int[] counts, long key) {
    for (int b = 0; b < BYTES; b++) {
      counts[b * RADIX + ((int) (key >>> (8 * b)) & 0xFF)]++;
    }
  }

  /**
   * One stable counting pass per varying byte position, low to high, alternating between
   * {@code data} and {@code scratch}; returns the one holding the result. {@code counts} holds
   * the keys' per-position histograms and is overwritten.
   */
  private static Pairs sortPasses(Pairs data, Pairs scratch, int[] counts) {
    int n = data.keys.length;
    Pairs from = data;
    Pairs to = scratch;
    for (int b = 0; b < BYTES && n > 0; b++) {
      int base = b * RADIX;
      int shift = 8 * b;
      if (counts[base + ((int) (from.keys[0] >>> shift) & 0xFF)] == n) {
        continue;
      }
      int sum = 0;
      for (int d = 0; d < RADIX; d++) {
        int c = counts[base + d];
        counts[base + d] = sum;
        sum += c;
      }
      long[] fk = from.keys;
      int[] fv = from.values;
      long[] tk = to.keys;
      int[] tv = to.values;
      for (int i = 0; i < n; i++) {
        long k = fk[i];
        int at = counts[base + ((int) (k >>> shift) & 0xFF)]++;
        tk[at] = k;
        tv[at] = fv[i];
      }
      Pairs t = from;
      from = to;
      to = t;
    }
    return from;
  }

  /** Keys and the values they carry, the same length. */
  private record Pairs(long[] keys, int[] values) {}
}
