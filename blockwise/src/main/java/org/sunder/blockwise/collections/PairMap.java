package org.sunder.blockwise.collections;

import it.unimi.dsi.fastutil.longs.Long2IntOpenHashMap;

/**
 * A hash map from a packed pair ({@link PairSet#pair}) to an {@code int}: fastutil's
 * open-addressing {@link Long2IntOpenHashMap} (linear probing, no boxing) whose absent value is
 * -1, so {@code get} and {@code remove} return -1 for a missing key. Expected {@code O(1)} per
 * operation. Not thread-safe.
 */
public final class PairMap extends Long2IntOpenHashMap {
  private static final long serialVersionUID = 1L;

  /** An empty map sized for about {@code expected} pairs. */
  public PairMap(int expected) {
    super(Math.max(expected, 0));
    defaultReturnValue(-1);
  }
}
