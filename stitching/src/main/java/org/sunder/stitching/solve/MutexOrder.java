package org.sunder.stitching.solve;

import org.sunder.blockwise.partition.mutex.MutexWatershed;

/**
 * The Mutex Watershed's order on {@link SolveEdges} ("The Mutex Watershed and its Objective:
 * Efficient, Parameter-Free Graph Partitioning", TPAMI 2020; ties as Sunder's decision record
 * states): descending {@code |weight|}, attractive before repulsive, then ascending key. The key
 * order of the reduced graph's pairs is the order in which the single-level solve lists their
 * edges, so both solves take edges in the same order.
 */
final class MutexOrder {
  private MutexOrder() {}

  /** Negative when edge {@code a} comes before edge {@code b}. */
  static int compare(SolveEdges edges, int a, int b) {
    double wa = edges.weight(a);
    double wb = edges.weight(b);
    int c = Double.compare(Math.abs(wb), Math.abs(wa));
    if (c != 0) {
      return c;
    }
    boolean pa = wa > 0;
    boolean pb = wb > 0;
    if (pa != pb) {
      return pa ? -1 : 1;
    }
    return edges.compareKeys(a, b);
  }

  /**
   * The edge indices in the Mutex Watershed's order, equal edges in index order; a radix sort
   * ({@link EdgeSort#byMutexOrder}), O(m) per varying key byte.
   */
  static int[] sorted(SolveEdges edges) {
    return EdgeSort.byMutexOrder(edges);
  }

  /**
   * The indices of {@code edges} in this order, merged from runs each already in it (run
   * {@code r} ends before {@code runEnds[r]}, the next starts there), equal edges in index
   * order; null when a run is out of order. A heap of the runs' next edges, each run's next
   * weight held as its {@link MutexWatershed#orderKey} (keys are read only on equal weights):
   * O(m log k) for m edges in k runs, reading each run's weights in order.
   */
  static int[] merged(SolveEdges edges, int[] runEnds) {
    Heads heads = new Heads(edges, runEnds);
    int[] order = new int[edges.size()];
    for (int i = 0; i < order.length; i++) {
      order[i] = heads.first();
      if (!heads.advance()) {
        return null;
      }
    }
    return order;
  }

  /** A binary heap of runs ordered by their next edges. */
  private static final class Heads {
    private final SolveEdges edges;
    private final double[] weight;
    private final int[] runEnds;
    /** Per run, the index of its next edge. */
    private final int[] next;
    /** Per run, the {@link MutexWatershed#orderKey} of its next edge's weight. */
    private final long[] key;
    private final int[] heap;
    private int size;

    Heads(SolveEdges edges, int[] runEnds) {
      this.edges = edges;
      this.weight = edges.weightColumn();
      this.runEnds = runEnds;
      int runs = runEnds.length;
      next = new int[runs];
      key = new long[runs];
      heap = new int[runs];
      for (int r = 0; r < runs; r++) {
        next[r] = r == 0 ? 0 : runEnds[r - 1];
        if (next[r] < runEnds[r]) {
          key[r] = MutexWatershed.orderKey(weight[next[r]]);
          heap[size++] = r;
        }
      }
      for (int i = size / 2 - 1; i >= 0; i--) {
        siftDown(i);
      }
    }

    /** The first run's next edge, the first of all. */
    int first() {
      return next[heap[0]];
    }

    /**
     * Moves the first run on to its next edge (out of the heap after its last); false when that
     * edge comes before the one it follows.
     */
    boolean advance() {
      int r = heap[0];
      int e = next[r]++;
      if (next[r] == runEnds[r]) {
        heap[0] = heap[--size];
      } else {
        long k = MutexWatershed.orderKey(weight[e + 1]);
        int c = Long.compareUnsigned(key[r], k);
        if (c > 0 || c == 0 && edges.compareKeys(e, e + 1) > 0) {
          return false;
        }
        key[r] = k;
      }
      siftDown(0);
      return true;
    }

    private void siftDown(int i) {
      int r = heap[i];
      while (2 * i + 1 < size) {
        int child = 2 * i + 1;
        if (child + 1 < size && before(heap[child + 1], heap[child])) {
          child++;
        }
        if (!before(heap[child], r)) {
          break;
        }
        heap[i] = heap[child];
        i = child;
      }
      heap[i] = r;
    }

    /** Whether run {@code r}'s next edge comes before run {@code s}'s (ties: the lower run). */
    private boolean before(int r, int s) {
      int c = Long.compareUnsigned(key[r], key[s]);
      if (c == 0) {
        c = edges.compareKeys(next[r], next[s]);
      }
      return c < 0 || c == 0 && r < s;
    }
  }
}
