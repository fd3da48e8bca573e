package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * A bucket queue for priorities with few distinct values (8-bit affinities give at most 256):
 * one first-in-first-out list per level, so each voxel leaves in the same order as from
 * {@link VoxelQueue} on the same priorities. A level's list is a chain of segments of
 * {@value #SEGMENT} voxels in one pool, written and read in sequence: a push writes next to the
 * level's previous push, where a list linked through the voxel indices would write beside a
 * voxel anywhere in the box (a cache miss per push on a large box). Consumed segments are
 * reused. {@code O(1)} push, pop amortised over the levels.
 */
public final class LevelQueue implements FloodQueue {
  private static final int SEGMENT = 256;
  private final int[] levelOf;
  /**
   * Per level: the segment read next and the position in it, the segment written last and the
   * position in it. {@code readSegment} is -1 while the level is empty.
   */
  private final int[] readSegment;
  private final int[] readAt;
  private final int[] writeSegment;
  private final int[] writeAt;
  /**
   * Segment {@code s} is {@code pool[s * SEGMENT ..]}; {@code nextSegment[s]} follows it in its
   * level's chain, or in the list of free segments that starts at {@code free}.
   */
  private int[] pool = new int[0];
  private int[] nextSegment = new int[0];
  private int segments;
  private int free = -1;
  private int lowest;
  private int size;

  private LevelQueue(int[] levelOf, int levels) {
    this.levelOf = levelOf;
    readSegment = new int[levels];
    readAt = new int[levels];
    writeSegment = new int[levels];
    writeAt = new int[levels];
    Arrays.fill(readSegment, -1);
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

  @Override
  public void push(int voxel) {
    int level = levelOf[voxel];
    if (readSegment[level] < 0) {
      int fresh = takeSegment();
      readSegment[level] = fresh;
      readAt[level] = 0;
      writeSegment[level] = fresh;
      writeAt[level] = 0;
    } else if (writeAt[level] == SEGMENT) {
      int fresh = takeSegment();
      nextSegment[writeSegment[level]] = fresh;
      writeSegment[level] = fresh;
      writeAt[level] = 0;
    }
    pool[writeSegment[level] * SEGMENT + writeAt[level]++] = voxel;
    if (level < lowest) {
      lowest = level;
    }
    size++;
  }

  @Override
  public int pop() {
    while (readSegment[lowest] < 0) {
      lowest++;
    }
    int level = lowest;
    int segment = readSegment[level];
    int voxel = pool[segment * SEGMENT + readAt[level]++];
    if (segment == writeSegment[level] && readAt[level] == writeAt[level]) {
      readSegment[level] = -1;
      releaseSegment(segment);
    } else if (readAt[level] == SEGMENT) {
      readSegment[level] = nextSegment[segment];
      readAt[level] = 0;
      releaseSegment(segment);
    }
    size--;
    return voxel;
  }

  private int takeSegment() {
    if (free >= 0) {
      int segment = free;
      free = nextSegment[segment];
      return segment;
    }
    if (segments == nextSegment.length) {
      int capacity = Math.max(16, 2 * segments);
      nextSegment = Arrays.copyOf(nextSegment, capacity);
      pool = Arrays.copyOf(pool, capacity * SEGMENT);
    }
    return segments++;
  }

  private void releaseSegment(int segment) {
    nextSegment[segment] = free;
    free = segment;
  }

  @Override
  public boolean isEmpty() {
    return size == 0;
  }
}
