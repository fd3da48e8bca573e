package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.testing.PythonReference;

class GaussianSmoothingTest {

  /**
   * Reference: scipy.ndimage.gaussian_filter with mode 'reflect' (our mirror, {@code b a | a b})
   * and truncate 3.0, whose radius {@code int(3σ + 0.5)} equals ours ({@code ⌈3σ⌉}) for the σ
   * of 1 and 2 voxels used here; an axis of σ 0 is left alone by both.
   */
  @Test
  void agreesWithScipyGaussianFilter(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "scipy.ndimage");
    int[] shape = {19, 11, 7};
    double[] values = new double[19 * 11 * 7];
    Random random = new Random(17);
    for (int i = 0; i < values.length; i++) {
      values[i] = random.nextInt(5) * random.nextDouble();
    }
    ReferenceFiles.write(dir, "v", values);
    GaussianSmoothing.smooth(values, shape, new double[] {1.0, 2.0, 0});
    PythonReference.runChecked("""
        import sys, numpy as np
        from scipy import ndimage
        d = sys.argv[1]
        v = np.fromfile(d + '/v', dtype='<f8').reshape(7, 11, 19)
        out = ndimage.gaussian_filter(v, sigma=(0, 2.0, 1.0), mode='reflect', truncate=3.0)
        out.astype('<f8').tofile(d + '/out')
        """, dir.toString());
    assertArrayEquals(ReferenceFiles.readDoubles(dir.resolve("out")), values, 1e-12);
  }

  /**
   * Random boxes (strides that are and are not multiples of the lines copied at once, axes of
   * one voxel) and σ per axis: the same doubles, bit for bit, as convolving voxel by voxel, one
   * axis after the other, each sum taken in kernel order.
   */
  @Test
  void smoothsEveryLineAsAVoxelByVoxelConvolution() {
    Random random = new Random(29);
    for (int trial = 0; trial < 40; trial++) {
      int[] shape = {1 + random.nextInt(40), 1 + random.nextInt(20), 1 + random.nextInt(5)};
      double[] sigma = new double[3];
      for (int d = 0; d < 3; d++) {
        sigma[d] = random.nextInt(4) == 0 ? 0 : 0.1 + 1.5 * random.nextDouble();
      }
      double[] values = new double[shape[0] * shape[1] * shape[2]];
      for (int i = 0; i < values.length; i++) {
        values[i] = 100 * random.nextDouble();
      }
      double[] expected = values.clone();
      int stride = 1;
      for (int d = 0; d < 3; d++) {
        if (sigma[d] > 0 && shape[d] > 1) {
          double[] kernel = GaussianSmoothing.kernel(sigma[d]);
          int radius = kernel.length / 2;
          double[] before = expected.clone();
          for (int i = 0; i < values.length; i++) {
            int c = i / stride % shape[d];
            double sum = 0;
            for (int t = -radius; t <= radius; t++) {
              int m = Math.floorMod(c + t, 2 * shape[d]);
              m = m < shape[d] ? m : 2 * shape[d] - 1 - m;
              sum += kernel[t + radius] * before[i + (m - c) * stride];
            }
            expected[i] = sum;
          }
        }
        stride *= shape[d];
      }
      GaussianSmoothing.smooth(values, shape, sigma);
      assertArrayEquals(expected, values);
    }
  }

  /**
   * On random boxes whose "interior" values lie in {@code [smallest, largest]} and the others in
   * {@code [0, largest]}: where {@link GaussianSmoothing#changesNothing} says so for every axis,
   * smoothing leaves each interior value bit for bit as it was.
   */
  @Test
  void changesNothingMeansInteriorValuesStayBitForBit() {
    Random random = new Random(23);
    int[] shape = {13, 9, 6};
    int checked = 0;
    for (int trial = 0; trial < 60; trial++) {
      double sigma = new double[] {0.05, 0.1, 0.11, 0.115}[trial % 4];
      double smallest = new double[] {1, 4, 10}[trial % 3];
      double largest = smallest * (1 + random.nextInt(2000));
      if (!GaussianSmoothing.changesNothing(sigma, smallest, largest)) {
        continue;
      }
      double[] values = new double[13 * 9 * 6];
      boolean[] interior = new boolean[values.length];
      for (int i = 0; i < values.length; i++) {
        interior[i] = random.nextBoolean();
        values[i] = interior[i] ? smallest + (largest - smallest) * random.nextDouble()
            : largest * random.nextDouble();
      }
      double[] smoothed = values.clone();
      GaussianSmoothing.smooth(smoothed, shape, new double[] {sigma, sigma, sigma});
      for (int i = 0; i < values.length; i++) {
        if (interior[i]) {
          assertEquals(values[i], smoothed[i], 0.0, "trial " + trial + " voxel " + i);
        }
      }
      checked++;
    }
    assertTrue(checked >= 20, checked + " trials qualified");
  }

  /** A tenth of a voxel qualifies; an eighth does not, and it does change values. */
  @Test
  void changesNothingOnlyWhereNothingChanges() {
    assertTrue(GaussianSmoothing.changesNothing(0.1, 10, 6081));
    assertTrue(GaussianSmoothing.changesNothing(0, 1, 1e300));
    assertFalse(GaussianSmoothing.changesNothing(0.125, 8, 4000));
    assertFalse(GaussianSmoothing.changesNothing(1.0, 1, 2));
    double[] line = {8, 9, 8};
    GaussianSmoothing.smooth(line, new int[] {3}, new double[] {0.125});
    assertTrue(line[1] != 9, "σ = 1/8 moves the middle value: " + line[1]);
  }
}
