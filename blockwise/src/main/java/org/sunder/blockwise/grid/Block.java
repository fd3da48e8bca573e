package org.sunder.blockwise.grid;

import java.io.Serializable;
import java.util.Arrays;
import net.imglib2.FinalInterval;
import net.imglib2.Interval;

/**
 * One block of a {@link BlockGrid}: its index, its position in the block grid, its core (whole
 * chunks, cut off at the volume's far border) and its extended box (core plus halo, clipped to
 * the volume). All coordinates are global voxel coordinates in memory order; maxima are
 * inclusive, as in imglib2's {@link Interval}.
 *
 * <p>An immutable value: the accessors return copies, equality compares contents.
 */
public record Block(int index, long[] gridPosition, long[] coreMin, long[] coreMax,
    long[] extendedMin, long[] extendedMax) implements Serializable {

  public Block {
    gridPosition = gridPosition.clone();
    coreMin = coreMin.clone();
    coreMax = coreMax.clone();
    extendedMin = extendedMin.clone();
    extendedMax = extendedMax.clone();
  }

  @Override
  public long[] gridPosition() {
    return gridPosition.clone();
  }

  @Override
  public long[] coreMin() {
    return coreMin.clone();
  }

  @Override
  public long[] coreMax() {
    return coreMax.clone();
  }

  @Override
  public long[] extendedMin() {
    return extendedMin.clone();
  }

  @Override
  public long[] extendedMax() {
    return extendedMax.clone();
  }

  /** The number of dimensions. */
  public int numDimensions() {
    return coreMin.length;
  }

  /** The core as an imglib2 interval (allocates). */
  public Interval core() {
    return new FinalInterval(coreMin, coreMax);
  }

  /** The extended box (core plus halo, clipped to the volume) as an imglib2 interval (allocates). */
  public Interval extended() {
    return new FinalInterval(extendedMin, extendedMax);
  }

  /** The core's size along each dimension (allocates). */
  public int[] coreShape() {
    int[] shape = new int[coreMin.length];
    for (int d = 0; d < shape.length; d++) {
      shape[d] = (int) (coreMax[d] - coreMin[d] + 1);
    }
    return shape;
  }

  /** The extended box's size along each dimension (allocates). */
  public int[] extendedShape() {
    int[] shape = new int[extendedMin.length];
    for (int d = 0; d < shape.length; d++) {
      shape[d] = (int) (extendedMax[d] - extendedMin[d] + 1);
    }
    return shape;
  }

  /** The number of voxels in the core. */
  public long coreVoxelCount() {
    long count = 1;
    for (int d = 0; d < coreMin.length; d++) {
      count *= coreMax[d] - coreMin[d] + 1;
    }
    return count;
  }

  /** Whether the global voxel {@code position} lies in the core. */
  public boolean coreContains(long[] position) {
    for (int d = 0; d < coreMin.length; d++) {
      if (position[d] < coreMin[d] || position[d] > coreMax[d]) {
        return false;
      }
    }
    return true;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof Block b && index == b.index
        && Arrays.equals(gridPosition, b.gridPosition)
        && Arrays.equals(coreMin, b.coreMin) && Arrays.equals(coreMax, b.coreMax)
        && Arrays.equals(extendedMin, b.extendedMin) && Arrays.equals(extendedMax, b.extendedMax);
  }

  @Override
  public int hashCode() {
    return 31 * Integer.hashCode(index) + Arrays.hashCode(gridPosition);
  }

  @Override
  public String toString() {
    return "Block[" + index + " at " + Arrays.toString(gridPosition) + ", core "
        + Arrays.toString(coreMin) + ".." + Arrays.toString(coreMax) + ", extended "
        + Arrays.toString(extendedMin) + ".." + Arrays.toString(extendedMax) + "]";
  }
}
