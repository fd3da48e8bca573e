package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * A bucket queue for priorities with few distinct values (8-bit affinities give at most 256):
 * one first-in-first-out list per level, linked through the voxel indices, so each voxel may be
 * queued at most once. {@code O(1)} push, pop amortised over the levels; the same order as
 * {@link VoxelQueue} on the same priorities.
 */
public final class LevelQueue implements FloodQueue {
  private final int[] levelOf;
  private final int[] head;
  private final int[] tail;
  private final int[] next;
  private int lowest;
  private int size;

  private LevelQueue(int[] levelOf, int levels) {
    this.levelOf = levelOf;
    head = new int[levels];
    tail = new int[levels];
    Arrays.fill(head, -1);
    next = new int[levelOf.length];
    lowest = levels;
  }

  /**
   * A queue for {@code priority}, or null when it has more than {@code maxLevels} distinct
   * values or a negative one (then a {@link VoxelQueue} serves).
   */
  public static LevelQueue forPriorities(float[] priority, int maxLevels) {
    IntIntHashMap rank = new IntIntHashMap(2 * maxLevels);
    for (float p : priority) {
      int bits = Float.floatToIntBits(p + 0f);
      if (bits < 0) {
        return null;
      }
      if (rank.get(bits, -1) < 0) {
        if (rank.size() == maxLevels) {
          return null;
        }
        rank.put(bits, 0);
      }
    }
    int[] distinct = new int[rank.size()];
    int k = 0;
    for (int slot = 0; slot < rank.capacity(); slot++) {
      if (rank.keyAt(slot) >= 0) {
        distinct[k++] = rank.keyAt(slot);
      }
    }
    Arrays.sort(distinct);
    for (int r = 0; r < distinct.length; r++) {
      rank.put(distinct[r], r);
    }
    int[] levelOf = new int[priority.length];
    for (int i = 0; i < priority.length; i++) {
      levelOf[i] = rank.get(Float.floatToIntBits(priority[i] + 0f), -1);
    }
    return new LevelQueue(levelOf, distinct.length);
  }

  /** The level of {@code voxel}: the rank of its priority among the distinct ones. */
  public int level(int voxel) {
    return levelOf[voxel];
  }

  @Override
  public void push(int voxel) {
    push(voxel, levelOf[voxel]);
  }

  @Override
  public void push(int voxel, int level) {
    next[voxel] = -1;
    if (head[level] < 0) {
      head[level] = voxel;
    } else {
      next[tail[level]] = voxel;
    }
    tail[level] = voxel;
    if (level < lowest) {
      lowest = level;
    }
    size++;
  }

  @Override
  public int pop() {
    while (head[lowest] < 0) {
      lowest++;
    }
    int voxel = head[lowest];
    head[lowest] = next[voxel];
    size--;
    return voxel;
  }

  @Override
  public boolean isEmpty() {
    return size == 0;
  }
}
