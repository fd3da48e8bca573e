package org.sunder.stitching.solve;

import java.util.Arrays;

/**
 * Which entries of a list of unordered pairs of nodes {@code 0..n-1}, each with a sign, come
 * first among the entries of their pair and sign: a stable counting sort of the entries by the
 * pair's smaller node, then per node a stamp of the last smaller node it was seen with, one
 * stamp array per sign. {@code O(k + n)} for {@code k} entries, every array access within
 * arrays of {@code n} or {@code k} ints (a hash set of pairs instead reads a table of 16 bytes
 * or more per entry at random); {@code 4 (2k + 3n)} bytes while it runs.
 */
final class FirstOfPair {
  private FirstOfPair() {}

  /**
   * Per entry {@code c < k}: whether no entry before it has the same pair
   * {@code {a[c], b[c]}} and the same {@code attractive[c]}.
   *
   * @param n the nodes' bound: every {@code a[c]}, {@code b[c]} lies in {@code 0..n-1}
   */
  static boolean[] firsts(int[] a, int[] b, boolean[] attractive, int k, int n) {
    int[] start = new int[n + 1];
    for (int c = 0; c < k; c++) {
      start[Math.min(a[c], b[c]) + 1]++;
    }
    for (int i = 0; i < n; i++) {
      start[i + 1] += start[i];
    }
    int[] byLow = new int[k];
    int[] next = Arrays.copyOf(start, n);
    for (int c = 0; c < k; c++) {
      byLow[next[Math.min(a[c], b[c])]++] = c;
    }
    int[] seenAttractive = new int[n];
    int[] seenRepulsive = new int[n];
    Arrays.fill(seenAttractive, -1);
    Arrays.fill(seenRepulsive, -1);
    boolean[] first = new boolean[k];
    for (int low = 0; low < n; low++) {
      for (int i = start[low]; i < start[low + 1]; i++) {
        int c = byLow[i];
        int high = Math.max(a[c], b[c]);
        int[] seen = attractive[c] ? seenAttractive : seenRepulsive;
        if (seen[high] != low) {
          seen[high] = low;
          first[c] = true;
        }
      }
    }
    return first;
  }
}
