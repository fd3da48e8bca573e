package org.sunder.blockwise.synth;

import java.util.Arrays;
import org.sunder.blockwise.collections.VoxelQueue;

/**
 * Gives every unlabelled voxel (label 0) the label of the nearest labelled voxel, nearest along
 * 6-connected paths weighted by the physical voxel size (Dijkstra from all labelled voxels at
 * once). The heap breaks ties by voxel index, so the result is deterministic.
 * {@code O(u log u)} for {@code u} unlabelled voxels, on a primitive binary heap.
 */
final class GrowthFill {
  private GrowthFill() {}

  static void fill(int[] label, int nx, int ny, int nz, double[] voxelSize) {
    int n = label.length;
    int plane = nx * ny;
    float[] dist = new float[n];
    Arrays.fill(dist, Float.POSITIVE_INFINITY);
    VoxelQueue heap = new VoxelQueue(1024);
    for (int z = 0, i = 0; z < nz; z++) {
      for (int y = 0; y < ny; y++) {
        for (int x = 0; x < nx; x++, i++) {
          if (label[i] != 0) {
            dist[i] = 0;
            if (hasEmptyNeighbour(label, i, x, y, z, nx, ny, nz)) {
              heap.push(0, i);
            }
          }
        }
      }
    }
    int[] step = {1, nx, plane};
    int[] extent = {nx, ny, nz};
    int[] coord = new int[3];
    while (!heap.isEmpty()) {
      float d = heap.topPriority();
      int i = heap.pop();
      if (d > dist[i]) {
        continue;
      }
      coord[0] = i % nx;
      coord[1] = (i / nx) % ny;
      coord[2] = i / plane;
      for (int axis = 0; axis < 3; axis++) {
        float nd = (float) (d + voxelSize[axis]);
        for (int sign = -1; sign <= 1; sign += 2) {
          int c = coord[axis] + sign;
          if (c >= 0 && c < extent[axis]) {
            int j = i + sign * step[axis];
            if (nd < dist[j]) {
              dist[j] = nd;
              label[j] = label[i];
              heap.push(nd, j);
            }
          }
        }
      }
    }
  }

  private static boolean hasEmptyNeighbour(int[] label, int i, int x, int y, int z, int nx,
      int ny, int nz) {
    int plane = nx * ny;
    return (x > 0 && label[i - 1] == 0) || (x < nx - 1 && label[i + 1] == 0)
        || (y > 0 && label[i - nx] == 0) || (y < ny - 1 && label[i + nx] == 0)
        || (z > 0 && label[i - plane] == 0) || (z < nz - 1 && label[i + plane] == 0);
  }
}
