package org.sunder.blockwise.synth;

import java.util.Arrays;

/**
 * A binary min-heap of (float key, voxel index) pairs on primitive arrays; equal keys pop in
 * ascending index order. Duplicates allowed (callers skip stale entries). {@code O(log n)} per
 * operation.
 */
final class VoxelHeap {
  private float[] keys;
  private int[] items;
  private int size;

  VoxelHeap(int capacity) {
    keys = new float[Math.max(capacity, 4)];
    items = new int[keys.length];
  }

  boolean isEmpty() {
    return size == 0;
  }

  float topKey() {
    return keys[0];
  }

  void push(float key, int item) {
    if (size == keys.length) {
      keys = Arrays.copyOf(keys, size * 2);
      items = Arrays.copyOf(items, size * 2);
    }
    int i = size++;
    while (i > 0) {
      int parent = (i - 1) >>> 1;
      if (!less(key, item, keys[parent], items[parent])) {
        break;
      }
      keys[i] = keys[parent];
      items[i] = items[parent];
      i = parent;
    }
    keys[i] = key;
    items[i] = item;
  }

  int pop() {
    int top = items[0];
    size--;
    float key = keys[size];
    int item = items[size];
    int i = 0;
    while (true) {
      int child = 2 * i + 1;
      if (child >= size) {
        break;
      }
      if (child + 1 < size && less(keys[child + 1], items[child + 1], keys[child], items[child])) {
        child++;
      }
      if (!less(keys[child], items[child], key, item)) {
        break;
      }
      keys[i] = keys[child];
      items[i] = items[child];
      i = child;
    }
    keys[i] = key;
    items[i] = item;
    return top;
  }

  private static boolean less(float ka, int ia, float kb, int ib) {
    return ka < kb || (ka == kb && ia < ib);
  }
}
