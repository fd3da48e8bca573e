package org.sunder.stitching;

import java.util.Random;

/**
 * A small test scene: ground truth cells from a Voronoi division of random seeds (anisotropic
 * distance, so the cells are elongated along x), a one-voxel membrane of background between
 * some cells, and affinities per offset (1 inside one cell, 0 across cells or into the
 * membrane) with optional seeded noise. Arrays in memory order; affinities channel last.
 */
final class CellScene {
  final int[] shape;
  final long[] groundTruth;
  final float[] affinities;
  final int[][] offsets;

  private CellScene(int[] shape, long[] groundTruth, float[] affinities, int[][] offsets) {
    this.shape = shape;
    this.groundTruth = groundTruth;
    this.affinities = affinities;
    this.offsets = offsets;
  }

  int voxelCount() {
    return shape[0] * shape[1] * shape[2];
  }

  /**
   * @param noise standard deviation of the Gaussian noise added to the exact affinities
   *     (affinities are then clipped to [0, 1]); 0 for exact affinities
   */
  static CellScene generate(int[] shape, int cellCount, int[][] offsets, double noise, long seed) {
    Random random = new Random(seed);
    int n = shape[0] * shape[1] * shape[2];
    double[][] seeds = new double[cellCount][3];
    for (double[] s : seeds) {
      for (int d = 0; d < 3; d++) {
        s[d] = random.nextDouble() * shape[d];
      }
    }
    double[] scale = {0.45, 1.0, 1.3};
    long[] gt = new long[n];
    int[] p = new int[3];
    for (int i = 0; i < n; i++) {
      position(i, shape, p);
      double best = Double.MAX_VALUE;
      double second = Double.MAX_VALUE;
      int label = 0;
      for (int c = 0; c < cellCount; c++) {
        double dist = 0;
        for (int d = 0; d < 3; d++) {
          double delta = (p[d] - seeds[c][d]) * scale[d];
          dist += delta * delta;
        }
        dist = Math.sqrt(dist);
        if (dist < best) {
          second = best;
          best = dist;
          label = c + 1;
        } else if (dist < second) {
          second = dist;
        }
      }
      gt[i] = second - best < 0.35 && label % 3 == 0 ? 0 : label;
    }
    int channels = offsets.length;
    float[] aff = new float[n * channels];
    int[] q = new int[3];
    for (int k = 0; k < channels; k++) {
      for (int i = 0; i < n; i++) {
        position(i, shape, p);
        boolean inside = true;
        for (int d = 0; d < 3; d++) {
          q[d] = p[d] + offsets[k][d];
          inside &= q[d] >= 0 && q[d] < shape[d];
        }
        float exact = 0;
        if (inside) {
          long a = gt[i];
          long b = gt[q[0] + shape[0] * (q[1] + shape[1] * q[2])];
          exact = a != 0 && a == b ? 1f : 0f;
        }
        float value = exact;
        if (noise > 0) {
          value = (float) Math.min(1, Math.max(0, exact + noise * random.nextGaussian()));
        }
        aff[i + n * k] = value;
      }
    }
    return new CellScene(shape.clone(), gt, aff, offsets);
  }

  static void position(int index, int[] shape, int[] out) {
    out[0] = index % shape[0];
    out[1] = index / shape[0] % shape[1];
    out[2] = index / (shape[0] * shape[1]);
  }
}
