package org.sunder.blockwise.graph;

/**
 * An open-addressing hash map from an ordered pair of {@code long}s to a non-negative
 * {@code int}, on one primitive array (linear probing, backward-shift deletion, doubling at 1/2
 * load). A slot is three consecutive longs (first, second, value plus one; 0 marks an empty
 * slot, so a fresh table needs no filling): a lookup in a table larger than the cache reads one
 * or two cache lines, not one per column. Expected {@code O(1)} per operation. Not thread-safe.
 */
public final class PairIndex {
  private static final int SLOT = 3;
  private long[] table;
  private int size;
  private int mask;

  /** An empty index sized for about {@code expected} pairs. */
  public PairIndex(int expected) {
    int capacity = Integer.highestOneBit(Math.max(4, expected) * 2 - 1) << 1;
    allocate(capacity);
  }

  public int size() {
    return size;
  }

  /** The value of {@code (a, b)}, or -1 when absent. */
  public int get(long a, long b) {
    long[] t = table;
    for (int i = slot(a, b); ; i = (i + 1) & mask) {
      int at = SLOT * i;
      long stored = t[at + 2];
      if (stored == 0) {
        return -1;
      }
      if (t[at] == a && t[at + 1] == b) {
        return (int) stored - 1;
      }
    }
  }

  /** Sets the value of {@code (a, b)} (non-negative); returns the previous value or -1. */
  public int put(long a, long b, int value) {
    if (value < 0) {
      throw new IllegalArgumentException("value " + value + " is negative");
    }
    if (2 * (size + 1) > capacity()) {
      grow();
    }
    long[] t = table;
    for (int i = slot(a, b); ; i = (i + 1) & mask) {
      int at = SLOT * i;
      long old = t[at + 2];
      if (old == 0) {
        t[at] = a;
        t[at + 1] = b;
        t[at + 2] = value + 1L;
        size++;
        return -1;
      }
      if (t[at] == a && t[at + 1] == b) {
        t[at + 2] = value + 1L;
        return (int) old - 1;
      }
    }
  }

  /** Removes {@code (a, b)}; returns its value or -1 when absent. */
  public int remove(long a, long b) {
    long[] t = table;
    for (int i = slot(a, b); ; i = (i + 1) & mask) {
      int at = SLOT * i;
      long stored = t[at + 2];
      if (stored == 0) {
        return -1;
      }
      if (t[at] == a && t[at + 1] == b) {
        deleteAt(i);
        size--;
        return (int) stored - 1;
      }
    }
  }

  private int capacity() {
    return mask + 1;
  }

  private void deleteAt(int hole) {
    long[] t = table;
    int i = hole;
    while (true) {
      i = (i + 1) & mask;
      int at = SLOT * i;
      if (t[at + 2] == 0) {
        t[SLOT * hole + 2] = 0;
        return;
      }
      int home = slot(t[at], t[at + 1]);
      boolean movable = hole <= i ? (home <= hole || home > i) : (home <= hole && home > i);
      if (movable) {
        System.arraycopy(t, at, t, SLOT * hole, SLOT);
        hole = i;
      }
    }
  }

  private int slot(long a, long b) {
    long h = a * 0x9E3779B97F4A7C15L + b;
    h ^= h >>> 32;
    h *= 0xBF58476D1CE4E5B9L;
    h ^= h >>> 29;
    return (int) h & mask;
  }

  private void allocate(int capacity) {
    if (capacity <= 0 || capacity > (Integer.MAX_VALUE - 8) / SLOT) {
      throw new IllegalStateException("PairIndex: " + size + " pairs need more slots than one"
          + " array holds");
    }
    table = new long[SLOT * capacity];
    mask = capacity - 1;
  }

  private void grow() {
    long[] old = table;
    allocate(2 * capacity());
    size = 0;
    for (int at = 0; at < old.length; at += SLOT) {
      if (old[at + 2] != 0) {
        put(old[at], old[at + 1], (int) old[at + 2] - 1);
      }
    }
  }
}
