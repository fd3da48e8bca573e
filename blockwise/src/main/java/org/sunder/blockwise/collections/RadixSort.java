package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * Stable radix sorts of 64-bit keys compared as <em>unsigned</em> numbers, carrying {@code int}
 * values, without boxing: least significant byte first, one pass per byte position that varies
 * among the keys ({@code O(n)} each, reading and writing memory in order); a byte equal in every
 * key costs no pass, and small groups go by insertion. Signed longs sort by {@link #signedKey}.
 */
public final class RadixSort {
  private static final int RADIX = 256;
  private static final int BYTES = 8;
  /** Groups up to this size are sorted by insertion. */
  private static final int SMALL = 32;

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
   * The unsigned key whose order is {@link Double#compare}'s order of {@code value} (-0.0 below
   * 0.0, NaN above everything): the bits, negative values' magnitude bits inverted, as signed.
   */
  public static long doubleKey(double value) {
    long bits = Double.doubleToLongBits(value);
    return signedKey(bits ^ ((bits >> 63) & Long.MAX_VALUE));
  }

  /**
   * Sorts {@code keys} ascending as unsigned longs and permutes {@code values} alike; stable, so
   * equal keys keep their order. Two scratch arrays of {@code n} keys and values.
   *
   * @throws IllegalArgumentException when the arrays' lengths differ
   */
  public static void sortByKeyUnsigned(long[] keys, int[] values) {
    if (values.length != keys.length) {
      throw new IllegalArgumentException("radix sort: " + keys.length + " keys but "
          + values.length + " values");
    }
    sortByKeyUnsigned(keys, values, keys.length);
  }

  /**
   * {@link #sortByKeyUnsigned(long[], int[])} of the first {@code size} keys and values; the
   * rest of the arrays is left as it is. Two scratch arrays of {@code size} keys and values.
   *
   * @throws IllegalArgumentException when {@code size} is negative or exceeds either array
   */
  public static void sortByKeyUnsigned(long[] keys, int[] values, int size) {
    if (size < 0 || size > keys.length || size > values.length) {
      throw new IllegalArgumentException("radix sort: size " + size + " outside 0.."
          + Math.min(keys.length, values.length));
    }
    new Scratch(size).sortRange(keys, values, 0, size);
  }

  /**
   * The indices {@code 0..n-1} in ascending order of their keys in {@code columns}, the first
   * column most significant, ties in ascending index order (the order a stable sort by a
   * comparator of the columns gives). Sorts by the first column (its keys read in index order),
   * then each group of indices equal in it by the next column, and so on: a column's keys are
   * read (by index, so at random) only for indices that tie on every column before it. A group
   * of at most {@value #SMALL} indices is sorted by insertion, a larger one by a pass per byte
   * that varies in the group. {@code O(n (c + b))} at worst for {@code c} columns and {@code b}
   * varying bytes in all; 24 bytes of memory per index, the result included. Indices already in
   * order (a list built in the order it is sorted by) are found so in one pass and not sorted.
   *
   * @throws IllegalArgumentException when {@code n} is negative
   */
  public static int[] order(int n, KeyColumn... columns) {
    if (n < 0) {
      throw new IllegalArgumentException("radix sort: " + n + " indices; expected at least 0");
    }
    int[] order = new int[n];
    for (int i = 0; i < n; i++) {
      order[i] = i;
    }
    if (columns.length > 0 && !inOrder(n, columns)) {
      new Scratch(n).sortGroup(new long[n], order, 0, n, columns, 0);
    }
    return order;
  }

  /**
   * Whether no index's keys come after the next index's. Stops at the first pair out of order,
   * so an unordered list usually costs a few reads; O(n c) for a list in order.
   */
  private static boolean inOrder(int n, KeyColumn[] columns) {
    next:
    for (int i = 1; i < n; i++) {
      for (KeyColumn column : columns) {
        int c = Long.compareUnsigned(column.key(i - 1), column.key(i));
        if (c < 0) {
          continue next;
        }
        if (c > 0) {
          return false;
        }
      }
    }
    return true;
  }

  /** The scratch arrays and byte histograms of one sort; one group is sorted at a time. */
  private static final class Scratch {
    private final long[] keys;
    private final int[] values;
    private final int[] counts = new int[BYTES * RADIX];

    Scratch(int n) {
      keys = new long[n];
      values = new int[n];
    }

    /**
     * Sorts {@code order[from, to)}, whose indices tie on the columns before {@code c} and are
     * ascending, by columns {@code c} onwards; {@code keys[from, to)} is free to use.
     */
    void sortGroup(long[] keys, int[] order, int from, int to, KeyColumn[] columns, int c) {
      KeyColumn column = columns[c];
      for (int i = from; i < to; i++) {
        keys[i] = column.key(order[i]);
      }
      if (to - from <= SMALL) {
        insertionSort(keys, order, from, to);
      } else {
        sortRange(keys, order, from, to);
      }
      if (c + 1 == columns.length) {
        return;
      }
      int start = from;
      while (start < to) {
        int end = start + 1;
        while (end < to && keys[end] == keys[start]) {
          end++;
        }
        if (end - start > 1) {
          sortGroup(keys, order, start, end, columns, c + 1);
        }
        start = end;
      }
    }

    /** Stable insertion sort of the pairs in {@code [from, to)} by unsigned key. */
    private static void insertionSort(long[] keys, int[] values, int from, int to) {
      for (int i = from + 1; i < to; i++) {
        long k = keys[i];
        int v = values[i];
        int j = i - 1;
        while (j >= from && Long.compareUnsigned(keys[j], k) > 0) {
          keys[j + 1] = keys[j];
          values[j + 1] = values[j];
          j--;
        }
        keys[j + 1] = k;
        values[j + 1] = v;
      }
    }

    /**
     * Stable LSD radix sort of the pairs in {@code [from, to)} by unsigned key: one counting
     * pass per byte position that varies there, low to high, alternating with the scratch
     * arrays; the result ends in {@code keys} and {@code values}.
     */
    void sortRange(long[] keys, int[] values, int from, int to) {
      int n = to - from;
      if (n < 2) {
        return;
      }
      Arrays.fill(counts, 0);
      for (int i = from; i < to; i++) {
        long k = keys[i];
        for (int b = 0; b < BYTES; b++) {
          counts[b * RADIX + ((int) (k >>> (8 * b)) & 0xFF)]++;
        }
      }
      long[] fk = keys;
      int[] fv = values;
      long[] tk = this.keys;
      int[] tv = this.values;
      for (int b = 0; b < BYTES; b++) {
        int base = b * RADIX;
        int shift = 8 * b;
        if (counts[base + ((int) (fk[from] >>> shift) & 0xFF)] == n) {
          continue;
        }
        int sum = from;
        for (int d = 0; d < RADIX; d++) {
          int c = counts[base + d];
          counts[base + d] = sum;
          sum += c;
        }
        for (int i = from; i < to; i++) {
          long k = fk[i];
          int at = counts[base + ((int) (k >>> shift) & 0xFF)]++;
          tk[at] = k;
          tv[at] = fv[i];
        }
        long[] k2 = fk;
        fk = tk;
        tk = k2;
        int[] v2 = fv;
        fv = tv;
        tv = v2;
      }
      if (fk != keys) {
        System.arraycopy(fk, from, keys, from, n);
        System.arraycopy(fv, from, values, from, n);
      }
    }
  }
}
