package org.sunder.blockwise.collections;

/**
 * The queue of a priority flood: voxels leave by ascending priority, equal priorities in the
 * order they came in (first in, first out). Each voxel enters at most once.
 */
public interface FloodQueue {
  void push(int voxel);

  /** Removes and returns the voxel of least (priority, insertion order). */
  int pop();

  boolean isEmpty();
}
