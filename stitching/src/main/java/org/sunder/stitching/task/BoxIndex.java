package org.sunder.stitching.task;

import org.sunder.blockwise.grid.Shapes;

/** Index arithmetic between a box and a sub-box of it (memory order, dimension 0 fastest). */
public final class BoxIndex {
  private BoxIndex() {}

  /**
   * For every voxel of the sub-box ({@code subShape} starting at {@code origin} inside a box of
   * {@code outerShape}), in the sub-box's order, its index in the outer box. Allocates
   * {@code Shapes.intElementCount(subShape)} ints; O(that).
   */
  public static int[] subBoxIndices(int[] outerShape, int[] origin, int[] subShape) {
    int n = outerShape.length;
    int[] indices = new int[Shapes.intElementCount(subShape)];
    int[] stride = new int[n];
    int step = 1;
    for (int d = 0; d < n; d++) {
      stride[d] = step;
      step *= outerShape[d];
    }
    int[] position = new int[n];
    int rows = indices.length / subShape[0];
    int next = 0;
    for (int r = 0; r < rows; r++) {
      int start = 0;
      for (int d = 0; d < n; d++) {
        start += (origin[d] + position[d]) * stride[d];
      }
      for (int x = 0; x < subShape[0]; x++) {
        indices[next++] = start + x;
      }
      for (int d = 1; d < n; d++) {
        if (++position[d] < subShape[d]) {
          break;
        }
        position[d] = 0;
      }
    }
    return indices;
  }

  public static int[] shape(long[] min, long[] max) {
    int[] shape = new int[min.length];
    for (int d = 0; d < min.length; d++) {
      shape[d] = Math.toIntExact(max[d] - min[d] + 1);
    }
    return shape;
  }

  public static int[] origin(long[] outerMin, long[] innerMin) {
    int[] origin = new int[outerMin.length];
    for (int d = 0; d < outerMin.length; d++) {
      origin[d] = Math.toIntExact(innerMin[d] - outerMin[d]);
    }
    return origin;
  }
}
