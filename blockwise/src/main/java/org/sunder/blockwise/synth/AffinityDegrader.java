package org.sunder.blockwise.synth;

import java.util.SplittableRandom;
import org.sunder.blockwise.graph.Offsets;

/** Applies one {@link Degradation} to one affinity array; see there for what each kind does. */
final class AffinityDegrader {
  private static final long GAP_STREAM = 0x6A09E667F3BCC909L;
  private static final long FALSE_BOUNDARY_STREAM = 0xBB67AE8584CAA73BL;
  private static final long NOISE_STREAM = 0x3C6EF372FE94F82BL;
  private static final long SLICE_STREAM = 0xA54FF53A5F1D36F1L;
  private static final long WIDENING_STREAM = 0x510E527FADE682D1L;
  private static final long FIELD_STREAM = 0x9B05688C2B3E6C1FL;
  private static final long MISSING_STREAM = 0x1F83D9ABFB41BD6BL;
  /** Least affinity inside a gap. */
  private static final double GAP_LOW = 0.85;

  private final Degradation degradation;
  private final long[] labels;
  private final int nx;
  private final int ny;
  private final int nz;
  private final int n;
  private final double[] size;
  private final double finest;
  private final int[][] offsets;
  /** Per channel: true when the offset is not a unit step along one axis. */
  private final boolean[] longRange;

  AffinityDegrader(Degradation degradation, long[] labels, long[] shape, double[] voxelSize,
      int[][] offsets) {
    ExactAffinities.validate(offsets, 3);
    this.degradation = degradation;
    this.labels = labels;
    this.nx = (int) shape[0];
    this.ny = (int) shape[1];
    this.nz = (int) shape[2];
    this.n = nx * ny * nz;
    if (labels.length != n || voxelSize.length != 3) {
      throw new IllegalArgumentException("labels or voxel size do not match the shape");
    }
    this.size = voxelSize.clone();
    this.finest = Math.min(size[0], Math.min(size[1], size[2]));
    this.offsets = offsets;
    Offsets vectors = Offsets.of(offsets);
    this.longRange = new boolean[offsets.length];
    for (int k = 0; k < offsets.length; k++) {
      longRange[k] = vectors.isLongRange(k);
    }
  }

  float[] degrade(float[] exact) {
    if (exact.length != (long) n * offsets.length) {
      throw new IllegalArgumentException("affinities hold " + exact.length + " values, expected "
          + n + " voxels x " + offsets.length + " channels");
    }
    float[] a = exact.clone();
    if (degradation.boundaryWidening() > 0) {
      widenBoundaries(a);
    }
    if (degradation.gapRate() > 0) {
      gaps(a);
    }
    if (degradation.falseBoundaryRate() > 0) {
      falseBoundaries(a);
    }
    if (degradation.blurSigma() > 0) {
      blur(a);
    }
    if (degradation.noiseSigma() > 0 || degradation.correlatedNoiseSigma() > 0) {
      noise(a);
    }
    if (degradation.corruptSliceProbability() > 0) {
      corruptSlices(a);
    }
    if (degradation.missingSliceProbability() > 0) {
      missingSlices(a);
    }
    return a;
  }

  private SplittableRandom stream(long salt) {
    return new SplittableRandom(degradation.seed() ^ salt);
  }

  private void gaps(float[] a) {
    SplittableRandom random = stream(GAP_STREAM);
    double radius = Degradation.GAP_RADIUS_VOXELS * finest;
    for (int i = 0; i < n; i++) {
      if (labels[i] != 0 && touchesOtherObject(i) && random.nextDouble() < degradation.gapRate()) {
        forEdgesInBall(i, radius, (p, q, k) -> {
          int at = k * n + p;
          if (labels[q] != 0 && labels[p] != 0 && labels[p] != labels[q]) {
            double high = GAP_LOW + 0.15 * random.nextDouble();
            a[at] = (float) (longRange[k] ? high * degradation.gapLongRangeStrength() : high);
          } else if (labels[p] != 0 && labels[p] == labels[q] && a[at] < GAP_LOW) {
            a[at] = (float) (GAP_LOW + 0.15 * random.nextDouble());
          }
        });
      }
    }
  }

  private void widenBoundaries(float[] a) {
    int width = degradation.boundaryWidening();
    byte[] depth = surfaceDepth(width);
    SplittableRandom random = stream(WIDENING_STREAM);
    for (int k = 0; k < offsets.length; k++) {
      if (longRange[k]) {
        continue;
      }
      int[] d = offsets[k];
      for (int z = 0; z < nz; z++) {
        for (int y = 0; y < ny; y++) {
          for (int x = 0; x < nx; x++) {
            int qx = x + d[0];
            int qy = y + d[1];
            int qz = z + d[2];
            if (qx < 0 || qy < 0 || qz < 0 || qx >= nx || qy >= ny || qz >= nz) {
              continue;
            }
            int p = x + nx * (y + ny * z);
            int q = qx + nx * (qy + ny * qz);
            if (labels[p] != 0 && labels[p] == labels[q] && Math.min(depth[p], depth[q]) < width) {
              a[k * n + p] = (float) (0.2 * random.nextDouble());
            }
          }
        }
      }
    }
  }

  /**
   * Steps from each labelled voxel to its object's surface, counted up to {@code limit}
   * (deeper voxels get {@code limit}); steps go along the axes of the finest voxel size only.
   * A breadth-first flood from the surface voxels, {@code O(n)}.
   */
  private byte[] surfaceDepth(int limit) {
    byte[] depth = new byte[n];
    java.util.Arrays.fill(depth, (byte) limit);
    int[] frontier = new int[n];
    int count = 0;
    for (int i = 0; i < n; i++) {
      if (labels[i] != 0 && touchesOtherLabelAlongFinestAxes(i)) {
        depth[i] = 0;
        frontier[count++] = i;
      }
    }
    int[] next = new int[n];
    int[] steps = {1, nx, nx * ny};
    int[] extent = {nx, ny, nz};
    for (int level = 1; level < limit && count > 0; level++) {
      int nextSize = 0;
      for (int f = 0; f < count; f++) {
        int i = frontier[f];
        int[] at = {i % nx, (i / nx) % ny, i / (nx * ny)};
        for (int axis = 0; axis < 3; axis++) {
          if (this.size[axis] != finest) {
            continue;
          }
          for (int sign = -1; sign <= 1; sign += 2) {
            int c = at[axis] + sign;
            int j = i + sign * steps[axis];
            if (c >= 0 && c < extent[axis] && labels[j] == labels[i] && depth[j] > level) {
              depth[j] = (byte) level;
              next[nextSize++] = j;
            }
          }
        }
      }
      int[] swap = frontier;
      frontier = next;
      next = swap;
      count = nextSize;
    }
    return depth;
  }

  private boolean touchesOtherLabelAlongFinestAxes(int i) {
    int[] at = {i % nx, (i / nx) % ny, i / (nx * ny)};
    int[] extent = {nx, ny, nz};
    int[] steps = {1, nx, nx * ny};
    for (int axis = 0; axis < 3; axis++) {
      if (size[axis] != finest) {
        continue;
      }
      if ((at[axis] > 0 && labels[i - steps[axis]] != labels[i])
          || (at[axis] < extent[axis] - 1 && labels[i + steps[axis]] != labels[i])) {
        return true;
      }
    }
    return false;
  }

  private void falseBoundaries(float[] a) {
    SplittableRandom random = stream(FALSE_BOUNDARY_STREAM);
    double radius = Degradation.FALSE_BOUNDARY_RADIUS_VOXELS * finest;
    for (int c = 0; c < n; c++) {
      if (labels[c] == 0 || random.nextDouble() >= degradation.falseBoundaryRate()) {
        continue;
      }
      double[] normal = TissueLayout.normalized(new double[] {gaussian(random),
          gaussian(random), gaussian(random)});
      int centre = c;
      forEdgesInBall(c, radius, (p, q, k) -> {
        if (labels[p] != 0 && labels[p] == labels[q]
            && side(p, centre, normal) != side(q, centre, normal)) {
          a[k * n + p] = (float) (0.15 * random.nextDouble());
        }
      });
    }
  }

  /** Which side of the plane through voxel {@code c} with {@code normal} voxel {@code p} is on. */
  private boolean side(int p, int c, double[] normal) {
    double dx = (p % nx - c % nx) * size[0];
    double dy = ((p / nx) % ny - (c / nx) % ny) * size[1];
    double dz = (p / (nx * ny) - c / (nx * ny)) * size[2];
    return dx * normal[0] + dy * normal[1] + dz * normal[2] >= 0;
  }

  @FunctionalInterface
  private interface EdgeAction {
    void apply(int p, int q, int channel);
  }

  /** Every edge (p, p + offset_k) with both ends within {@code radius} (nm) of voxel c. */
  private void forEdgesInBall(int c, double radius, EdgeAction action) {
    int cx = c % nx;
    int cy = (c / nx) % ny;
    int cz = c / (nx * ny);
    int rx = (int) Math.floor(radius / size[0]);
    int ry = (int) Math.floor(radius / size[1]);
    int rz = (int) Math.floor(radius / size[2]);
    for (int z = Math.max(0, cz - rz); z <= Math.min(nz - 1, cz + rz); z++) {
      for (int y = Math.max(0, cy - ry); y <= Math.min(ny - 1, cy + ry); y++) {
        for (int x = Math.max(0, cx - rx); x <= Math.min(nx - 1, cx + rx); x++) {
          if (!within(x - cx, y - cy, z - cz, radius)) {
            continue;
          }
          int p = x + nx * (y + ny * z);
          for (int k = 0; k < offsets.length; k++) {
            int[] d = offsets[k];
            int qx = x + d[0];
            int qy = y + d[1];
            int qz = z + d[2];
            if (qx >= 0 && qy >= 0 && qz >= 0 && qx < nx && qy < ny && qz < nz
                && within(qx - cx, qy - cy, qz - cz, radius)) {
              action.apply(p, qx + nx * (qy + ny * qz), k);
            }
          }
        }
      }
    }
  }

  private boolean within(int dx, int dy, int dz, double radius) {
    double x = dx * size[0];
    double y = dy * size[1];
    double z = dz * size[2];
    return x * x + y * y + z * z <= radius * radius;
  }

  private boolean touchesOtherObject(int i) {
    int x = i % nx;
    int y = (i / nx) % ny;
    int z = i / (nx * ny);
    return other(i, x > 0, -1) || other(i, x < nx - 1, 1) || other(i, y > 0, -nx)
        || other(i, y < ny - 1, nx) || other(i, z > 0, -nx * ny)
        || other(i, z < nz - 1, nx * ny);
  }

  private boolean other(int i, boolean inside, int step) {
    return inside && labels[i + step] != 0 && labels[i + step] != labels[i];
  }

  private void blur(float[] a) {
    for (int k = 0; k < offsets.length; k++) {
      blurChannel(a, k * n, degradation.blurSigma());
    }
  }

  /** Blurs the {@code n} values from {@code base} with σ = {@code sigma} finest voxels. */
  private void blurChannel(float[] a, int base, double sigma) {
    int[] extent = {nx, ny, nz};
    int[] stride = {1, nx, nx * ny};
    float[] source = null;
    for (int axis = 0; axis < 3; axis++) {
      double axisSigma = sigma * finest / size[axis];
      int radius = (int) Math.ceil(3 * axisSigma);
      if (radius == 0 || extent[axis] == 1) {
        continue;
      }
      double[] kernel = gaussianKernel(axisSigma, radius);
      if (axis == 0) {
        blurRows(a, base, kernel, radius);
      } else {
        source = source != null ? source : new float[n];
        System.arraycopy(a, base, source, 0, n);
        blurAcrossRows(source, a, base, stride[axis], extent[axis], kernel, radius);
      }
    }
  }

  /** Blurs along x, one contiguous row at a time. */
  private void blurRows(float[] a, int base, double[] kernel, int radius) {
    double[] line = new double[nx];
    for (int row = base; row < base + n; row += nx) {
      for (int t = 0; t < nx; t++) {
        line[t] = a[row + t];
      }
      for (int t = 0; t < nx; t++) {
        double sum = 0;
        for (int j = -radius; j <= radius; j++) {
          int s = t + j;
          s = s < 0 ? 0 : (s >= nx ? nx - 1 : s);
          sum += kernel[j + radius] * line[s];
        }
        a[row + t] = (float) sum;
      }
    }
  }

  /**
   * Blurs along y or z: each output run of {@code stride} contiguous values is a weighted sum
   * of whole shifted runs of the source, so memory is read in order.
   */
  private void blurAcrossRows(float[] source, float[] a, int base, int stride, int length,
      double[] kernel, int radius) {
    int block = stride * length;
    for (int outer = 0; outer < n; outer += block) {
      for (int t = 0; t < length; t++) {
        int to = base + outer + t * stride;
        java.util.Arrays.fill(a, to, to + stride, 0f);
        for (int j = -radius; j <= radius; j++) {
          int s = t + j;
          s = s < 0 ? 0 : (s >= length ? length - 1 : s);
          int from = outer + s * stride;
          float w = (float) kernel[j + radius];
          for (int i = 0; i < stride; i++) {
            a[to + i] += w * source[from + i];
          }
        }
      }
    }
  }

  private static double[] gaussianKernel(double sigma, int radius) {
    double[] kernel = new double[2 * radius + 1];
    double sum = 0;
    for (int j = -radius; j <= radius; j++) {
      kernel[j + radius] = Math.exp(-0.5 * j * j / (sigma * sigma));
      sum += kernel[j + radius];
    }
    for (int j = 0; j < kernel.length; j++) {
      kernel[j] /= sum;
    }
    return kernel;
  }

  private void noise(float[] a) {
    SplittableRandom random = stream(NOISE_STREAM);
    float[] field = degradation.correlatedNoiseSigma() > 0 ? smoothField() : null;
    for (int k = 0; k < offsets.length; k++) {
      double factor = longRange[k] ? degradation.longRangeNoiseFactor() : 1;
      double sigma = degradation.noiseSigma() * factor;
      double fieldSigma = degradation.correlatedNoiseSigma() * factor;
      for (int i = 0, at = k * n; i < n; i++, at++) {
        double v = a[at] + sigma * gaussian(random) + (field != null ? fieldSigma * field[i] : 0);
        a[at] = (float) (v < 0 ? 0 : (v > 1 ? 1 : v));
      }
    }
  }

  /** White noise blurred to the correlation length, rescaled to unit sample variance. */
  private float[] smoothField() {
    SplittableRandom random = stream(FIELD_STREAM);
    float[] field = new float[n];
    for (int i = 0; i < n; i++) {
      field[i] = (float) gaussian(random);
    }
    blurChannel(field, 0, Degradation.NOISE_CORRELATION_VOXELS);
    double sum = 0;
    double squares = 0;
    for (float v : field) {
      sum += v;
      squares += (double) v * v;
    }
    double mean = sum / n;
    double sd = Math.sqrt(Math.max(squares / n - mean * mean, 1e-30));
    for (int i = 0; i < n; i++) {
      field[i] = (float) ((field[i] - mean) / sd);
    }
    return field;
  }

  private void corruptSlices(float[] a) {
    SplittableRandom random = stream(SLICE_STREAM);
    int plane = nx * ny;
    for (int z = 0; z < nz; z++) {
      if (random.nextDouble() >= degradation.corruptSliceProbability()) {
        continue;
      }
      for (int k = 0; k < offsets.length; k++) {
        int base = k * n + z * plane;
        for (int i = 0; i < plane; i++) {
          a[base + i] = (float) random.nextDouble();
        }
      }
    }
  }

  private void missingSlices(float[] a) {
    SplittableRandom random = stream(MISSING_STREAM);
    boolean[] missing = new boolean[nz];
    boolean any = false;
    for (int z = 0; z < nz; z++) {
      missing[z] = random.nextDouble() < degradation.missingSliceProbability();
      any |= missing[z];
    }
    if (!any) {
      return;
    }
    int plane = nx * ny;
    for (int k = 0; k < offsets.length; k++) {
      int dz = offsets[k][2];
      for (int z = 0; z < nz; z++) {
        int qz = z + dz;
        if (!missing[z] && (qz < 0 || qz >= nz || !missing[qz])) {
          continue;
        }
        int base = k * n + z * plane;
        for (int i = 0; i < plane; i++) {
          a[base + i] = (float) (0.3 + 0.2 * random.nextDouble());
        }
      }
    }
  }

  /** A standard normal draw (the JDK's ziggurat-based {@code RandomGenerator.nextGaussian}). */
  private static double gaussian(SplittableRandom random) {
    return random.nextGaussian();
  }
}
