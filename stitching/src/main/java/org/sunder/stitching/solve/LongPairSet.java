package org.sunder.stitching.solve;

/**
 * A set of ordered pairs of longs, open addressing with linear probing; O(1) expected per
 * operation, 17 bytes per slot, grows at half load. Not thread-safe.
 */
final class LongPairSet {
  private long[] first;
  private long[] second;
  private boolean[] used;
  private int size;
  private int mask;

  LongPairSet(int expected) {
    int capacity = Integer.highestOneBit(Math.max(16, expected * 2 - 1)) << 1;
    allocate(capacity);
  }

  private void allocate(int capacity) {
    first = new long[capacity];
    second = new long[capacity];
    used = new boolean[capacity];
    mask = capacity - 1;
  }

  private static int hash(long a, long b) {
    long h = a * 0x9E3779B97F4A7C15L + b * 0xC2B2AE3D27D4EB4FL;
    return (int) (h ^ (h >>> 29) ^ (h >>> 47));
  }

  boolean contains(long a, long b) {
    for (int i = hash(a, b) & mask; used[i]; i = (i + 1) & mask) {
      if (first[i] == a && second[i] == b) {
        return true;
      }
    }
    return false;
  }

  /** Adds the pair; true if it was not there. */
  boolean add(long a, long b) {
    int i = hash(a, b) & mask;
    for (; used[i]; i = (i + 1) & mask) {
      if (first[i] == a && second[i] == b) {
        return false;
      }
    }
    used[i] = true;
    first[i] = a;
    second[i] = b;
    if (++size * 2 > used.length) {
      grow();
    }
    return true;
  }

  private void grow() {
    long[] f = first;
    long[] s = second;
    boolean[] u = used;
    allocate(used.length * 2);
    for (int i = 0; i < u.length; i++) {
      if (u[i]) {
        int j = hash(f[i], s[i]) & mask;
        while (used[j]) {
          j = (j + 1) & mask;
        }
        used[j] = true;
        first[j] = f[i];
        second[j] = s[i];
      }
    }
  }
}
