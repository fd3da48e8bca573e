package org.sunder.blockwise.collections;

import java.util.Arrays;

/** A growable list of ints on a primitive array. */
public final class IntList {
  private int[] items;
  private int size;

  public IntList(int capacity) {
    items = new int[Math.max(4, capacity)];
  }

  public void add(int value) {
    if (size == items.length) {
      items = Arrays.copyOf(items, size * 2);
    }
    items[size++] = value;
  }

  public int get(int index) {
    return items[index];
  }

  public int size() {
    return size;
  }

  public void truncate(int newSize) {
    size = newSize;
  }

  public void clear() {
    size = 0;
  }
}
