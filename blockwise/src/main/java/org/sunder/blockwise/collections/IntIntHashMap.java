package org.sunder.blockwise.collections;

/**
 * Open-addressing map from non-negative int keys to int values, linear probing, deletion by
 * backward shift (no tombstones). Iterate with {@link #capacity()}, {@link #keyAt},
 * {@link #valueAt}; a slot with key {@code -1} is empty. A slot stores its key plus one, so a
 * fresh table (zeroed by the JVM) needs no filling: many small maps cost their allocation only.
 */
public final class IntIntHashMap {
  /** A stored key: the key plus one. */
  private static final int EMPTY = 0;
  private int[] keys;
  private int[] values;
  private int size;
  private int mask;
  private int shift;

  public IntIntHashMap(int expected) {
    int capacity = Integer.highestOneBit(Math.max(4, expected * 2 - 1)) << 1;
    keys = new int[capacity];
    values = new int[capacity];
    mask = capacity - 1;
    shift = Integer.numberOfLeadingZeros(mask);
  }

  public int size() {
    return size;
  }

  public int capacity() {
    return keys.length;
  }

  public int keyAt(int slot) {
    return keys[slot] - 1;
  }

  public int valueAt(int slot) {
    return values[slot];
  }

  /** The value of {@code key}, or {@code missing}. */
  public int get(int key, int missing) {
    int stored = key + 1;
    int slot = slot(key);
    while (keys[slot] != EMPTY) {
      if (keys[slot] == stored) {
        return values[slot];
      }
      slot = (slot + 1) & mask;
    }
    return missing;
  }

  public void put(int key, int value) {
    if (key < 0 || key == Integer.MAX_VALUE) {
      throw new IllegalArgumentException("key " + key + "; expected 0 .. 2^31 - 2");
    }
    int stored = key + 1;
    int slot = slot(key);
    while (keys[slot] != EMPTY) {
      if (keys[slot] == stored) {
        values[slot] = value;
        return;
      }
      slot = (slot + 1) & mask;
    }
    keys[slot] = stored;
    values[slot] = value;
    if (++size * 2 > keys.length) {
      grow();
    }
  }

  public void remove(int key) {
    int stored = key + 1;
    int slot = slot(key);
    while (keys[slot] != stored) {
      if (keys[slot] == EMPTY) {
        return;
      }
      slot = (slot + 1) & mask;
    }
    size--;
    int hole = slot;
    int next = (hole + 1) & mask;
    while (keys[next] != EMPTY) {
      int home = slot(keys[next] - 1);
      if (((next - home) & mask) >= ((next - hole) & mask)) {
        keys[hole] = keys[next];
        values[hole] = values[next];
        hole = next;
      }
      next = (next + 1) & mask;
    }
    keys[hole] = EMPTY;
  }

  /**
   * Reads the slot where a lookup of {@code key} starts and changes nothing: called for several
   * maps ahead of their lookups, it lets the memory system fetch them in parallel. Returns a
   * number with no meaning that the caller must use (so the read is not optimized away).
   */
  public int prefetch(int key) {
    return keys[slot(key)];
  }

  private int slot(int key) {
    return (key * 0x9E3779B9) >>> shift;
  }

  private void grow() {
    int[] oldKeys = keys;
    int[] oldValues = values;
    keys = new int[oldKeys.length * 2];
    values = new int[keys.length];
    mask = keys.length - 1;
    shift = Integer.numberOfLeadingZeros(mask);
    size = 0;
    for (int s = 0; s < oldKeys.length; s++) {
      if (oldKeys[s] != EMPTY) {
        put(oldKeys[s] - 1, oldValues[s]);
      }
    }
  }
}
