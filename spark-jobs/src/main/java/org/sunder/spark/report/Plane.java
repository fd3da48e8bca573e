package org.sunder.spark.report;

import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BoxReads;

/**
 * One axis-aligned plane of a 3D volume, cut to a window: {@code axis} is the memory axis held
 * constant, the picture's columns run along the lower remaining memory axis and its rows along
 * the higher one. Reads whole chunks around the window (the store's interval read).
 *
 * @param axis memory axis normal to the plane
 * @param min the window's first voxel (memory order; {@code min[axis]} is the plane)
 * @param max the window's last voxel (inclusive; {@code max[axis] == min[axis]})
 */
record Plane(int axis, long[] min, long[] max) {
  Plane {
    min = min.clone();
    max = max.clone();
    if (min.length != 3 || max.length != 3 || min[axis] != max[axis]) {
      throw new IllegalArgumentException("a plane needs 3D bounds equal along axis " + axis
          + ": " + Arrays.toString(min) + " .. " + Arrays.toString(max));
    }
  }

  /** The plane at {@code position} along {@code axis}, centred on {@code centre}, at most {@code side} wide. */
  static Plane centred(long[] shape, int axis, long position, long[] centre, int side) {
    long[] min = new long[3];
    long[] max = new long[3];
    for (int d = 0; d < 3; d++) {
      if (d == axis) {
        min[d] = max[d] = position;
      } else {
        long width = Math.min(shape[d], side);
        min[d] = Math.max(0, Math.min(shape[d] - width, centre[d] - width / 2));
        max[d] = min[d] + width - 1;
      }
    }
    return new Plane(axis, min, max);
  }

  /** The memory axis along the picture's columns. */
  int columnAxis() {
    return axis == 0 ? 1 : 0;
  }

  /** The memory axis along the picture's rows. */
  int rowAxis() {
    return axis == 2 ? 1 : 2;
  }

  int width() {
    return (int) (max[columnAxis()] - min[columnAxis()] + 1);
  }

  int height() {
    return (int) (max[rowAxis()] - min[rowAxis()] + 1);
  }

  /**
   * Voxel {@code (column, row)} of the picture as an index into a box read over this plane (the
   * box's memory layout, dimension 0 fastest).
   */
  int index(int column, int row) {
    int w0 = (int) (max[0] - min[0] + 1);
    int w1 = (int) (max[1] - min[1] + 1);
    return switch (axis) {
      case 0 -> column + row * w1;       // box (1, w1, w2): index = y + z * w1
      case 1 -> column + row * w0;       // box (w0, 1, w2): index = x + z * w0
      default -> column + row * w0;      // box (w0, w1, 1): index = x + y * w0
    };
  }

  private int[] boxShape() {
    int[] shape = new int[3];
    for (int d = 0; d < 3; d++) {
      shape[d] = (int) (max[d] - min[d] + 1);
    }
    return shape;
  }

  /** The labels of {@code dataset} over this plane, in box order. */
  long[] labels(String container, String dataset) {
    return labelsOfBox(container, dataset, min, max);
  }

  /** The labels of {@code dataset} in the box {@code [min, max]} (inclusive), dimension 0 fastest. */
  static long[] labelsOfBox(String container, String dataset, long[] min, long[] max) {
    return BoxReads.labels(container, dataset, min, max);
  }

  /** Throws the report's typed error unless the volume is 3D. */
  static void requireThreeDimensions(long[] shape) {
    if (shape.length != 3) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "the run report draws 3D volumes; this"
          + " one has " + shape.length + " dimensions " + Arrays.toString(shape));
    }
  }

  /** The boundary map of the run's affinities over this plane, in box order (see {@link BoxReads}). */
  float[] boundary(StitchingSetup setup) {
    return BoxReads.boundaryMap(setup, min, max);
  }
}
