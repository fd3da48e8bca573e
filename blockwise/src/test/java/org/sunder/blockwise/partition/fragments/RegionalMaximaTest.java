package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.testing.PythonReference;

class RegionalMaximaTest {

  @Test
  void plateauWithoutHigherNeighbourIsOneSeed() {
    double[] values = {0, 2, 2, 1, 3};
    int[] labels = RegionalMaxima.label(values, ones(5), new int[] {5}, -1);
    assertArrayEquals(new int[] {0, 1, 1, 0, 2}, labels);
  }

  @Test
  void ineligibleVoxelsTakeNoPartSoEveryEligibleComponentHasASeed() {
    double[] values = {0, 5, 1, 2, 1};
    byte[] eligible = {1, 0, 1, 1, 1};
    assertArrayEquals(new int[] {1, 0, 0, 2, 0},
        RegionalMaxima.label(values, eligible, new int[] {5}, -1));
  }

  @Test
  void sliceModeKeepsMaximaApartAcrossPlanes() {
    int[] shape = {3, 2, 2};
    double[] values = new double[12];
    values[0] = 1;
    values[6] = 4;
    int[] labels = RegionalMaxima.label(values, ones(12), shape, 2);
    assertEquals(1, labels[0]);
    assertEquals(2, labels[6]);
    assertEquals(0, RegionalMaxima.label(values, ones(12), shape, -1)[0]);
  }

  /**
   * Reference: skimage.morphology.local_maxima (scikit-image 0.19) with full connectivity and
   * allow_borders=True; plateaus counted with scipy.ndimage.label and a full 3x3x3 structure.
   */
  @Test
  void agreesWithScikitImageLocalMaxima(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "skimage.morphology", "scipy.ndimage");
    Random random = new Random(13);
    int[][] shapes = {{5}, {17, 11, 6}, {13, 9, 7}, {21, 8, 5}};
    List<String> manifest = new ArrayList<>();
    List<int[]> ours = new ArrayList<>();
    for (int c = 0; c < shapes.length; c++) {
      int[] shape = shapes[c];
      int n = VoxelBox.size(shape);
      double[] values = new double[n];
      for (int i = 0; i < n; i++) {
        values[i] = c == 0 ? new double[] {0, 2, 2, 1, 3}[i] : random.nextInt(4 + c);
      }
      ReferenceFiles.write(dir, "v" + c, values);
      ours.add(RegionalMaxima.label(values, ones(n), shape, -1));
      StringBuilder line = new StringBuilder(String.valueOf(c));
      for (int d = shape.length - 1; d >= 0; d--) {
        line.append(' ').append(shape[d]);
      }
      manifest.add(line.toString());
    }
    Files.write(dir.resolve("manifest"), manifest);
    String counts = PythonReference.runChecked("""
        import sys, numpy as np
        from skimage.morphology import local_maxima
        from scipy import ndimage
        d = sys.argv[1]
        for line in open(d + '/manifest'):
            parts = line.split()
            c, shape = parts[0], [int(s) for s in parts[1:]]
            v = np.fromfile(d + '/v' + c, dtype='<f8').reshape(shape)
            peaks = local_maxima(v, connectivity=v.ndim, allow_borders=True)
            peaks.astype(np.uint8).tofile(d + '/p' + c)
            _, count = ndimage.label(peaks, structure=np.ones((3,) * v.ndim))
            print(count)
        """, dir.toString());
    String[] count = counts.strip().split("\\s+");
    byte[] known = Files.readAllBytes(dir.resolve("p0"));
    assertArrayEquals(new byte[] {0, 1, 1, 0, 1}, known, "scikit-image on the known line");
    for (int c = 0; c < shapes.length; c++) {
      byte[] reference = Files.readAllBytes(dir.resolve("p" + c));
      int[] mine = ours.get(c);
      for (int i = 0; i < mine.length; i++) {
        assertEquals(reference[i] != 0, mine[i] > 0, "case " + c + " voxel " + i);
      }
      int seeds = Arrays.stream(mine).max().orElse(0);
      assertEquals(Integer.parseInt(count[c]), seeds, "plateau count of case " + c);
    }
  }

  static byte[] ones(int n) {
    byte[] b = new byte[n];
    Arrays.fill(b, (byte) 1);
    return b;
  }
}
