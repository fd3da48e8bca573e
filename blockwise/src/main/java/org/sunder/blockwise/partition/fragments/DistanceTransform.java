package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import java.util.Objects;

/**
 * Exact Euclidean distance transform of a binary box with an anisotropic voxel size: for every
 * foreground voxel, the distance to the nearest background voxel, measured in physical units
 * ({@code spacing[d]} per voxel step along axis {@code d}); background voxels get 0.
 *
 * <p>Separable: one exact one-dimensional transform of the squared distance per included axis,
 * each the lower envelope of parabolas from "Distance Transforms of Sampled Functions" (Theory
 * of Computing, 2012). Time {@code O(n · d)} for {@code n} voxels and {@code d} axes; memory one
 * {@code double} per voxel plus a few buffers of the longest line.
 *
 * <p>Axes can be left out (per-slice transforms of anisotropic data leave out the slice axis):
 * distances are then measured inside each hyperplane of the remaining axes. A voxel from which
 * no background voxel is reachable gets {@code +Infinity}. Instances are immutable and
 * thread-safe; each call allocates its result.
 */
public final class DistanceTransform {
  private final double[] spacing;
  private final boolean[] included;

  private DistanceTransform(double[] spacing, boolean[] included) {
    this.spacing = spacing;
    this.included = included;
  }

  /** A transform over all axes with the given voxel size (memory order, each finite and > 0). */
  public static DistanceTransform of(double... spacing) {
    boolean[] all = new boolean[spacing.length];
    Arrays.fill(all, true);
    return of(spacing, all);
  }

  /**
   * A transform along the axes with {@code included[d]} only.
   *
   * @throws IllegalArgumentException on a non-positive or non-finite spacing, or mismatched lengths
   */
  public static DistanceTransform of(double[] spacing, boolean[] included) {
    Objects.requireNonNull(spacing, "spacing");
    Objects.requireNonNull(included, "included");
    if (spacing.length != included.length || spacing.length == 0) {
      throw new IllegalArgumentException("spacing has " + spacing.length
          + " axes and included has " + included.length + "; expected the same, at least 1");
    }
    for (double s : spacing) {
      if (!(s > 0) || Double.isInfinite(s)) {
        throw new IllegalArgumentException("voxel spacing " + s + " is not a finite value > 0");
      }
    }
    return new DistanceTransform(spacing.clone(), included.clone());
  }

  /** Distances (not squared) for {@code foreground[i] != 0}; see {@link #squaredDistances}. */
  public double[] distances(byte[] foreground, int[] shape) {
    double[] d = squaredDistances(foreground, shape);
    for (int i = 0; i < d.length; i++) {
      d[i] = Math.sqrt(d[i]);
    }
    return d;
  }

  /** Squared physical distance from each voxel with {@code foreground[i] != 0} to background. */
  public double[] squaredDistances(byte[] foreground, int[] shape) {
    int n = checkShape(foreground.length, shape);
    double[] f = new double[n];
    for (int i = 0; i < n; i++) {
      f[i] = foreground[i] != 0 ? Double.POSITIVE_INFINITY : 0.0;
    }
    int longest = Arrays.stream(shape).max().orElse(1);
    LineBuffers buffers = new LineBuffers(longest);
    int stride = 1;
    boolean binary = true;
    for (int d = 0; d < shape.length; d++) {
      if (included[d]) {
        transformAxis(f, shape, d, stride, buffers, binary);
        binary = false;
      }
      stride *= shape[d];
    }
    return f;
  }

  private int checkShape(int length, int[] shape) {
    if (shape.length != spacing.length) {
      throw new IllegalArgumentException("shape has " + shape.length + " axes, spacing "
          + spacing.length);
    }
    long n = 1;
    for (int s : shape) {
      if (s <= 0) {
        throw new IllegalArgumentException("shape " + Arrays.toString(shape) + " has an empty axis");
      }
      n *= s;
    }
    if (n != length) {
      throw new IllegalArgumentException("array of " + length + " voxels does not match shape "
          + Arrays.toString(shape));
    }
    return (int) n;
  }

  /**
   * One axis's one-dimensional transforms; {@code binary} when every value is 0 or infinite (the
   * first axis), where each line is two scans ({@link #binaryLine}).
   */
  private void transformAxis(double[] f, int[] shape, int axis, int stride, LineBuffers b,
      boolean binary) {
    int length = shape[axis];
    int n = f.length;
    int block = stride * length;
    double s = spacing[axis];
    for (int outer = 0; outer < n; outer += block) {
      if (stride == 1) {
        // a line in memory order: no tile needed
        System.arraycopy(f, outer, b.line, 0, length);
        transformLine(b, length, s, binary);
        System.arraycopy(b.result, 0, f, outer, length);
        continue;
      }
      for (int inner = 0; inner < stride; inner += LineTiles.WIDTH) {
        int width = Math.min(LineTiles.WIDTH, stride - inner);
        int start = outer + inner;
        LineTiles.gather(f, start, stride, length, width, b.tile);
        for (int w = 0; w < width; w++) {
          for (int q = 0, at = w; q < length; q++, at += width) {
            b.line[q] = b.tile[at];
          }
          transformLine(b, length, s, binary);
          for (int q = 0, at = w; q < length; q++, at += width) {
            b.tile[at] = b.result[q];
          }
        }
        LineTiles.scatter(b.tile, f, start, stride, length, width);
      }
    }
  }

  /** {@link #binaryLine} when {@code binary}, else {@link #transformLine(LineBuffers, int, double)}. */
  private static void transformLine(LineBuffers b, int length, double s, boolean binary) {
    if (binary) {
      binaryLine(b, length, s);
    } else {
      transformLine(b, length, s);
    }
  }

  /** The lower envelope of the parabolas {@code (s(q - p))² + line[p]} over finite samples. */
  static void transformLine(LineBuffers b, int length, double s) {
    double[] f = b.line;
    int[] v = b.vertex;
    double[] z = b.boundary;
    int k = -1;
    for (int q = 0; q < length; q++) {
      if (f[q] == Double.POSITIVE_INFINITY) {
        continue;
      }
      double xq = q * s;
      double hq = f[q] + xq * xq;
      while (k >= 0) {
        double xv = v[k] * s;
        double cross = (hq - (f[v[k]] + xv * xv)) / (2 * (xq - xv));
        if (cross > z[k]) {
          break;
        }
        k--;
      }
      k++;
      v[k] = q;
      z[k] = k == 0 ? Double.NEGATIVE_INFINITY : crossing(f, v[k - 1], q, s);
    }
    if (k < 0) {
      Arrays.fill(b.result, 0, length, Double.POSITIVE_INFINITY);
      return;
    }
    int j = 0;
    for (int q = 0; q < length; q++) {
      double xq = q * s;
      while (j < k && z[j + 1] < xq) {
        j++;
      }
      double dx = xq - v[j] * s;
      b.result[q] = dx * dx + f[v[j]];
    }
  }

  /**
   * {@link #transformLine} of a line whose values are 0 (background) or infinite, without the
   * envelope: each sample takes the nearer of the background samples before and after it, the
   * one before when the sample lies at or before their parabolas' crossing, and the same value
   * bit for bit. O(length), one division per run of foreground.
   */
  static void binaryLine(LineBuffers b, int length, double s) {
    double[] f = b.line;
    int before = -1;
    int q = 0;
    while (q < length) {
      if (f[q] == 0) {
        b.result[q] = 0;
        before = q++;
        continue;
      }
      int after = q;
      while (after < length && f[after] != 0) {
        after++;
      }
      if (before < 0 && after == length) {
        Arrays.fill(b.result, q, length, Double.POSITIVE_INFINITY);
        return;
      }
      double crossing = before < 0 ? Double.NEGATIVE_INFINITY
          : after == length ? Double.POSITIVE_INFINITY : crossing(f, before, after, s);
      for (; q < after; q++) {
        double xq = q * s;
        double dx = xq - (xq <= crossing ? before : after) * s;
        b.result[q] = dx * dx;
      }
    }
  }

  private static double crossing(double[] f, int p, int q, double s) {
    double xp = p * s;
    double xq = q * s;
    return ((f[q] + xq * xq) - (f[p] + xp * xp)) / (2 * (xq - xp));
  }

  /** Per-line work arrays, reused across the lines of one call. */
  static final class LineBuffers {
    final double[] line;
    final double[] result;
    final int[] vertex;
    final double[] boundary;
    /** Neighbouring lines side by side ({@link LineTiles}). */
    final double[] tile;

    LineBuffers(int longest) {
      tile = new double[longest * LineTiles.WIDTH];
      line = new double[longest];
      result = new double[longest];
      vertex = new int[longest];
      boundary = new double[longest + 1];
    }
  }
}
