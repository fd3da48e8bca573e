package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.testing.PythonReference;

class DistanceTransformTest {

  @Test
  void lineWithOneBackgroundVoxelGivesScaledDistances() {
    byte[] fg = {1, 1, 1, 0, 1, 1, 1};
    double[] d = DistanceTransform.of(2.0).distances(fg, new int[] {7});
    assertArrayEquals(new double[] {6, 4, 2, 0, 2, 4, 6}, d, 1e-12);
  }

  @Test
  void equalsBruteForceOnRandomAnisotropicBoxes() {
    Random random = new Random(13);
    double[] spacing = {1.0, 1.5, 3.0};
    for (int trial = 0; trial < 20; trial++) {
      // strides below, above and across the lines a tile holds (LineTiles.WIDTH)
      int[] shape = trial % 2 == 0 ? new int[] {7, 5, 4} : new int[] {19, 21, 3};
      byte[] fg = randomForeground(random, shape[0] * shape[1] * shape[2],
          0.6 + 0.35 * random.nextDouble());
      double[] fast = DistanceTransform.of(spacing).distances(fg, shape);
      double[] slow = bruteForce(fg, shape, spacing, -1);
      assertArrayEquals(slow, fast, 1e-9, "trial " + trial);
      boolean[] inPlane = {true, true, false};
      double[] perSlice = DistanceTransform.of(spacing, inPlane).distances(fg, shape);
      assertArrayEquals(bruteForce(fg, shape, spacing, 2), perSlice, 1e-9, "slices " + trial);
    }
  }

  /**
   * The first axis's lines hold only 0 and infinity and skip the envelope: the same values bit
   * for bit as the envelope's (seeds compare distances for equality), spacings that are not
   * binary fractions included.
   */
  @Test
  void binaryLinesEqualTheEnvelopeBitForBit() {
    Random random = new Random(31);
    for (int trial = 0; trial < 500; trial++) {
      int length = 1 + random.nextInt(60);
      double s = new double[] {1.0, 4.0, 0.1, 3.7, 1 / 3.0}[trial % 5];
      double background = random.nextDouble();
      DistanceTransform.LineBuffers envelope = new DistanceTransform.LineBuffers(length);
      DistanceTransform.LineBuffers scans = new DistanceTransform.LineBuffers(length);
      for (int q = 0; q < length; q++) {
        double value = random.nextDouble() < background ? 0 : Double.POSITIVE_INFINITY;
        envelope.line[q] = value;
        scans.line[q] = value;
      }
      DistanceTransform.transformLine(envelope, length, s);
      DistanceTransform.binaryLine(scans, length, s);
      assertArrayEquals(envelope.result, scans.result, 0.0, "trial " + trial);
    }
  }

  @Test
  void voxelsWithoutReachableBackgroundAreInfinite() {
    byte[] fg = new byte[3 * 2 * 2];
    java.util.Arrays.fill(fg, (byte) 1);
    fg[0] = 0;
    double[] d = DistanceTransform.of(new double[] {1, 1, 1}, new boolean[] {true, true, false})
        .distances(fg, new int[] {3, 2, 2});
    assertEquals(Math.sqrt(5), d[5], 1e-12);
    for (int i = 6; i < 12; i++) {
      assertEquals(Double.POSITIVE_INFINITY, d[i]);
    }
  }

  @Test
  void rejectsBadSpacingAndShapes() {
    assertThrows(IllegalArgumentException.class, () -> DistanceTransform.of(1.0, 0.0));
    assertThrows(IllegalArgumentException.class, () -> DistanceTransform.of(1.0, Double.NaN));
    assertThrows(IllegalArgumentException.class,
        () -> DistanceTransform.of(1.0, 1.0).distances(new byte[5], new int[] {2, 3}));
  }

  /** Reference: scipy.ndimage.distance_transform_edt with sampling (Debian's scipy). */
  @Test
  void agreesWithScipyDistanceTransformEdt(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "scipy.ndimage");
    Random random = new Random(13);
    List<int[]> shapes = List.of(new int[] {7}, new int[] {23, 17, 9}, new int[] {31, 12, 6},
        new int[] {40, 33});
    List<double[]> spacings = List.of(new double[] {2.0}, new double[] {1.0, 1.0, 4.0},
        new double[] {0.5, 1.25, 3.0}, new double[] {1.0, 2.5});
    List<String> manifest = new ArrayList<>();
    List<double[]> ours = new ArrayList<>();
    for (int c = 0; c < shapes.size(); c++) {
      int[] shape = shapes.get(c);
      byte[] fg = c == 0 ? new byte[] {1, 1, 1, 0, 1, 1, 1}
          : randomForeground(random, VoxelBox.size(shape), 0.93);
      ReferenceFiles.write(dir, "fg" + c, fg);
      ours.add(DistanceTransform.of(spacings.get(c)).distances(fg, shape));
      StringBuilder line = new StringBuilder("fg" + c);
      for (int d = shape.length - 1; d >= 0; d--) {
        line.append(' ').append(shape[d]);
      }
      line.append(" /");
      for (int d = shape.length - 1; d >= 0; d--) {
        line.append(' ').append(spacings.get(c)[d]);
      }
      manifest.add(line.toString());
    }
    Files.write(dir.resolve("manifest"), manifest);
    PythonReference.runChecked("""
        import sys, numpy as np
        from scipy import ndimage
        d = sys.argv[1]
        for line in open(d + '/manifest'):
            name, rest = line.split(' ', 1)
            dims, samp = rest.split('/')
            shape = [int(s) for s in dims.split()]
            sampling = [float(s) for s in samp.split()]
            fg = np.fromfile(d + '/' + name, dtype=np.uint8).reshape(shape)
            out = ndimage.distance_transform_edt(fg, sampling=sampling)
            out.astype('<f8').tofile(d + '/' + name + '.edt')
        """, dir.toString());
    double[] known = ReferenceFiles.readDoubles(dir.resolve("fg0.edt"));
    assertArrayEquals(new double[] {6, 4, 2, 0, 2, 4, 6}, known, 1e-12,
        "scipy on the known case");
    for (int c = 1; c < shapes.size(); c++) {
      double[] reference = ReferenceFiles.readDoubles(dir.resolve("fg" + c + ".edt"));
      assertArrayEquals(reference, ours.get(c), 1e-6, "case " + c);
    }
  }

  static byte[] randomForeground(Random random, int n, double fraction) {
    byte[] fg = new byte[n];
    for (int i = 0; i < n; i++) {
      fg[i] = (byte) (random.nextDouble() < fraction ? 1 : 0);
    }
    fg[random.nextInt(n)] = 0;
    return fg;
  }

  private static double[] bruteForce(byte[] fg, int[] shape, double[] spacing, int sliceAxis) {
    int n = fg.length;
    double[] out = new double[n];
    int[] a = new int[shape.length];
    for (int i = 0; i < n; i++) {
      if (fg[i] == 0) {
        out[i] = 0;
        VoxelBox.advance(a, shape);
        continue;
      }
      double best = Double.POSITIVE_INFINITY;
      int[] b = new int[shape.length];
      for (int j = 0; j < n; j++) {
        if (fg[j] == 0 && (sliceAxis < 0 || a[sliceAxis] == b[sliceAxis])) {
          double s = 0;
          for (int d = 0; d < shape.length; d++) {
            double dx = (a[d] - b[d]) * spacing[d];
            s += dx * dx;
          }
          best = Math.min(best, s);
        }
        VoxelBox.advance(b, shape);
      }
      out[i] = Math.sqrt(best);
      VoxelBox.advance(a, shape);
    }
    return out;
  }
}
