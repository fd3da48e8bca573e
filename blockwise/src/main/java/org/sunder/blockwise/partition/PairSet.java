package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * An open-addressing hash set of non-negative {@code long}s (linear probing, backward-shift
 * deletion, doubling at 1/2 load); expected {@code O(1)} per operation. Not thread-safe.
 */
final class PairSet {
  private static final long EMPTY = -1;
  private long[] keys;
  private int size;
  private int mask;

  PairSet(int expected) {
    int capacity = Integer.highestOneBit(Math.max(8, expected) * 2 - 1) << 1;
    keys = new long[capacity];
    Arrays.fill(keys, EMPTY);
    mask = capacity - 1;
  }

  /** Packs an unordered pair of non-negative ints. */
  static long pair(int a, int b) {
    return a < b ? ((long) a << 32) | b : ((long) b << 32) | a;
  }

  int size() {
    return size;
  }

  boolean contains(long key) {
    for (int i = slot(key); ; i = (i + 1) & mask) {
      long k = keys[i];
      if (k == key) {
        return true;
      }
      if (k == EMPTY) {
        return false;
      }
    }
  }

  /** Adds {@code key}; false when it was present. */
  boolean add(long key) {
    if (2 * (size + 1) > keys.length) {
      grow();
    }
    for (int i = slot(key); ; i = (i + 1) & mask) {
      long k = keys[i];
      if (k == key) {
        return false;
      }
      if (k == EMPTY) {
        keys[i] = key;
        size++;
        return true;
      }
    }
  }

  /** Removes {@code key}; false when it was absent. */
  boolean remove(long key) {
    for (int i = slot(key); ; i = (i + 1) & mask) {
      long k = keys[i];
      if (k == EMPTY) {
        return false;
      }
      if (k == key) {
        deleteAt(i);
        size--;
        return true;
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
        hole = i;
      }
    }
  }

  private int slot(long key) {
    long h = key * 0x9E3779B97F4A7C15L;
    return (int) (h ^ (h >>> 32)) & mask;
  }

  private void grow() {
    long[] old = keys;
    keys = new long[old.length * 2];
    Arrays.fill(keys, EMPTY);
    mask = keys.length - 1;
    size = 0;
    for (long k : old) {
      if (k != EMPTY) {
        add(k);
      }
    }
  }
}
