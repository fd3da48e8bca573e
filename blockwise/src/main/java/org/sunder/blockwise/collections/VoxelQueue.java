package org.sunder.blockwise.collections;

import java.util.Arrays;
import org.sunder.blockwise.partition.fragments.SeededWatershed;

/**
 * The one binary min-heap of voxels of the project, on primitive arrays: entries are (64-bit
 * key, voxel) and leave by ascending key. A key packs a {@code float} priority (no NaN; −0 and 0
 * equal) above a 32-bit tie-breaker, so {@link #push(float, int)} pops equal priorities in
 * ascending voxel index and {@link #inArrivalOrder} in the order they came in. Duplicates are
 * allowed (callers skip stale entries). Grows by doubling; {@code O(log size)} per push and pop.
 * Not thread-safe.
 */
public final class VoxelQueue {
  private long[] keys;
  private int[] voxels;
  private int size;

  /** An empty queue with room for {@code capacity} entries before it grows. */
  public VoxelQueue(int capacity) {
    keys = new long[Math.max(16, capacity)];
    voxels = new int[keys.length];
  }

  /**
   * A flood queue ordered by {@code priority[voxel]} (no NaN; the array is wrapped, not copied),
   * equal priorities first in, first out.
   */
  public static FloodQueue inArrivalOrder(float[] priority, int capacity) {
    return new ArrivalOrder(priority, new VoxelQueue(capacity));
  }

  public boolean isEmpty() {
    return size == 0;
  }

  /** Queues {@code voxel} at {@code priority}; equal priorities leave by ascending voxel index. */
  public void push(float priority, int voxel) {
    pushKey(key(priority, voxel), voxel);
  }

  /** The priority of the voxel {@link #pop} returns next; the queue must not be empty. */
  public float topPriority() {
    return priority(keys[0]);
  }

  /** Removes and returns the voxel of least key; the queue must not be empty. */
  public int pop() {
    int top = voxels[0];
    size--;
    if (size > 0) {
      siftDown(keys[size], voxels[size]);
    }
    return top;
  }

  private void pushKey(long key, int voxel) {
    if (size == keys.length) {
      keys = Arrays.copyOf(keys, size * 2);
      voxels = Arrays.copyOf(voxels, size * 2);
    }
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

  /** The key of {@code priority} with tie-breaker {@code tie} (compared as unsigned). */
  static long key(float priority, int tie) {
    return ((long) sortable(priority) << 32) | (tie & 0xffffffffL);
  }

  /** The priority a key was made from (−0 comes back as 0). */
  static float priority(long key) {
    int bits = (int) (key >> 32);
    return Float.intBitsToFloat(bits ^ ((bits >> 31) & 0x7fffffff));
  }

  /** An int whose signed order is the order of the floats (−0 and 0 equal). */
  private static int sortable(float value) {
    int bits = Float.floatToIntBits(value + 0f);
    return bits ^ ((bits >> 31) & 0x7fffffff);
  }

  /** Ties broken by an arrival counter: the flood order of {@link SeededWatershed}. */
  private static final class ArrivalOrder implements FloodQueue {
    private final float[] priority;
    private final VoxelQueue heap;
    private int age;

    ArrivalOrder(float[] priority, VoxelQueue heap) {
      this.priority = priority;
      this.heap = heap;
    }

    @Override
    public void push(int voxel) {
      heap.pushKey(key(priority[voxel], age++), voxel);
    }

    @Override
    public int pop() {
      return heap.pop();
    }

    @Override
    public boolean isEmpty() {
      return heap.isEmpty();
    }
  }
}
