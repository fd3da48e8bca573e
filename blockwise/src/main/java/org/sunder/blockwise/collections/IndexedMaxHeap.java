package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * Max-heap of items {@code 0..capacity-1}, each present at most once with a (key, tie): largest
 * key first, among equal keys the smallest tie (the order of {@link MaxHeap}). An item's entry
 * is changed or removed where it sits, so the heap holds no stale entries: where a lazy heap
 * would pop many superseded copies (greedy contraction re-keys the edges around every
 * contraction), this one pops each live item once. Four children per entry. Entries of equal
 * key and tie come out in no particular order.
 */
public final class IndexedMaxHeap {
  private final double[] keys;
  private final long[] ties;
  private final int[] items;
  /** Per item, its index in the heap, or −1. */
  private final int[] position;
  private int size;

  public IndexedMaxHeap(int capacity) {
    keys = new double[capacity];
    ties = new long[capacity];
    items = new int[capacity];
    position = new int[capacity];
    Arrays.fill(position, -1);
  }

  public boolean isEmpty() {
    return size == 0;
  }

  public int size() {
    return size;
  }

  public boolean contains(int item) {
    return position[item] >= 0;
  }

  /** The item with the largest key (smallest tie among equals); the heap must not be empty. */
  public int top() {
    return items[0];
  }

  /** Removes and returns {@link #top()}. */
  public int pop() {
    int item = top();
    remove(item);
    return item;
  }

  /** Inserts {@code item} with (key, tie), or changes its entry if present. */
  public void set(int item, double key, long tie) {
    int i = position[item];
    if (i < 0) {
      i = size++;
      siftUp(i, key, tie, item);
      return;
    }
    if (MaxHeap.before(key, tie, keys[i], ties[i])) {
      siftUp(i, key, tie, item);
    } else {
      siftDown(i, key, tie, item);
    }
  }

  /** Removes {@code item} if present. */
  public void remove(int item) {
    int i = position[item];
    if (i < 0) {
      return;
    }
    position[item] = -1;
    int last = --size;
    if (i == last) {
      return;
    }
    double key = keys[last];
    long tie = ties[last];
    int moved = items[last];
    if (i > 0 && MaxHeap.before(key, tie, keys[(i - 1) >>> 2], ties[(i - 1) >>> 2])) {
      siftUp(i, key, tie, moved);
    } else {
      siftDown(i, key, tie, moved);
    }
  }

  private void siftUp(int i, double key, long tie, int item) {
    while (i > 0) {
      int parent = (i - 1) >>> 2;
      if (!MaxHeap.before(key, tie, keys[parent], ties[parent])) {
        break;
      }
      move(parent, i);
      i = parent;
    }
    place(i, key, tie, item);
  }

  private void siftDown(int i, double key, long tie, int item) {
    while (true) {
      int child = MaxHeap.firstChild(keys, ties, i, size);
      if (child < 0 || !MaxHeap.before(keys[child], ties[child], key, tie)) {
        break;
      }
      move(child, i);
      i = child;
    }
    place(i, key, tie, item);
  }

  private void move(int from, int to) {
    keys[to] = keys[from];
    ties[to] = ties[from];
    items[to] = items[from];
    position[items[to]] = to;
  }

  private void place(int i, double key, long tie, int item) {
    keys[i] = key;
    ties[i] = tie;
    items[i] = item;
    position[item] = i;
  }
}
