package org.sunder.stitching;

/**
 * Accumulates edge weights per unordered pair of segment ids: sum, count, min and max. An
 * open-addressing hash table on primitive arrays (linear probing, load at most 1/2), so adding
 * an edge is O(1) expected and allocates nothing once the table has grown. Not thread-safe.
 *
 * <p>Pairs are stored with {@code u < v} (signed comparison of the {@code long} ids).
 */
final class PairAccumulator {
  private long[] keyU;
  private long[] keyV;
  private boolean[] used;
  private double[] sum;
  private long[] count;
  private double[] min;
  private double[] max;
  private int size;

  PairAccumulator(int expectedPairs) {
    int capacity = Integer.highestOneBit(Math.max(16, expectedPairs * 2 - 1)) << 1;
    allocate(capacity);
  }

  private void allocate(int capacity) {
    keyU = new long[capacity];
    keyV = new long[capacity];
    used = new boolean[capacity];
    sum = new double[capacity];
    count = new long[capacity];
    min = new double[capacity];
    max = new double[capacity];
  }

  int size() {
    return size;
  }

  /** Adds one edge of weight {@code w} between segments {@code a != b}. */
  void add(long a, long b, double w) {
    long u = Math.min(a, b);
    long v = Math.max(a, b);
    int slot = find(u, v);
    if (!used[slot]) {
      used[slot] = true;
      keyU[slot] = u;
      keyV[slot] = v;
      min[slot] = w;
      max[slot] = w;
      size++;
    } else {
      min[slot] = Math.min(min[slot], w);
      max[slot] = Math.max(max[slot], w);
    }
    sum[slot] += w;
    count[slot]++;
    if (size * 2 > used.length) {
      grow();
    }
  }

  private int find(long u, long v) {
    int mask = used.length - 1;
    long h = u * 0x9E3779B97F4A7C15L + v * 0xC2B2AE3D27D4EB4FL;
    int slot = (int) (h ^ (h >>> 32)) & mask;
    while (used[slot] && (keyU[slot] != u || keyV[slot] != v)) {
      slot = (slot + 1) & mask;
    }
    return slot;
  }

  private void grow() {
    long[] oldU = keyU;
    long[] oldV = keyV;
    boolean[] oldUsed = used;
    double[] oldSum = sum;
    long[] oldCount = count;
    double[] oldMin = min;
    double[] oldMax = max;
    allocate(used.length * 2);
    for (int i = 0; i < oldUsed.length; i++) {
      if (oldUsed[i]) {
        int slot = find(oldU[i], oldV[i]);
        used[slot] = true;
        keyU[slot] = oldU[i];
        keyV[slot] = oldV[i];
        sum[slot] = oldSum[i];
        count[slot] = oldCount[i];
        min[slot] = oldMin[i];
        max[slot] = oldMax[i];
      }
    }
  }

  /** The accumulated pairs, sorted by (u, v). */
  PairTable toTable() {
    int[] order = new int[size];
    int next = 0;
    for (int i = 0; i < used.length; i++) {
      if (used[i]) {
        order[next++] = i;
      }
    }
    sortByKeys(order);
    long[] u = new long[size];
    long[] v = new long[size];
    double[] s = new double[size];
    long[] c = new long[size];
    double[] lo = new double[size];
    double[] hi = new double[size];
    for (int i = 0; i < size; i++) {
      int slot = order[i];
      u[i] = keyU[slot];
      v[i] = keyV[slot];
      s[i] = sum[slot];
      c[i] = count[slot];
      lo[i] = min[slot];
      hi[i] = max[slot];
    }
    return new PairTable(u, v, s, c, lo, hi);
  }

  private void sortByKeys(int[] slots) {
    // Merge sort on slot indices comparing (keyU, keyV); O(m log m), no boxing.
    int[] buffer = new int[slots.length];
    mergeSort(slots, buffer, 0, slots.length);
  }

  private void mergeSort(int[] a, int[] buffer, int from, int to) {
    if (to - from < 2) {
      return;
    }
    int mid = (from + to) >>> 1;
    mergeSort(a, buffer, from, mid);
    mergeSort(a, buffer, mid, to);
    System.arraycopy(a, from, buffer, from, to - from);
    int i = from;
    int j = mid;
    for (int k = from; k < to; k++) {
      if (j >= to || (i < mid && !less(buffer[j], buffer[i]))) {
        a[k] = buffer[i++];
      } else {
        a[k] = buffer[j++];
      }
    }
  }

  private boolean less(int x, int y) {
    return keyU[x] != keyU[y] ? keyU[x] < keyU[y] : keyV[x] < keyV[y];
  }
}
