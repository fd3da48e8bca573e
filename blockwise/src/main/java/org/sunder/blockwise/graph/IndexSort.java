package org.sunder.blockwise.graph;

/** Stable merge sort of an {@code int[]} of indices under a primitive comparator. */
final class IndexSort {
  /** Compares two indices; negative, zero or positive as usual. */
  @FunctionalInterface
  interface IndexComparator {
    int compare(int a, int b);
  }

  private IndexSort() {}

  /** Sorts {@code indices} in place, stably, in {@code O(n log n)}. */
  static void sort(int[] indices, IndexComparator comparator) {
    int[] buffer = new int[indices.length];
    for (int width = 1; width < indices.length; width *= 2) {
      for (int lo = 0; lo < indices.length; lo += 2 * width) {
        int mid = Math.min(lo + width, indices.length);
        int hi = Math.min(lo + 2 * width, indices.length);
        int i = lo;
        int j = mid;
        int o = lo;
        while (i < mid && j < hi) {
          buffer[o++] = comparator.compare(indices[j], indices[i]) < 0 ? indices[j++] : indices[i++];
        }
        while (i < mid) {
          buffer[o++] = indices[i++];
        }
        while (j < hi) {
          buffer[o++] = indices[j++];
        }
      }
      System.arraycopy(buffer, 0, indices, 0, indices.length);
    }
  }
}
