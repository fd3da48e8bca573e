package org.sunder.blockwise.collections;

/**
 * The queue of a priority flood: voxels leave by ascending priority, equal priorities in the
 * order they came in (first in, first out). Each voxel enters at most once.
 */
public interface FloodQueue {
  void push(int voxel);

  /**
   * As {@link #push(int)}, with the voxel's level as {@link LevelQueue#level} gave it before
   * (ignored by queues without levels): spares the queue a look-up of its own.
   */
  default void push(int voxel, int level) {
    push(voxel);
  }

  /** Removes and returns the voxel of least (priority, insertion order). */
  int pop();

  boolean isEmpty();
}
