package org.sunder.blockwise.graph;

import java.util.Arrays;

/**
 * An open-addressing hash map from an ordered pair of {@code long}s to a non-negative
 * {@code int}, on primitive arrays (linear probing, backward-shift deletion, doubling at 1/2
 * load). Expected {@code O(1)} per operation. Not thread-safe.
 */
public final class PairIndex {
  private long[] first;
  private long[] second;
  private int[] values;
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
    for (int i = slot(a, b); ; i = (i + 1) & mask) {
      int value = values[i];
      if (value < 0) {
        return -1;
      }
      if (first[i] == a && second[i] == b) {
        return value;
      }
    }
  }

  /** Sets the value of {@code (a, b)} (non-negative); returns the previous value or -1. */
  public int put(long a, long b, int value) {
    if (value < 0) {
      throw new IllegalArgumentException("value " + value + " is negative");
    }
    if (2 * (size + 1) > values.length) {
      grow();
    }
    for (int i = slot(a, b); ; i = (i + 1) & mask) {
      int old = values[i];
      if (old < 0) {
        first[i] = a;
        second[i] = b;
        values[i] = value;
        size++;
        return -1;
      }
      if (first[i] == a && second[i] == b) {
        values[i] = value;
        return old;
      }
    }
  }

  /** Removes {@code (a, b)}; returns its value or -1 when absent. */
  public int remove(long a, long b) {
    int i = slot(a, b);
    while (true) {
      int value = values[i];
      if (value < 0) {
        return -1;
      }
      if (first[i] == a && second[i] == b) {
        deleteAt(i);
        size--;
        return value;
      }
      i = (i + 1) & mask;
    }
  }

  private void deleteAt(int hole) {
    int i = hole;
    while (true) {
      i = (i + 1) & mask;
      if (values[i] < 0) {
        values[hole] = -1;
        return;
      }
      int home = slot(first[i], second[i]);
      boolean movable = hole <= i ? (home <= hole || home > i) : (home <= hole && home > i);
      if (movable) {
        first[hole] = first[i];
        second[hole] = second[i];
        values[hole] = values[i];
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
    first = new long[capacity];
    second = new long[capacity];
    values = new int[capacity];
    Arrays.fill(values, -1);
    mask = capacity - 1;
  }

  private void grow() {
    long[] oldFirst = first;
    long[] oldSecond = second;
    int[] oldValues = values;
    allocate(values.length * 2);
    size = 0;
    for (int i = 0; i < oldValues.length; i++) {
      if (oldValues[i] >= 0) {
        put(oldFirst[i], oldSecond[i], oldValues[i]);
      }
    }
  }
}
