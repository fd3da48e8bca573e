package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;

/**
 * An indexed binary max-heap of edge ids {@code 0..m-1} by {@code priority[e]} (descending),
 * then {@code tie[e]} (ascending), then {@code order[e]} (ascending), then {@code e}. The arrays
 * are the caller's; after changing an entry's priority, tie or order call {@link #update}. {@code O(log m)} per change, {@code O(m)}
 * to build. Not thread-safe.
 */
final class PreviousEdgeHeap {
  private final double[] priority;
  private final byte[] tie;
  private final int[] order;
  private final int[] heap;
  private final int[] position;
  private int size;

  PreviousEdgeHeap(double[] priority, byte[] tie, int[] order, int capacity) {
    this.priority = priority;
    this.tie = tie;
    this.order = order;
    this.heap = new int[capacity];
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

  /** Adds every {@code e} with {@code include[e]}; Floyd's bottom-up heap construction. */
  void build(boolean[] include) {
    size = 0;
    for (int e = 0; e < include.length; e++) {
      if (include[e]) {
        heap[size] = e;
        position[e] = size++;
      }
    }
    for (int i = size / 2 - 1; i >= 0; i--) {
      down(i);
    }
  }

  /** Inserts {@code e} or restores order after its priority changed. */
  void update(int e) {
    int at = position[e];
    if (at < 0) {
      heap[size] = e;
      position[e] = size;
      up(size++);
    } else {
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
    position[last] = at;
    up(at);
    down(position[last]);
  }

  int pop() {
    int e = heap[0];
    remove(e);
    return e;
  }

  private boolean above(int a, int b) {
    double pa = priority[a];
    double pb = priority[b];
    if (pa != pb) {
      return pa > pb;
    }
    if (tie[a] != tie[b]) {
      return tie[a] < tie[b];
    }
    if (order[a] != order[b]) {
      return order[a] < order[b];
    }
    return a < b;
  }

  private void up(int i) {
    int e = heap[i];
    while (i > 0) {
      int parent = (i - 1) >>> 1;
      int p = heap[parent];
      if (!above(e, p)) {
        break;
      }
      heap[i] = p;
      position[p] = i;
      i = parent;
    }
    heap[i] = e;
    position[e] = i;
  }

  private void down(int i) {
    int e = heap[i];
    while (true) {
      int child = 2 * i + 1;
      if (child >= size) {
        break;
      }
      if (child + 1 < size && above(heap[child + 1], heap[child])) {
        child++;
      }
      int c = heap[child];
      if (!above(c, e)) {
        break;
      }
      heap[i] = c;
      position[c] = i;
      i = child;
    }
    heap[i] = e;
    position[e] = i;
  }
}
