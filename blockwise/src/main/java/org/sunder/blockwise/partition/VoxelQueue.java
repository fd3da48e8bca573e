package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * Binary min-heap of voxels keyed by (priority, insertion order): equal priorities leave in the
 * order they came in. Primitive arrays only; grows by doubling. {@code O(log size)} per
 * operation.
 */
final class VoxelQueue implements FloodQueue {
  private final float[] priority;
  private long[] keys;
  private int[] voxels;
  private int size;
  private int age;

  /** A queue ordered by {@code priority[voxel]} (no NaN). */
  VoxelQueue(float[] priority, int capacity) {
    this.priority = priority;
    keys = new long[Math.max(16, capacity)];
    voxels = new int[keys.length];
  }

  @Override
  public boolean isEmpty() {
    return size == 0;
  }

  @Override
  public void push(int voxel) {
    if (size == keys.length) {
      keys = Arrays.copyOf(keys, size * 2);
      voxels = Arrays.copyOf(voxels, size * 2);
    }
    long key = ((long) sortable(priority[voxel]) << 32) | (age++ & 0xffffffffL);
    int i = size++;
    while (i > 0) {
      int parent = (i - 1) >>> 1;
      if (keys[parent] <= key) {
        break;
      }
      keys[i] = keys[parent];
      voxels[i] = voxels[parent];
      i = parent;
    }
    keys[i] = key;
    voxels[i] = voxel;
  }

  @Override
  public int pop() {
    int top = voxels[0];
    size--;
    if (size > 0) {
      siftDown(keys[size], voxels[size]);
    }
    return top;
  }

  private void siftDown(long key, int voxel) {
    int i = 0;
    int half = size >>> 1;
    while (i < half) {
      int child = 2 * i + 1;
      int right = child + 1;
      if (right < size && keys[right] < keys[child]) {
        child = right;
      }
      if (key <= keys[child]) {
        break;
      }
      keys[i] = keys[child];
      voxels[i] = voxels[child];
      i = child;
    }
    keys[i] = key;
    voxels[i] = voxel;
  }

  /** An int whose signed order is the order of the floats (−0 and 0 equal). */
  private static int sortable(float value) {
    int bits = Float.floatToIntBits(value + 0f);
    return bits ^ ((bits >> 31) & 0x7fffffff);
  }
}
