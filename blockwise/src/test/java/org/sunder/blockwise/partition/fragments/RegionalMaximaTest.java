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

  /**
   * The plateau of 1s along y = 0 has a larger neighbour (the 3 below its middle) at its three
   * middle voxels only: its two ends have none, and their pieces, which touch only through the
   * middle, are no seeds either.
   */
  @Test
  void plateauWithALargerNeighbourAnywhereIsNoSeedEvenWhereItsPiecesTouchOnlyThroughIt() {
    double[] values = {1, 1, 1, 1, 1, 0, 0, 3, 0, 0};
    assertArrayEquals(new int[] {0, 0, 0, 0, 0, 0, 0, 1, 0, 0},
        RegionalMaxima.label(values, ones(10), new int[] {5, 2}, -1));
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

  /**
   * On random boxes with ineligible voxels and slice planes, checked against the definition by
   * brute force (each voxel's neighbours enumerated by coordinates): a voxel is a seed exactly
   * when no voxel of its plateau has a higher eligible neighbour, and a plateau is one seed.
   */
  @Test
  void seedsAreThePlateausWithoutAHigherNeighbourOnRandomBoxes() {
    Random random = new Random(29);
    for (int trial = 0; trial < 40; trial++) {
      int[] shape = {1 + random.nextInt(9), 1 + random.nextInt(7), 1 + random.nextInt(6)};
      int sliceAxis = new int[] {-1, 2, 0}[trial % 3];
      int n = VoxelBox.size(shape);
      double[] values = new double[n];
      byte[] eligible = new byte[n];
      for (int i = 0; i < n; i++) {
        values[i] = random.nextInt(4);
        eligible[i] = (byte) (random.nextDouble() < 0.8 ? 1 : 0);
      }
      int[] labels = RegionalMaxima.label(values, eligible, shape, sliceAxis);
      int[] plateau = new int[n];
      for (int i = 0; i < n; i++) {
        plateau[i] = i;
      }
      boolean[] higher = new boolean[n];
      for (int i = 0; i < n; i++) {
        for (int j : neighbours(i, shape, sliceAxis)) {
          if (eligible[i] != 0 && eligible[j] != 0) {
            higher[i] |= values[j] > values[i];
            if (values[j] == values[i]) {
              plateau[root(plateau, i)] = root(plateau, j);
            }
          }
        }
      }
      boolean[] plateauHigher = new boolean[n];
      for (int i = 0; i < n; i++) {
        plateauHigher[root(plateau, i)] |= higher[i];
      }
      int[] seedOfPlateau = new int[n];
      for (int i = 0; i < n; i++) {
        boolean seed = eligible[i] != 0 && !plateauHigher[root(plateau, i)];
        assertEquals(seed, labels[i] > 0, "trial " + trial + " voxel " + i);
        if (seed) {
          int r = root(plateau, i);
          if (seedOfPlateau[r] == 0) {
            seedOfPlateau[r] = labels[i];
          }
          assertEquals(seedOfPlateau[r], labels[i], "trial " + trial + " voxel " + i);
        }
      }
    }
  }

  private static int root(int[] parent, int i) {
    while (parent[i] != i) {
      i = parent[i];
    }
    return i;
  }

  /** The full neighbourhood of {@code i}, inside the slice plane when an axis is given. */
  private static List<Integer> neighbours(int i, int[] shape, int sliceAxis) {
    int[] c = {i % shape[0], i / shape[0] % shape[1], i / (shape[0] * shape[1])};
    List<Integer> out = new ArrayList<>();
    for (int dz = -1; dz <= 1; dz++) {
      for (int dy = -1; dy <= 1; dy++) {
        for (int dx = -1; dx <= 1; dx++) {
          int[] step = {dx, dy, dz};
          boolean inside = !(dx == 0 && dy == 0 && dz == 0);
          for (int d = 0; d < 3; d++) {
            int q = c[d] + step[d];
            inside &= q >= 0 && q < shape[d] && (d != sliceAxis || step[d] == 0);
          }
          if (inside) {
            out.add(c[0] + dx + shape[0] * (c[1] + dy + shape[1] * (c[2] + dz)));
          }
        }
      }
    }
    return out;
  }

  static byte[] ones(int n) {
    byte[] b = new byte[n];
    Arrays.fill(b, (byte) 1);
    return b;
  }
}
