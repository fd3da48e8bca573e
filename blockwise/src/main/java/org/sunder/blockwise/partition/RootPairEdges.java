package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * The edge between two current cluster roots of an agglomeration, keyed by the unordered root
 * pair ({@link PairSet#pair}): an open-addressing map (linear probing) that never deletes.
 * A pair with a node that stopped being a root is never asked about again, so its entry is left
 * where it is; when the table fills up, {@link #put} first drops every such entry (the caller's
 * union-find {@code parent} says which nodes are roots) and doubles only if the live entries
 * still fill half of it. This spares the agglomeration a deletion, one random probe, per moved
 * edge. Expected {@code O(1)} amortized per operation; 12 bytes per slot. Not thread-safe.
 */
final class RootPairEdges {
  private static final long EMPTY = -1;
  private final int[] parent;
  private long[] keys;
  private int[] values;
  private int size;
  private int mask;

  /** A map for about {@code expected} pairs over the roots of {@code parent} (not copied). */
  RootPairEdges(int expected, int[] parent) {
    this.parent = parent;
    allocate(Integer.highestOneBit(Math.max(8, expected * 4 / 3 + 1) - 1) << 1);
  }

  /** The edge of the root pair {@code key}, or -1. */
  int get(long key) {
    for (int i = slot(key); ; i = (i + 1) & mask) {
      long k = keys[i];
      if (k == key) {
        return values[i];
      }
      if (k == EMPTY) {
        return -1;
      }
    }
  }

  /** Sets the edge of the root pair {@code key}. */
  void put(long key, int value) {
    if (4 * (size + 1) > 3 * keys.length) {
      rebuild();
    }
    for (int i = slot(key); ; i = (i + 1) & mask) {
      long k = keys[i];
      if (k == key) {
        values[i] = value;
        return;
      }
      if (k == EMPTY) {
        keys[i] = key;
        values[i] = value;
        size++;
        return;
      }
    }
  }

  /** Entries held, stale ones included. */
  int size() {
    return size;
  }

  private boolean live(long key) {
    int a = (int) (key >>> 32);
    int b = (int) key;
    return parent[a] == a && parent[b] == b;
  }

  /** Drops the stale entries, in place unless the live ones need a table twice as large. */
  private void rebuild() {
    int live = 0;
    for (long k : keys) {
      if (k != EMPTY && live(k)) {
        live++;
      }
    }
    long[] liveKeys = new long[live];
    int[] liveValues = new int[live];
    for (int i = 0, j = 0; i < keys.length; i++) {
      long k = keys[i];
      if (k != EMPTY && live(k)) {
        liveKeys[j] = k;
        liveValues[j++] = values[i];
      }
    }
    if (2 * (live + 1) > keys.length) {
      allocate(keys.length * 2);
    } else {
      Arrays.fill(keys, EMPTY);
    }
    size = 0;
    for (int j = 0; j < live; j++) {
      put(liveKeys[j], liveValues[j]);
    }
  }

  private int slot(long key) {
    long h = key * 0x9E3779B97F4A7C15L;
    return (int) (h ^ (h >>> 29)) & mask;
  }

  private void allocate(int capacity) {
    keys = new long[capacity];
    values = new int[capacity];
    Arrays.fill(keys, EMPTY);
    mask = capacity - 1;
  }
}
