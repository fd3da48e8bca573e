package org.sunder.stitching.solve;

import org.sunder.blockwise.collections.RadixSort;
import org.sunder.blockwise.partition.mutex.MutexWatershed;

/**
 * The orders the solve takes {@link SolveEdges} in, as stable radix sorts of edge indices
 * ({@link RadixSort#order}): the first key column is read in index order and sorted by passes
 * that read and write memory in order, and a later column is read only for the edges that tie
 * on every column before it; a comparison sort instead reads several arrays at two random
 * indices per comparison. {@code O(m (c + b))} at worst for {@code m} edges, {@code c} key
 * columns and {@code b} varying key bytes; 24 bytes per edge while it runs.
 */
final class EdgeSort {
  private EdgeSort() {}

  /**
   * The indices {@code 0..size-1} of {@code edges} in ascending key order
   * ({@link SolveEdges#compareKeys}: {@code keyU}, then {@code keyV}, then {@code kind}), edges
   * of equal keys in index order.
   */
  static int[] byKey(SolveEdges edges) {
    return RadixSort.order(edges.size(), e -> RadixSort.signedKey(edges.keyU(e)),
        e -> RadixSort.signedKey(edges.keyV(e)), e -> RadixSort.signedKey(edges.kind(e)));
  }

  /**
   * The indices {@code 0..size-1} of {@code edges} in the Mutex Watershed's order
   * ({@link MutexOrder#compare}: descending {@code |weight|}, attractive first, then ascending
   * key), edges equal in all three in index order.
   */
  static int[] byMutexOrder(SolveEdges edges) {
    return RadixSort.order(edges.size(), e -> MutexWatershed.orderKey(edges.weight(e)),
        e -> RadixSort.signedKey(edges.keyU(e)), e -> RadixSort.signedKey(edges.keyV(e)),
        e -> RadixSort.signedKey(edges.kind(e)));
  }

  /** The indices of {@code values} in ascending order of value, equal values in index order. */
  static int[] byValue(long[] values) {
    return RadixSort.order(values.length, i -> RadixSort.signedKey(values[i]));
  }
}
