package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * An indexed 4-ary max-heap of edge ids {@code 0..m-1} by {@code priority[e]} (descending),
 * then {@code tie[e]} (ascending), then {@code order[e]} (ascending), then {@code e}: a total
 * order, so the sequence of pops does not depend on the heap's shape. The arrays are the
 * caller's; after changing an entry's priority, tie or order call {@link #update}.
 *
 * <p>Each heap slot keeps a copy of its edge's priority and of its (tie, order) rank next to
 * the edge id, so sifting compares slots without reaching into the caller's arrays at random;
 * four children per node halve the depth. {@code O(log m)} per change, {@code O(m)} to build;
 * 24 bytes per capacity slot. Not thread-safe.
 */
final class EdgeHeap {
  private final double[] priority;
  private final byte[] tie;
  private final int[] order;
  /** Edge id per heap slot. */
  private final int[] heap;
  /** Copy of {@code priority[heap[i]]} per heap slot. */
  private final double[] slotPriority;
  /** {@code tie[heap[i]]} above {@code order[heap[i]]} (unsigned order: ascending as signed). */
  private final long[] slotRank;
  /** Heap slot of each edge, -1 when absent. */
  private final int[] position;
  private int size;

  EdgeHeap(double[] priority, byte[] tie, int[] order, int capacity) {
    this.priority = priority;
    this.tie = tie;
    this.order = order;
    this.heap = new int[capacity];
    this.slotPriority = new double[capacity];
    this.slotRank = new long[capacity];
    this.position = new int[capacity];
    Arrays.fill(position, -1);
  }

  int size() {
    return size;
  }

  boolean contains(int e) {
    return position[e] >= 0;
  }

  int top() {
    return heap[0];
  }

  /** Adds every {@code e} with {@code include[e]}; bottom-up heap construction. */
  void build(boolean[] include) {
    size = 0;
    for (int e = 0; e < include.length; e++) {
      if (include[e]) {
        set(size++, e);
      }
    }
    for (int i = (size - 2) >> 2; i >= 0; i--) {
      down(i);
    }
  }

  /** Inserts {@code e} or restores order after its priority, tie or order changed. */
  void update(int e) {
    int at = position[e];
    if (at < 0) {
      set(size, e);
      up(size++);
    } else {
      set(at, e);
      up(at);
      down(position[e]);
    }
  }

  void remove(int e) {
    int at = position[e];
    if (at < 0) {
      return;
    }
    position[e] = -1;
    size--;
    if (at == size) {
      return;
    }
    int last = heap[size];
    heap[at] = last;
    slotPriority[at] = slotPriority[size];
    slotRank[at] = slotRank[size];
    position[last] = at;
    up(at);
    down(position[last]);
  }

  int pop() {
    int e = heap[0];
    remove(e);
    return e;
  }

  /** Puts {@code e} with its current keys into slot {@code i}. */
  private void set(int i, int e) {
    heap[i] = e;
    slotPriority[i] = priority[e];
    slotRank[i] = rank(e);
    position[e] = i;
  }

  private long rank(int e) {
    return ((long) tie[e] << 32) | ((order[e] ^ Integer.MIN_VALUE) & 0xFFFFFFFFL);
  }

  /** Whether (p, r, e) comes before (q, s, f). */
  private static boolean above(double p, long r, int e, double q, long s, int f) {
    if (p != q) {
      return p > q;
    }
    if (r != s) {
      return r < s;
    }
    return e < f;
  }

  private void up(int i) {
    int e = heap[i];
    double p = slotPriority[i];
    long r = slotRank[i];
    while (i > 0) {
      int parent = (i - 1) >>> 2;
      if (!above(p, r, e, slotPriority[parent], slotRank[parent], heap[parent])) {
        break;
      }
      move(parent, i);
      i = parent;
    }
    heap[i] = e;
    slotPriority[i] = p;
    slotRank[i] = r;
    position[e] = i;
  }

  private void down(int i) {
    int e = heap[i];
    double p = slotPriority[i];
    long r = slotRank[i];
    while (true) {
      int first = 4 * i + 1;
      if (first >= size) {
        break;
      }
      int best = first;
      int end = Math.min(first + 4, size);
      for (int c = first + 1; c < end; c++) {
        if (above(slotPriority[c], slotRank[c], heap[c], slotPriority[best], slotRank[best],
            heap[best])) {
          best = c;
        }
      }
      if (!above(slotPriority[best], slotRank[best], heap[best], p, r, e)) {
        break;
      }
      move(best, i);
      i = best;
    }
    heap[i] = e;
    slotPriority[i] = p;
    slotRank[i] = r;
    position[e] = i;
  }

  /** Moves the entry of slot {@code from} to slot {@code to}. */
  private void move(int from, int to) {
    int e = heap[from];
    heap[to] = e;
    slotPriority[to] = slotPriority[from];
    slotRank[to] = slotRank[from];
    position[e] = to;
  }
}
