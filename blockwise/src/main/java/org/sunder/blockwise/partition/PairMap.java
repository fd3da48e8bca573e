package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * An open-addressing hash map from a non-negative {@code long} (a packed pair, see
 * {@link PairSet#pair}) to a non-negative {@code int}: linear probing, backward-shift deletion,
 * growth at 3/4 load. Expected {@code O(1)} per operation. Not thread-safe.
 */
final class PairMap {
  private static final long EMPTY = -1;
  private long[] keys;
  private int[] values;
  private int size;
  private int mask;

  PairMap(int expected) {
    int capacity = Integer.highestOneBit(Math.max(8, expected * 4 / 3 + 1) - 1) << 1;
    allocate(capacity);
  }

  /** The value of {@code key}, or -1. */
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

  void put(long key, int value) {
    if (4 * (size + 1) > 3 * keys.length) {
      grow();
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

  void remove(long key) {
    for (int i = slot(key); ; i = (i + 1) & mask) {
      long k = keys[i];
      if (k == EMPTY) {
        return;
      }
      if (k == key) {
        deleteAt(i);
        size--;
        return;
      }
    }
  }

  private void deleteAt(int hole) {
    int i = hole;
    while (true) {
      i = (i + 1) & mask;
      long k = keys[i];
      if (k == EMPTY) {
        keys[hole] = EMPTY;
        return;
      }
      int home = slot(k);
      boolean movable = hole <= i ? (home <= hole || home > i) : (home <= hole && home > i);
      if (movable) {
        keys[hole] = k;
        values[hole] = values[i];
        hole = i;
      }
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

  private void grow() {
    long[] oldKeys = keys;
    int[] oldValues = values;
    allocate(keys.length * 2);
    size = 0;
    for (int i = 0; i < oldKeys.length; i++) {
      if (oldKeys[i] != EMPTY) {
        put(oldKeys[i], oldValues[i]);
      }
    }
  }
}
