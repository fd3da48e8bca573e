package org.sunder.stitching.solve;

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
}
