package org.sunder.blockwise.partition.fragments;

/**
 * Separable Gaussian smoothing of a box in place, kernel truncated at 3σ and normalised, mirror
 * boundary ({@code … b a | a b …}). {@code sigma[d] <= 0} leaves axis {@code d} alone.
 * Time {@code O(n · Σ_d σ_d)}.
 */
final class GaussianSmoothing {
  private GaussianSmoothing() {}

  static void smooth(double[] values, int[] shape, double[] sigma) {
    int n = values.length;
    int stride = 1;
    int longest = 1;
    for (int s : shape) {
      longest = Math.max(longest, s);
    }
    double[] tile = new double[longest * LineTiles.WIDTH];
    double[] line = new double[longest];
    for (int d = 0; d < shape.length; d++) {
      int length = shape[d];
      if (sigma[d] > 0 && length > 1) {
        double[] kernel = kernel(sigma[d]);
        int block = stride * length;
        for (int outer = 0; outer < n; outer += block) {
          if (stride == 1) {
            System.arraycopy(values, outer, line, 0, length);
            for (int q = 0; q < length; q++) {
              values[outer + q] = convolve(line, length, q, kernel);
            }
            continue;
          }
          for (int inner = 0; inner < stride; inner += LineTiles.WIDTH) {
            int width = Math.min(LineTiles.WIDTH, stride - inner);
            int start = outer + inner;
            LineTiles.gather(values, start, stride, length, width, tile);
            for (int q = 0, i = start; q < length; q++, i += stride) {
              convolveTile(tile, width, length, q, kernel, values, i);
            }
          }
        }
      }
      stride *= length;
    }
  }

  /**
   * Value {@code q} of each of a tile's lines ({@link LineTiles}), written to
   * {@code out[at .. at + width − 1]}; each sum taken in the order {@link #convolve} takes it.
   */
  private static void convolveTile(double[] tile, int width, int length, int q,
      double[] kernel, double[] out, int at) {
    int radius = kernel.length / 2;
    for (int w = 0; w < width; w++) {
      out[at + w] = 0;
    }
    for (int t = -radius; t <= radius; t++) {
      double k = kernel[t + radius];
      int from = mirror(q + t, length) * width;
      for (int w = 0; w < width; w++) {
        out[at + w] += k * tile[from + w];
      }
    }
  }

  private static double convolve(double[] line, int length, int q, double[] kernel) {
    int radius = kernel.length / 2;
    double sum = 0;
    if (q >= radius && q + radius < length) {
      for (int t = 0, i = q - radius; t < kernel.length; t++, i++) {
        sum += kernel[t] * line[i];
      }
      return sum;
    }
    for (int t = -radius; t <= radius; t++) {
      sum += kernel[t + radius] * line[mirror(q + t, length)];
    }
    return sum;
  }

  /**
   * Whether smoothing with {@code sigma} along an axis leaves every value in
   * {@code [smallest, largest]} ({@code 0 < smallest}) bit for bit as it is, whatever its
   * neighbours in that range or in {@code [0, largest]}: the kernel's centre weight is 1 in
   * double arithmetic, and all its other weights times {@code largest} add up to less than a
   * quarter of a unit in the last place of {@code smallest}, so each sum rounds back to the
   * centre value.
   * A σ of a tenth of a voxel qualifies (weight 2·10⁻²² one voxel away); one of an eighth does
   * not (10⁻¹⁴).
   */
  static boolean changesNothing(double sigma, double smallest, double largest) {
    if (sigma <= 0) {
      return true;
    }
    double[] k = kernel(sigma);
    int radius = k.length / 2;
    double others = 0;
    for (int t = 0; t < k.length; t++) {
      others += t == radius ? 0 : k[t] * largest;
    }
    return k[radius] == 1.0 && others < smallest * 0x1p-54;
  }

  private static int mirror(int i, int length) {
    int period = 2 * length;
    int m = Math.floorMod(i, period);
    return m < length ? m : period - 1 - m;
  }

  static double[] kernel(double sigma) {
    int radius = Math.max(1, (int) Math.ceil(3 * sigma));
    double[] k = new double[2 * radius + 1];
    double sum = 0;
    for (int t = -radius; t <= radius; t++) {
      k[t + radius] = Math.exp(-0.5 * t * t / (sigma * sigma));
      sum += k[t + radius];
    }
    for (int t = 0; t < k.length; t++) {
      k[t] /= sum;
    }
    return k;
  }
}
