package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;

/**
 * A binary max-heap of entries (signed value, rank, edge) in parallel primitive arrays, for
 * lazy deletion: an entry is never changed or removed except at the top, so a caller pushes a
 * new entry when an edge's value changes and skips, on popping, entries that no longer match
 * their edge.
 *
 * <p>Order: descending priority (the value, or {@code |value|} when by magnitude), then value
 * {@code > 0} first, then ascending rank, then ascending edge. Without separate ranks the rank is
 * the edge. {@code O(log s)} per push and pop on {@code s} entries, {@code O(s)} to
 * {@link #heapify}. Memory 12 bytes per entry (16 with ranks). Not thread-safe.
 */
final class EdgeQueue {
  private final boolean byMagnitude;
  private double[] value;
  private int[] edge;
  private int[] rank;
  private int size;

  EdgeQueue(boolean byMagnitude, boolean separateRanks, int capacity) {
    int c = Math.max(4, capacity);
    this.byMagnitude = byMagnitude;
    this.value = new double[c];
    this.edge = new int[c];
    this.rank = separateRanks ? new int[c] : null;
  }

  int size() {
    return size;
  }

  /** Appends an entry without restoring the heap order; call {@link #heapify} before popping. */
  void append(double v, int r, int e) {
    if (size == edge.length) {
      grow();
    }
    value[size] = v;
    edge[size] = e;
    if (rank != null) {
      rank[size] = r;
    }
    size++;
  }

  /** Restores the heap order after {@link #append}s; Floyd's bottom-up construction. */
  void heapify() {
    for (int i = size / 2 - 1; i >= 0; i--) {
      down(i);
    }
  }

  void push(double v, int r, int e) {
    append(v, r, e);
    up(size - 1);
  }

  double topValue() {
    return value[0];
  }

  int topEdge() {
    return edge[0];
  }

  /** The top entry's rank (its edge without separate ranks). */
  int topRank() {
    return rank == null ? edge[0] : rank[0];
  }

  void pop() {
    size--;
    if (size > 0) {
      move(size, 0);
      down(0);
    }
  }

  private void grow() {
    int c = edge.length + (edge.length >> 1) + 1;
    value = Arrays.copyOf(value, c);
    edge = Arrays.copyOf(edge, c);
    if (rank != null) {
      rank = Arrays.copyOf(rank, c);
    }
  }

  private void move(int from, int to) {
    value[to] = value[from];
    edge[to] = edge[from];
    if (rank != null) {
      rank[to] = rank[from];
    }
  }

  /** Whether entry (va, ra, ea) comes before entry (vb, rb, eb). */
  private boolean above(double va, int ra, int ea, double vb, int rb, int eb) {
    if (byMagnitude) {
      double pa = Math.abs(va);
      double pb = Math.abs(vb);
      if (pa != pb) {
        return pa > pb;
      }
      boolean positiveA = va > 0;
      if (positiveA != vb > 0) {
        return positiveA;
      }
    } else if (va != vb) {
      return va > vb;
    }
    if (ra != rb) {
      return ra < rb;
    }
    return ea < eb;
  }

  private int rankAt(int i) {
    return rank == null ? edge[i] : rank[i];
  }

  private void up(int i) {
    double v = value[i];
    int e = edge[i];
    int r = rankAt(i);
    while (i > 0) {
      int parent = (i - 1) >>> 1;
      if (!above(v, r, e, value[parent], rankAt(parent), edge[parent])) {
        break;
      }
      move(parent, i);
      i = parent;
    }
    value[i] = v;
    edge[i] = e;
    if (rank != null) {
      rank[i] = r;
    }
  }

  private void down(int i) {
    double v = value[i];
    int e = edge[i];
    int r = rankAt(i);
    int half = size >>> 1;
    while (i < half) {
      int child = 2 * i + 1;
      int right = child + 1;
      if (right < size && above(value[right], rankAt(right), edge[right], value[child],
          rankAt(child), edge[child])) {
        child = right;
      }
      if (!above(value[child], rankAt(child), edge[child], v, r, e)) {
        break;
      }
      move(child, i);
      i = child;
    }
    value[i] = v;
    edge[i] = e;
    if (rank != null) {
      rank[i] = r;
    }
  }
}
