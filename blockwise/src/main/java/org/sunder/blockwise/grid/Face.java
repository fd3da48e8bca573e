package org.sunder.blockwise.grid;

import java.io.Serializable;
import java.util.Arrays;

/**
 * The plane between the cores of two blocks adjacent along {@code axis}: {@code lowerBlock}'s
 * core ends at {@code position - 1} along the axis and {@code upperBlock}'s starts at
 * {@code position}. {@code lateralMin}/{@code lateralMax} give the extent the two cores share
 * (global voxel coordinates, memory order, inclusive; along {@code axis} both equal
 * {@code position}).
 *
 * <p>An immutable value: the accessors return copies, equality compares contents.
 */
public record Face(int index, int lowerBlock, int upperBlock, int axis, long position,
    long[] lateralMin, long[] lateralMax) implements Serializable {

  public Face {
    lateralMin = lateralMin.clone();
    lateralMax = lateralMax.clone();
  }

  @Override
  public long[] lateralMin() {
    return lateralMin.clone();
  }

  @Override
  public long[] lateralMax() {
    return lateralMax.clone();
  }

  /** The number of voxels on one side of the face (its area in voxels). */
  public long area() {
    long area = 1;
    for (int d = 0; d < lateralMin.length; d++) {
      if (d != axis) {
        area *= lateralMax[d] - lateralMin[d] + 1;
      }
    }
    return area;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof Face f && index == f.index && lowerBlock == f.lowerBlock
        && upperBlock == f.upperBlock && axis == f.axis && position == f.position
        && Arrays.equals(lateralMin, f.lateralMin) && Arrays.equals(lateralMax, f.lateralMax);
  }

  @Override
  public int hashCode() {
    return ((31 * index + lowerBlock) * 31 + upperBlock) * 31 + axis;
  }

  @Override
  public String toString() {
    return "Face[" + index + ": blocks " + lowerBlock + "|" + upperBlock + " on axis " + axis
        + " at " + position + ", " + Arrays.toString(lateralMin) + ".."
        + Arrays.toString(lateralMax) + "]";
  }
}
