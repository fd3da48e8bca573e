package org.sunder.blockwise.synth;

import java.util.Arrays;
import org.sunder.blockwise.collections.VoxelQueue;

/**
 * Shape measures of every object of a label volume, for tests: voxel count, mean physical
 * distance to the object's boundary (surfaces against other labels or background; the volume
 * border is not a boundary, objects continue beyond it) and geodesic length (the longest
 * shortest path inside the object, found by a double sweep). Distances run along
 * 26-connected paths weighted by the physical step length.
 */
final class ObjectShapes {
  final long[] voxels;
  final double[] meanBoundaryDistance;
  final double[] geodesicLength;
  private final long[] labels;
  private final int nx;
  private final int ny;
  private final int nz;
  private final double[] size;
  private final int[][] steps;
  private final double[] stepLength;

  ObjectShapes(long[] labels, long[] shape, double[] voxelSize, int objectCount) {
    this.labels = labels;
    this.nx = (int) shape[0];
    this.ny = (int) shape[1];
    this.nz = (int) shape[2];
    this.size = voxelSize.clone();
    int k = 0;
    steps = new int[26][];
    stepLength = new double[26];
    for (int dz = -1; dz <= 1; dz++) {
      for (int dy = -1; dy <= 1; dy++) {
        for (int dx = -1; dx <= 1; dx++) {
          if (dx != 0 || dy != 0 || dz != 0) {
            steps[k] = new int[] {dx, dy, dz};
            stepLength[k++] = Math.sqrt(sq(dx * size[0]) + sq(dy * size[1]) + sq(dz * size[2]));
          }
        }
      }
    }
    voxels = new long[objectCount + 1];
    meanBoundaryDistance = new double[objectCount + 1];
    geodesicLength = new double[objectCount + 1];
    measureBoundaryDistances();
    measureLengths();
  }

  private void measureBoundaryDistances() {
    float[] dist = new float[labels.length];
    Arrays.fill(dist, Float.POSITIVE_INFINITY);
    VoxelQueue heap = new VoxelQueue(1024);
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] != 0 && onBoundary(i)) {
        float d = (float) (0.5 * Math.min(size[0], Math.min(size[1], size[2])));
        dist[i] = d;
        heap.push(d, i);
      }
    }
    sweep(heap, dist, false);
    double[] sum = new double[voxels.length];
    for (int i = 0; i < labels.length; i++) {
      int l = (int) labels[i];
      if (l != 0) {
        voxels[l]++;
        sum[l] += dist[i];
      }
    }
    for (int l = 1; l < voxels.length; l++) {
      meanBoundaryDistance[l] = voxels[l] == 0 ? 0 : sum[l] / voxels[l];
    }
  }

  private void measureLengths() {
    int[] first = new int[voxels.length];
    Arrays.fill(first, -1);
    for (int i = labels.length - 1; i >= 0; i--) {
      if (labels[i] != 0) {
        first[(int) labels[i]] = i;
      }
    }
    float[] dist = new float[labels.length];
    Arrays.fill(dist, Float.POSITIVE_INFINITY);
    for (int l = 1; l < voxels.length; l++) {
      if (first[l] < 0) {
        continue;
      }
      Far far = farthest(first[l], dist);
      geodesicLength[l] = farthest(far.voxel(), dist).distance();
    }
  }

  private record Far(int voxel, float distance) {}

  /** Dijkstra inside the start's object; the farthest voxel; leaves dist all infinite. */
  private Far farthest(int start, float[] dist) {
    VoxelQueue heap = new VoxelQueue(64);
    dist[start] = 0;
    heap.push(0, start);
    int[] reached = sweep(heap, dist, true);
    int far = start;
    for (int i : reached) {
      if (dist[i] > dist[far]) {
        far = i;
      }
    }
    Far result = new Far(far, dist[far]);
    for (int i : reached) {
      dist[i] = Float.POSITIVE_INFINITY;
    }
    return result;
  }

  private int[] sweep(VoxelQueue heap, float[] dist, boolean track) {
    int[] reached = new int[16];
    int count = 0;
    while (!heap.isEmpty()) {
      float d = heap.topPriority();
      int i = heap.pop();
      if (d > dist[i]) {
        continue;
      }
      if (track) {
        if (count == reached.length) {
          reached = Arrays.copyOf(reached, count * 2);
        }
        reached[count++] = i;
      }
      int x = i % nx;
      int y = (i / nx) % ny;
      int z = i / (nx * ny);
      for (int k = 0; k < 26; k++) {
        int qx = x + steps[k][0];
        int qy = y + steps[k][1];
        int qz = z + steps[k][2];
        if (qx < 0 || qy < 0 || qz < 0 || qx >= nx || qy >= ny || qz >= nz) {
          continue;
        }
        int j = qx + nx * (qy + ny * qz);
        float nd = (float) (d + stepLength[k]);
        if (labels[j] == labels[i] && nd < dist[j]) {
          dist[j] = nd;
          heap.push(nd, j);
        }
      }
    }
    return Arrays.copyOf(reached, count);
  }

  private boolean onBoundary(int i) {
    int x = i % nx;
    int y = (i / nx) % ny;
    int z = i / (nx * ny);
    long l = labels[i];
    return (x > 0 && labels[i - 1] != l) || (x < nx - 1 && labels[i + 1] != l)
        || (y > 0 && labels[i - nx] != l) || (y < ny - 1 && labels[i + nx] != l)
        || (z > 0 && labels[i - nx * ny] != l) || (z < nz - 1 && labels[i + nx * ny] != l);
  }

  private static double sq(double v) {
    return v * v;
  }
}
