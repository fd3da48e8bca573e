package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;

/** Index arithmetic of a box of voxels in memory order (dimension 0 fastest). */
public final class VoxelBox {
  private VoxelBox() {}

  public static int size(int[] shape) {
    long n = 1;
    for (int s : shape) {
      if (s <= 0) {
        throw new IllegalArgumentException("shape " + Arrays.toString(shape) + " has an empty axis");
      }
      n *= s;
    }
    if (n > Integer.MAX_VALUE - 8) {
      throw new IllegalArgumentException("box " + Arrays.toString(shape)
          + " has more voxels than one array can hold");
    }
    return (int) n;
  }

  public static int[] strides(int[] shape) {
    int[] strides = new int[shape.length];
    int stride = 1;
    for (int d = 0; d < shape.length; d++) {
      strides[d] = stride;
      stride *= shape[d];
    }
    return strides;
  }

  static int nonZeroAxis(int[] offset) {
    for (int d = 0; d < offset.length; d++) {
      if (offset[d] != 0) {
        return d;
      }
    }
    throw new IllegalArgumentException("zero offset " + Arrays.toString(offset));
  }

  /**
   * Steps {@code coordinate}, the first voxel of a row along dimension 0, to the first voxel
   * of the next row.
   */
  public static void advanceRow(int[] coordinate, int[] shape) {
    for (int d = 1; d < shape.length; d++) {
      if (++coordinate[d] < shape[d]) {
        return;
      }
      coordinate[d] = 0;
    }
  }

  /** Steps {@code coordinate} to the next voxel in memory order. */
  public static void advance(int[] coordinate, int[] shape) {
    for (int d = 0; d < shape.length; d++) {
      if (++coordinate[d] < shape[d]) {
        return;
      }
      coordinate[d] = 0;
    }
  }
}
