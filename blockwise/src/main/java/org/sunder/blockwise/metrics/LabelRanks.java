package org.sunder.blockwise.metrics;

import java.util.Arrays;

/**
 * The distinct values of a label array in ascending unsigned order, the rank of each entry
 * among them, and a stable counting sort by rank: together they order label pairs in
 * {@code O(p log p)} primitive sorting plus {@code O(p + labels)} passes, without comparators.
 */
final class LabelRanks {
  /** The distinct labels, ascending as unsigned numbers. */
  final long[] unique;
  /** {@code unique[rank[i]] == labels[i]}. */
  final int[] rank;

  LabelRanks(long[] labels) {
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
    long[] sortedFlipped = Arrays.copyOf(flipped, distinct);
    rank = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      rank[i] = Arrays.binarySearch(sortedFlipped, labels[i] ^ Long.MIN_VALUE);
    }
    unique = new long[distinct];
    for (int i = 0; i < distinct; i++) {
      unique[i] = sortedFlipped[i] ^ Long.MIN_VALUE;
    }
  }

  /** {@code order} stably re-sorted by {@code rank[order[i]]}; a new array. */
  int[] stableSort(int[] order) {
    int[] start = new int[unique.length + 1];
    for (int i : order) {
      start[rank[i] + 1]++;
    }
    for (int r = 0; r < unique.length; r++) {
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
