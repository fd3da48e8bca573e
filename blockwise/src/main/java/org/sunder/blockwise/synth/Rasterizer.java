package org.sunder.blockwise.synth;

import java.util.Arrays;

/**
 * Draws capsules and ellipsoids into a label array. Every shape scores the voxels near it:
 * inside, {@code d / r - 1} in {@code [-1, 0)} (deepest first); outside, the distance to its
 * surface divided by the fill distance, up to 1. A voxel takes the label of the lowest score,
 * so touching and overlapping objects meet along a sharp surface, and the space between
 * objects is shared out by nearest surface. Voxels no shape scored stay 0. Work is
 * {@code O(Σ bounding-box voxels)} over shapes; voxel centres sit at {@code (i + 0.5) * size}.
 */
final class Rasterizer {
  private final int nx;
  private final int ny;
  private final int nz;
  private final double[] size;
  private final double fill;
  final float[] score;
  final int[] label;

  Rasterizer(long[] shape, double[] voxelSize, double fillDistance) {
    nx = (int) shape[0];
    ny = (int) shape[1];
    nz = (int) shape[2];
    size = voxelSize.clone();
    fill = Math.max(fillDistance, 1e-9);
    score = new float[nx * ny * nz];
    label = new int[score.length];
    Arrays.fill(score, Float.POSITIVE_INFINITY);
  }

  void draw(Ellipsoid e) {
    double reach = e.largestRadius() + fill;
    int[] lo = new int[3];
    int[] hi = new int[3];
    box(e.centre(), e.centre(), reach, lo, hi);
    double[][] a = e.axes();
    double[] r = e.radii();
    double[] c = e.centre();
    double surfaceScale = e.smallestRadius() / fill;
    for (int z = lo[2]; z <= hi[2]; z++) {
      double pz = (z + 0.5) * size[2] - c[2];
      for (int y = lo[1]; y <= hi[1]; y++) {
        double py = (y + 0.5) * size[1] - c[1];
        int row = nx * (y + ny * z);
        for (int x = lo[0]; x <= hi[0]; x++) {
          double px = (x + 0.5) * size[0] - c[0];
          double u = (a[0][0] * px + a[0][1] * py + a[0][2] * pz) / r[0];
          double v = (a[1][0] * px + a[1][1] * py + a[1][2] * pz) / r[1];
          double w = (a[2][0] * px + a[2][1] * py + a[2][2] * pz) / r[2];
          double q = Math.sqrt(u * u + v * v + w * w);
          double s = q < 1 ? q - 1 : (q - 1) * surfaceScale;
          offer(row + x, s, e.object());
        }
      }
    }
  }

  void draw(Capsule k) {
    double ra = k.ra();
    double rb = k.rb();
    double reach = Math.max(ra, rb) + fill;
    int[] lo = new int[3];
    int[] hi = new int[3];
    box(new double[] {k.ax(), k.ay(), k.az()}, new double[] {k.bx(), k.by(), k.bz()}, reach,
        lo, hi);
    double ax = k.ax();
    double ay = k.ay();
    double az = k.az();
    double sx = k.bx() - ax;
    double sy = k.by() - ay;
    double sz = k.bz() - az;
    double length2 = sx * sx + sy * sy + sz * sz;
    double inverse = length2 == 0 ? 0 : 1 / length2;
    double reach2 = reach * reach;
    double inverseFill = 1 / fill;
    int object = k.object();
    double hx = size[0];
    for (int z = lo[2]; z <= hi[2]; z++) {
      double pz = (z + 0.5) * size[2] - az;
      for (int y = lo[1]; y <= hi[1]; y++) {
        double py = (y + 0.5) * size[1] - ay;
        int row = nx * (y + ny * z);
        double px = (lo[0] + 0.5) * hx - ax;
        for (int x = lo[0]; x <= hi[0]; x++, px += hx) {
          double t = (px * sx + py * sy + pz * sz) * inverse;
          t = t < 0 ? 0 : (t > 1 ? 1 : t);
          double dx = px - t * sx;
          double dy = py - t * sy;
          double dz = pz - t * sz;
          double d2 = dx * dx + dy * dy + dz * dz;
          if (d2 > reach2) {
            continue;
          }
          double d = Math.sqrt(d2);
          double r = ra + t * (rb - ra);
          double s = d < r ? d / r - 1 : (d - r) * inverseFill;
          offer(row + x, s, object);
        }
      }
    }
  }

  private void offer(int index, double s, int object) {
    float f = (float) s;
    if (s <= 1 && f < score[index]) {
      score[index] = f;
      label[index] = object;
    }
  }

  private void box(double[] a, double[] b, double reach, int[] lo, int[] hi) {
    int[] n = {nx, ny, nz};
    for (int d = 0; d < 3; d++) {
      double min = Math.min(a[d], b[d]) - reach;
      double max = Math.max(a[d], b[d]) + reach;
      lo[d] = (int) Math.max(0, Math.floor(min / size[d] - 0.5));
      hi[d] = (int) Math.min(n[d] - 1, Math.ceil(max / size[d] - 0.5));
    }
  }
}
