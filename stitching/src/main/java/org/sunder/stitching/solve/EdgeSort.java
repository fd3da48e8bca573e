package org.sunder.stitching.solve;

/**
 * Stable merge sort of edge indices by a primitive comparator (no boxing). O(m log m) time,
 * O(m) extra memory.
 */
final class EdgeSort {
  private EdgeSort() {}

  /** Compares two edge indices. */
  interface Comparator {
    int compare(int a, int b);
  }

  /** The indices {@code 0..size-1} of {@code edges} sorted by key. */
  static int[] byKey(SolveEdges edges) {
    return sorted(edges.size(), edges::compareKeys);
  }

  /** The indices {@code 0..n-1} sorted by {@code comparator} (stable). */
  static int[] sorted(int n, Comparator comparator) {
    int[] a = new int[n];
    for (int i = 0; i < n; i++) {
      a[i] = i;
    }
    int[] b = new int[n];
    for (int width = 1; width < n; width *= 2) {
      for (int lo = 0; lo < n; lo += 2 * width) {
        int mid = Math.min(lo + width, n);
        int hi = Math.min(lo + 2 * width, n);
        int i = lo;
        int j = mid;
        int k = lo;
        while (i < mid && j < hi) {
          b[k++] = comparator.compare(a[j], a[i]) < 0 ? a[j++] : a[i++];
        }
        while (i < mid) {
          b[k++] = a[i++];
        }
        while (j < hi) {
          b[k++] = a[j++];
        }
      }
      int[] t = a;
      a = b;
      b = t;
    }
    return a;
  }
}
