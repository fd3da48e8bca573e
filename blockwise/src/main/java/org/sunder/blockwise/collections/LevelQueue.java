package org.sunder.blockwise.collections;

import java.util.Arrays;

/**
 * A bucket queue for priorities with few distinct values (8-bit affinities give at most 256):
 * one first-in-first-out array per level, read and written in sequence, and a bit per level
 * that says whether it holds any. {@code O(1)} push (amortised); a pop skips empty levels 64 at
 * a time. The same order as {@link VoxelQueue} on the same priorities.
 *
 * <p>Arrays, not a list linked through the voxel indices: a flood pops each level's voxels
 * from all over its box, and a linked list made every pop wait for the previous voxel's link to
 * arrive from memory before it could ask for the next.
 */
public final class LevelQueue implements FloodQueue {
  private static final int FIRST_CAPACITY = 16;
  private final int[] levelOf;
  /** Per level, its voxels; those at {@code first[level] .. end[level] − 1} wait. */
  private final int[][] voxels;
  private final int[] first;
  private final int[] end;
  /** Bit {@code level} set while the level has waiting voxels. */
  private final long[] occupied;
  private int lowest;
  private int size;

  private LevelQueue(int[] levelOf, int levels) {
    this.levelOf = levelOf;
    voxels = new int[levels][];
    first = new int[levels];
    end = new int[levels];
    occupied = new long[(levels + 63) / 64];
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
    int[] waiting = voxels[level];
    if (waiting == null) {
      waiting = voxels[level] = new int[FIRST_CAPACITY];
    } else if (end[level] == waiting.length) {
      waiting = voxels[level] = makeRoom(waiting, level);
    }
    waiting[end[level]++] = voxel;
    occupied[level >>> 6] |= 1L << level;
    if (level < lowest) {
      lowest = level;
    }
    size++;
  }

  /**
   * A full level's array with room at its end, its waiting voxels moved to its start: the same
   * array when they fill less than half of it, else one twice as long (amortised O(1) a push,
   * at most twice the most voxels the level held at once).
   */
  private int[] makeRoom(int[] waiting, int level) {
    int waitingCount = end[level] - first[level];
    int[] room = waitingCount < waiting.length / 2 ? waiting : new int[2 * waiting.length];
    System.arraycopy(waiting, first[level], room, 0, waitingCount);
    first[level] = 0;
    end[level] = waitingCount;
    return room;
  }

  @Override
  public int pop() {
    int level = lowest;
    if (first[level] == end[level]) {
      level = lowest = nextOccupied(level);
    }
    int voxel = voxels[level][first[level]++];
    if (first[level] == end[level]) {
      first[level] = 0;
      end[level] = 0;
      occupied[level >>> 6] &= ~(1L << level);
    }
    size--;
    return voxel;
  }

  /** The lowest level at or above {@code level} with waiting voxels (one must have some). */
  private int nextOccupied(int level) {
    int word = level >>> 6;
    long bits = occupied[word] & (-1L << level);
    while (bits == 0) {
      bits = occupied[++word];
    }
    return (word << 6) + Long.numberOfTrailingZeros(bits);
  }

  @Override
  public boolean isEmpty() {
    return size == 0;
  }
}
