package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * Max-heap of (key, tie, payload) on primitive arrays: largest key first, among equal keys the
 * smallest tie. Used lazily: stale entries are skipped by the caller on removal. Four children
 * per entry: half the depth of a binary heap, and a removal compares four neighbouring entries
 * per level, which for heaps larger than the cache costs fewer misses. Entries of equal key and
 * tie come out in no particular order.
 */
public final class MaxHeap {
  private double[] keys;
  private long[] ties;
  private int[] payloads;
  private int size;

  public MaxHeap(int capacity) {
    int c = Math.max(16, capacity);
    keys = new double[c];
    ties = new long[c];
    payloads = new int[c];
  }

  public boolean isEmpty() {
    return size == 0;
  }

  public void clear() {
    size = 0;
  }

  public double topKey() {
    return keys[0];
  }

  public long topTie() {
    return ties[0];
  }

  public int topPayload() {
    return payloads[0];
  }

  public void push(double key, long tie, int payload) {
    if (size == keys.length) {
      keys = Arrays.copyOf(keys, size * 2);
      ties = Arrays.copyOf(ties, size * 2);
      payloads = Arrays.copyOf(payloads, size * 2);
    }
    int i = size++;
    while (i > 0) {
      int parent = (i - 1) >>> 2;
      if (!before(key, tie, keys[parent], ties[parent])) {
        break;
      }
      move(parent, i);
      i = parent;
    }
    set(i, key, tie, payload);
  }

  /** Removes the top entry (read it first with the {@code top} accessors). */
  public void pop() {
    size--;
    if (size == 0) {
      return;
    }
    double key = keys[size];
    long tie = ties[size];
    int payload = payloads[size];
    int i = 0;
    while (true) {
      int child = firstChild(keys, ties, i, size);
      if (child < 0 || !before(keys[child], ties[child], key, tie)) {
        break;
      }
      move(child, i);
      i = child;
    }
    set(i, key, tie, payload);
  }

  /**
   * Whether (k1, t1) comes out before (k2, t2): the larger key, then the smaller tie; also
   * {@link IndexedMaxHeap}'s order.
   */
  static boolean before(double k1, long t1, double k2, long t2) {
    return k1 > k2 || (k1 == k2 && t1 < t2);
  }

  /**
   * Of the (up to four) children of position {@code i} in a 4-ary heap of {@code size} entries,
   * the one that comes out first; -1 when {@code i} has none. Also {@link IndexedMaxHeap}'s.
   */
  static int firstChild(double[] keys, long[] ties, int i, int size) {
    int first = 4 * i + 1;
    if (first >= size) {
      return -1;
    }
    int child = first;
    int end = Math.min(first + 4, size);
    for (int c = first + 1; c < end; c++) {
      if (before(keys[c], ties[c], keys[child], ties[child])) {
        child = c;
      }
    }
    return child;
  }

  private void move(int from, int to) {
    keys[to] = keys[from];
    ties[to] = ties[from];
    payloads[to] = payloads[from];
  }

  private void set(int i, double key, long tie, int payload) {
    keys[i] = key;
    ties[i] = tie;
    payloads[i] = payload;
  }
}
