package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * How {@link WatershedFragments} over-segments a block.
 *
 * @param boundaryThreshold voxels whose boundary value is below it are object interior; seeds
 *     lie at the maxima of their distance to the rest. In (0, 1]
 * @param seedSmoothing σ of a Gaussian applied to the distance transform before its maxima are
 *     taken, in the same physical units as {@code voxelSize}; 0 for none
 * @param voxelSize the physical size of a voxel along each axis, memory order (x, y, z)
 * @param perSlice fragments per plane of the slowest axis (z), for anisotropic data: the
 *     distance transform, the seeds and the flood stay inside each slice
 */
public record FragmentOptions(double boundaryThreshold, double seedSmoothing, double[] voxelSize,
    boolean perSlice) {

  public FragmentOptions {
    if (!(boundaryThreshold > 0 && boundaryThreshold <= 1)) {
      throw new IllegalArgumentException("boundary threshold " + boundaryThreshold
          + " is outside (0, 1]");
    }
    if (!(seedSmoothing >= 0) || Double.isInfinite(seedSmoothing)) {
      throw new IllegalArgumentException("seed smoothing " + seedSmoothing
          + " is not a finite value >= 0");
    }
    voxelSize = voxelSize.clone();
    for (double s : voxelSize) {
      if (!(s > 0) || Double.isInfinite(s)) {
        throw new IllegalArgumentException("voxel size " + Arrays.toString(voxelSize)
            + " has a value that is not finite and > 0");
      }
    }
  }

  /** Threshold 0.5, smoothing σ = 1 voxel, isotropic unit voxels, 3D, for {@code dims} axes. */
  public static FragmentOptions defaults(int dims) {
    double[] unit = new double[dims];
    Arrays.fill(unit, 1.0);
    return new FragmentOptions(0.5, 1.0, unit, false);
  }

  /** The axis whose planes are processed apart, or −1. */
  public int sliceAxis() {
    return perSlice ? voxelSize.length - 1 : -1;
  }

  @Override
  public double[] voxelSize() {
    return voxelSize.clone();
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof FragmentOptions o && o.boundaryThreshold == boundaryThreshold
        && o.seedSmoothing == seedSmoothing && Arrays.equals(o.voxelSize, voxelSize)
        && o.perSlice == perSlice;
  }

  @Override
  public int hashCode() {
    return Double.hashCode(boundaryThreshold) * 31 * 31 * 31 + Double.hashCode(seedSmoothing) * 31 * 31
        + Arrays.hashCode(voxelSize) * 31 + Boolean.hashCode(perSlice);
  }

  @Override
  public String toString() {
    return "FragmentOptions[boundaryThreshold=" + boundaryThreshold + ", seedSmoothing="
        + seedSmoothing + ", voxelSize=" + Arrays.toString(voxelSize) + ", perSlice=" + perSlice
        + "]";
  }
}
