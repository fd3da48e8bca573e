package org.sunder.blockwise.metrics;

import java.util.Arrays;

/**
 * Ranks of label values that preserve their unsigned order, and a stable counting sort by
 * rank: together they order label pairs without comparators. Labels spanning a small range
 * (at most {@code max(2^20, 4 n)} values, the usual case of consecutive ids) rank as
 * {@code label - min} in {@code O(n)}; others by a primitive sort of the distinct values and a
 * binary search each, {@code O(n log n)}.
 */
final class LabelRanks {
  /** Ranks run over {@code 0 .. rankCount - 1}; equal labels, equal ranks. */
  final int[] rank;
  final int rankCount;

  LabelRanks(long[] labels) {
    rank = new int[labels.length];
    long min = -1;
    long max = 0;
    for (long l : labels) {
      if (Long.compareUnsigned(l, min) < 0) {
        min = l;
      }
      if (Long.compareUnsigned(l, max) > 0) {
        max = l;
      }
    }
    long span = labels.length == 0 ? 0 : max - min;
    long smallRange = Math.max(1 << 20, 4L * labels.length);
    if (labels.length == 0 || Long.compareUnsigned(span, smallRange) < 0) {
      for (int i = 0; i < labels.length; i++) {
        rank[i] = (int) (labels[i] - min);
      }
      rankCount = labels.length == 0 ? 0 : (int) span + 1;
    } else {
      long[] distinct = distinctFlipped(labels);
      for (int i = 0; i < labels.length; i++) {
        rank[i] = Arrays.binarySearch(distinct, labels[i] ^ Long.MIN_VALUE);
      }
      rankCount = distinct.length;
    }
  }

  /** The distinct labels with the sign bit flipped (so signed order = unsigned order), sorted. */
  private static long[] distinctFlipped(long[] labels) {
    long[] flipped = new long[labels.length];
    for (int i = 0; i < labels.length; i++) {
      flipped[i] = labels[i] ^ Long.MIN_VALUE;
    }
    Arrays.sort(flipped);
    int distinct = 0;
    for (int i = 0; i < flipped.length; i++) {
      if (i == 0 || flipped[i] != flipped[i - 1]) {
        flipped[distinct++] = flipped[i];
      }
    }
    return Arrays.copyOf(flipped, distinct);
  }

  /** {@code order} stably re-sorted by {@code rank[order[i]]}; a new array. */
  int[] stableSort(int[] order) {
    int[] start = new int[rankCount + 1];
    for (int i : order) {
      start[rank[i] + 1]++;
    }
    for (int r = 0; r < rankCount; r++) {
      start[r + 1] += start[r];
    }
    int[] out = new int[order.length];
    for (int i : order) {
      out[start[rank[i]]++] = i;
    }
    return out;
  }

  static int[] identity(int n) {
    int[] out = new int[n];
    for (int i = 0; i < n; i++) {
      out[i] = i;
    }
    return out;
  }
}
