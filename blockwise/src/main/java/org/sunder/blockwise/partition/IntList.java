package org.sunder.blockwise.partition;

import java.util.Arrays;

/** A growable list of ints on a primitive array. */
final class IntList {
  private int[] items;
  private int size;

  IntList(int capacity) {
    items = new int[Math.max(4, capacity)];
  }

  void add(int value) {
    if (size == items.length) {
      items = Arrays.copyOf(items, size * 2);
    }
    items[size++] = value;
  }

  int get(int index) {
    return items[index];
  }

  int size() {
    return size;
  }

  void truncate(int newSize) {
    size = newSize;
  }

  void clear() {
    size = 0;
  }
}
