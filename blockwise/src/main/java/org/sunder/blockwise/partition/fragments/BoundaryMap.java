package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;

/**
 * A boundary map from the nearest-neighbour channels of an affinity box: at every voxel, the
 * largest {@code 1 - a} over the nearest-neighbour edges that touch it (as either end), so a
 * voxel next to a predicted boundary on any side reads high. Values lie in [0, 1]; a voxel with
 * no such edge (isolated by the mask or the box) reads 1, masked voxels read 1.
 *
 * <p>Nearest-neighbour offsets are those with exactly one non-zero component, of magnitude 1.
 * With {@code sliceAxis >= 0} only the offsets inside the slice planes count (per-slice
 * fragments of anisotropic data). Affinities are channel-last: channel {@code k} of voxel
 * {@code i} is at {@code k * voxels + i}, and is the affinity of the edge from {@code i} to
 * {@code i + offset[k]}. Time {@code O(n · c)}; allocates the {@code float[n]} result.
 */
public final class BoundaryMap {
  private BoundaryMap() {}

  /** From float affinities in [0, 1]. */
  public static float[] of(float[] affinities, int[] shape, int[][] offsets, byte[] mask,
      int sliceAxis) {
    return compute(new FloatSource(affinities), shape, offsets, mask, sliceAxis);
  }

  /** From 8-bit affinities ({@code a = value / 255}). */
  public static float[] of(byte[] affinities, int[] shape, int[][] offsets, byte[] mask,
      int sliceAxis) {
    return compute(new ByteSource(affinities), shape, offsets, mask, sliceAxis);
  }

  /** Whether {@code offset} is a nearest-neighbour offset that lies in the slice planes. */
  static boolean isNearestNeighbour(int[] offset, int sliceAxis) {
    int nonZero = -1;
    for (int d = 0; d < offset.length; d++) {
      if (offset[d] != 0) {
        if (nonZero >= 0 || Math.abs(offset[d]) != 1) {
          return false;
        }
        nonZero = d;
      }
    }
    return nonZero >= 0 && nonZero != sliceAxis;
  }

  private static float[] compute(Source source, int[] shape, int[][] offsets, byte[] mask,
      int sliceAxis) {
    int n = VoxelBox.size(shape);
    float[] boundary = new float[n];
    Arrays.fill(boundary, -1f);
    int[] strides = VoxelBox.strides(shape);
    int rowLength = shape[0];
    int[] rowCoordinate = new int[shape.length];
    for (int k = 0; k < offsets.length; k++) {
      if (!isNearestNeighbour(offsets[k], sliceAxis)) {
        continue;
      }
      int axis = VoxelBox.nonZeroAxis(offsets[k]);
      int step = offsets[k][axis];
      int delta = step * strides[axis];
      int base = k * n;
      // row by row: along the row's own axis the edges leave the box at one end; across rows
      // a whole row's edges stay inside or leave
      int first = axis == 0 ? Math.max(0, -step) : 0;
      int end = axis == 0 ? Math.min(rowLength, rowLength - step) : rowLength;
      Arrays.fill(rowCoordinate, 0);
      for (int row = 0; row < n; row += rowLength, VoxelBox.advanceRow(rowCoordinate, shape)) {
        int c = rowCoordinate[axis] + step;
        if (axis > 0 && (c < 0 || c >= shape[axis])) {
          continue;
        }
        for (int i = row + first; i < row + end; i++) {
          int j = i + delta;
          if (mask == null || (mask[i] != 0 && mask[j] != 0)) {
            float b = 1f - source.affinity(base + i);
            if (b > boundary[i]) {
              boundary[i] = b;
            }
            if (b > boundary[j]) {
              boundary[j] = b;
            }
          }
        }
      }
    }
    for (int i = 0; i < n; i++) {
      if (boundary[i] < 0f || (mask != null && mask[i] == 0)) {
        boundary[i] = 1f;
      } else {
        boundary[i] += 0f;
      }
    }
    return boundary;
  }

  private interface Source {
    float affinity(int index);
  }

  private record FloatSource(float[] values) implements Source {
    @Override
    public float affinity(int index) {
      return values[index];
    }
  }

  private record ByteSource(byte[] values) implements Source {
    @Override
    public float affinity(int index) {
      return (values[index] & 0xff) / 255f;
    }
  }
}
