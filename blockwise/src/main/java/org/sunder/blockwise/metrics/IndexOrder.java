package org.sunder.blockwise.metrics;

/**
 * Sorts an array of indices by a primitive comparison of the items they point at, without
 * boxing. Quicksort with median-of-three pivots and insertion sort for short ranges,
 * {@code O(n log n)} expected; not stable, so comparators must break ties themselves when the
 * order has to be deterministic.
 */
final class IndexOrder {

  /** Compares the items at two indices. */
  @FunctionalInterface
  interface Comparison {
    int compare(int a, int b);
  }

  private static final int INSERTION_LIMIT = 16;

  private IndexOrder() {}

  /** Returns {@code 0 .. n-1} sorted by {@code comparison}. */
  static int[] sorted(int n, Comparison comparison) {
    int[] index = new int[n];
    for (int i = 0; i < n; i++) {
      index[i] = i;
    }
    sort(index, 0, n - 1, comparison);
    return index;
  }

  private static void sort(int[] a, int lo, int hi, Comparison c) {
    while (hi - lo >= INSERTION_LIMIT) {
      int p = partition(a, lo, hi, c);
      if (p - lo < hi - p) {
        sort(a, lo, p - 1, c);
        lo = p + 1;
      } else {
        sort(a, p + 1, hi, c);
        hi = p - 1;
      }
    }
    insertion(a, lo, hi, c);
  }

  private static int partition(int[] a, int lo, int hi, Comparison c) {
    int mid = (lo + hi) >>> 1;
    if (c.compare(a[mid], a[lo]) < 0) {
      swap(a, mid, lo);
    }
    if (c.compare(a[hi], a[lo]) < 0) {
      swap(a, hi, lo);
    }
    if (c.compare(a[hi], a[mid]) < 0) {
      swap(a, hi, mid);
    }
    swap(a, mid, hi - 1);
    int pivot = a[hi - 1];
    int i = lo;
    int j = hi - 1;
    while (true) {
      while (c.compare(a[++i], pivot) < 0) {
        // advance
      }
      while (c.compare(pivot, a[--j]) < 0) {
        // retreat
      }
      if (i >= j) {
        break;
      }
      swap(a, i, j);
    }
    swap(a, i, hi - 1);
    return i;
  }

  private static void insertion(int[] a, int lo, int hi, Comparison c) {
    for (int i = lo + 1; i <= hi; i++) {
      int v = a[i];
      int j = i - 1;
      while (j >= lo && c.compare(v, a[j]) < 0) {
        a[j + 1] = a[j];
        j--;
      }
      a[j + 1] = v;
    }
  }

  private static void swap(int[] a, int i, int j) {
    int t = a[i];
    a[i] = a[j];
    a[j] = t;
  }
}
