package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.collections.LevelQueue;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.testing.PythonReference;

class SeededWatershedTest {

  @Test
  void ridgeSeparatesTwoBasins() {
    float[] boundary = {0.1f, 0.5f, 0.9f, 0.4f, 0.0f};
    int[] markers = {1, 0, 0, 0, 2};
    int[] labels = SeededWatershed.flood(boundary, new int[] {5}, markers, null, -1);
    assertArrayEquals(new int[] {1, 1, 2, 2, 2}, labels);
  }

  @Test
  void randomFloodsLabelEveryMaskedVoxelFromConnectedSeeds() {
    Random random = new Random(13);
    int[] shape = {11, 8, 5};
    int n = VoxelBox.size(shape);
    for (int trial = 0; trial < 30; trial++) {
      int sliceAxis = trial % 2 == 0 ? -1 : 2;
      float[] boundary = randomBoundary(random, n, trial % 3 == 0 ? 4 : 0);
      byte[] mask = trial % 4 == 1 ? randomMask(random, n) : null;
      int[] markers = randomMarkers(random, n, 0.03);
      int[] labels = SeededWatershed.flood(boundary, shape, markers, mask, sliceAxis);
      int largestMarker = 0;
      for (int i = 0; i < n; i++) {
        largestMarker = Math.max(largestMarker, markers[i]);
        boolean inside = mask == null || mask[i] != 0;
        assertEquals(inside, labels[i] > 0, "voxel " + i);
        if (inside && markers[i] > 0) {
          assertEquals(markers[i], labels[i]);
        }
      }
      assertEachLabelConnectedToItsSeed(labels, markers, mask, shape, sliceAxis, largestMarker);
    }
  }

  @Test
  void bucketQueueAndHeapFloodAlike() {
    Random random = new Random(13);
    int[] shape = {21, 14, 9};
    int n = VoxelBox.size(shape);
    for (int trial = 0; trial < 12; trial++) {
      float[] boundary = randomBoundary(random, n, trial % 2 == 0 ? 7 : 0);
      int[] markers = randomMarkers(random, n, 0.02);
      byte[] mask = trial % 3 == 0 ? randomMask(random, n) : null;
      int sliceAxis = trial % 4 == 1 ? 2 : -1;
      assertArrayEquals(SeededWatershed.flood(boundary, shape, markers, mask, sliceAxis, false),
          SeededWatershed.flood(boundary, shape, markers, mask, sliceAxis, true),
          "trial " + trial);
    }
    assertTrue(LevelQueue.forPriorities(randomBoundary(random, 5000, 0), 4096) == null);
  }

  /**
   * Planes along the last axis flood one after another; each must come out as that plane alone
   * flooded as a 2D box (ties included: coarse boundary levels make many).
   */
  @Test
  void perSliceFloodEqualsEachPlaneFloodedAlone() {
    Random random = new Random(29);
    int[] shape = {17, 12, 6};
    int plane = shape[0] * shape[1];
    int n = VoxelBox.size(shape);
    for (int trial = 0; trial < 12; trial++) {
      float[] boundary = randomBoundary(random, n, trial % 2 == 0 ? 5 : 0);
      int[] markers = randomMarkers(random, n, 0.03);
      for (int z = 0; z < shape[2]; z++) {
        markers[z * plane + random.nextInt(plane)] = 1000 + z;
      }
      boolean buckets = trial % 3 != 0;
      int[] labels = SeededWatershed.flood(boundary, shape, markers, null, 2, buckets);
      for (int z = 0; z < shape[2]; z++) {
        int from = z * plane;
        int[] alone = SeededWatershed.flood(
            Arrays.copyOfRange(boundary, from, from + plane),
            new int[] {shape[0], shape[1], 1},
            Arrays.copyOfRange(markers, from, from + plane), null, -1, buckets);
        assertArrayEquals(alone, Arrays.copyOfRange(labels, from, from + plane),
            "trial " + trial + ", plane " + z);
      }
    }
  }

  @Test
  void tiesFollowInsertionOrder() {
    float[] boundary = new float[6];
    int[] markers = {1, 0, 0, 0, 0, 2};
    int[] labels = SeededWatershed.flood(boundary, new int[] {6}, markers, null, -1);
    assertArrayEquals(new int[] {1, 1, 1, 2, 2, 2}, labels);
  }

  /**
   * Reference: skimage.segmentation.watershed (scikit-image 0.19, connectivity=1) with the same
   * markers, mask and image; per-slice mode against one 2D call per z plane.
   */
  @Test
  void agreesWithScikitImageWatershed(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "skimage.segmentation");
    Random random = new Random(13);
    List<Case> cases = new ArrayList<>();
    cases.add(new Case(new int[] {5, 1}, new float[] {0.1f, 0.5f, 0.9f, 0.4f, 0.0f},
        new int[] {1, 0, 0, 0, 2}, null, -1, true));
    int[][] shapes = {{19, 13, 7}, {17, 11, 5}, {23, 9, 6}, {16, 14, 4}};
    for (int c = 0; c < 12; c++) {
      int[] shape = shapes[c % shapes.length];
      int n = VoxelBox.size(shape);
      boolean unique = c < 8;
      float[] boundary = randomBoundary(random, n, unique ? 0 : 5);
      byte[] mask = c % 4 == 2 ? randomMask(random, n) : null;
      int sliceAxis = c % 2 == 1 ? 2 : -1;
      cases.add(new Case(shape, boundary, randomMarkers(random, n, 0.01), mask, sliceAxis,
          unique));
    }
    List<String> manifest = new ArrayList<>();
    List<int[]> ours = new ArrayList<>();
    for (int c = 0; c < cases.size(); c++) {
      Case k = cases.get(c);
      ReferenceFiles.write(dir, "b" + c, k.boundary);
      ReferenceFiles.write(dir, "m" + c, k.markers);
      ReferenceFiles.write(dir, "k" + c, k.mask == null ? ones(k.boundary.length) : k.mask);
      ours.add(SeededWatershed.flood(k.boundary, k.shape, k.markers, k.mask, k.sliceAxis,
          c % 2 == 0));
      StringBuilder line = new StringBuilder(c + " " + (k.sliceAxis >= 0 ? 1 : 0));
      for (int d = k.shape.length - 1; d >= 0; d--) {
        line.append(' ').append(k.shape[d]);
      }
      manifest.add(line.toString());
    }
    Files.write(dir.resolve("manifest"), manifest);
    PythonReference.runChecked("""
        import sys, numpy as np
        from skimage.segmentation import watershed
        d = sys.argv[1]
        for line in open(d + '/manifest'):
            parts = line.split()
            c, per_slice, shape = parts[0], parts[1] == '1', [int(s) for s in parts[2:]]
            image = np.fromfile(d + '/b' + c, dtype='<f4').reshape(shape)
            markers = np.fromfile(d + '/m' + c, dtype='<i4').reshape(shape)
            mask = np.fromfile(d + '/k' + c, dtype=np.uint8).reshape(shape).astype(bool)
            if per_slice:
                out = np.stack([watershed(image[z], markers[z], connectivity=1, mask=mask[z])
                                for z in range(shape[0])])
            else:
                out = watershed(image, markers, connectivity=1, mask=mask)
            out.astype('<i4').tofile(d + '/w' + c)
        """, dir.toString());
    assertArrayEquals(new int[] {1, 1, 2, 2, 2}, ReferenceFiles.readInts(dir.resolve("w0")),
        "scikit-image on the two-basin case");
    long plateauVoxels = 0;
    long plateauAgree = 0;
    for (int c = 1; c < cases.size(); c++) {
      Case k = cases.get(c);
      int[] reference = ReferenceFiles.readInts(dir.resolve("w" + c));
      int[] mine = ours.get(c);
      int agree = 0;
      int compared = 0;
      for (int i = 0; i < reference.length; i++) {
        if (reference[i] != 0 || mine[i] == 0) {
          compared++;
          agree += reference[i] == mine[i] ? 1 : 0;
        } else {
          assertTrue(isUnreachedSeedLabel(mine[i], k.markers), "voxel " + i + " of case " + c);
        }
      }
      if (k.unique) {
        assertEquals(compared, agree, "case " + c + " (unique values) must match exactly");
      } else {
        plateauVoxels += compared;
        plateauAgree += agree;
      }
    }
    double fraction = plateauAgree / (double) plateauVoxels;
    System.out.printf("watershed agreement with scikit-image on 5-level plateau inputs: %.4f%n",
        fraction);
    assertTrue(fraction >= 0.98, "agreement on plateaus " + fraction);
  }

  private static boolean isUnreachedSeedLabel(int label, int[] markers) {
    for (int m : markers) {
      if (m >= label) {
        return false;
      }
    }
    return true;
  }

  private record Case(int[] shape, float[] boundary, int[] markers, byte[] mask, int sliceAxis,
      boolean unique) {}

  static float[] randomBoundary(Random random, int n, int levels) {
    float[] values = new float[n];
    if (levels > 0) {
      for (int i = 0; i < n; i++) {
        values[i] = random.nextInt(levels) / (float) (levels - 1);
      }
      return values;
    }
    int[] order = new int[n];
    for (int i = 0; i < n; i++) {
      order[i] = i;
    }
    for (int i = n - 1; i > 0; i--) {
      int j = random.nextInt(i + 1);
      int t = order[i];
      order[i] = order[j];
      order[j] = t;
    }
    for (int i = 0; i < n; i++) {
      values[i] = (order[i] + 0.5f) / n;
    }
    return values;
  }

  static int[] randomMarkers(Random random, int n, double density) {
    int[] markers = new int[n];
    int next = 0;
    for (int i = 0; i < n; i++) {
      if (random.nextDouble() < density) {
        markers[i] = ++next;
      }
    }
    if (next == 0) {
      markers[random.nextInt(n)] = 1;
    }
    return markers;
  }

  static byte[] randomMask(Random random, int n) {
    byte[] mask = new byte[n];
    for (int i = 0; i < n; i++) {
      mask[i] = (byte) (random.nextDouble() < 0.85 ? 1 : 0);
    }
    return mask;
  }

  private static byte[] ones(int n) {
    byte[] b = new byte[n];
    java.util.Arrays.fill(b, (byte) 1);
    return b;
  }

  private static void assertEachLabelConnectedToItsSeed(int[] labels, int[] markers, byte[] mask,
      int[] shape, int sliceAxis, int largestMarker) {
    int n = labels.length;
    boolean[] reached = new boolean[n];
    ArrayDeque<Integer> queue = new ArrayDeque<>();
    for (int i = 0; i < n; i++) {
      boolean inside = mask == null || mask[i] != 0;
      boolean seed = inside && (markers[i] > 0 || (labels[i] > largestMarker
          && firstOfLabel(labels, i)));
      if (seed) {
        reached[i] = true;
        queue.add(i);
      }
    }
    int[] strides = VoxelBox.strides(shape);
    while (!queue.isEmpty()) {
      int i = queue.poll();
      for (int d = 0; d < shape.length; d++) {
        if (d == sliceAxis) {
          continue;
        }
        int c = (i / strides[d]) % shape[d];
        for (int s = -1; s <= 1; s += 2) {
          if (c + s >= 0 && c + s < shape[d]) {
            int j = i + s * strides[d];
            if (!reached[j] && labels[j] == labels[i] && labels[j] > 0) {
              reached[j] = true;
              queue.add(j);
            }
          }
        }
      }
    }
    for (int i = 0; i < n; i++) {
      assertEquals(labels[i] > 0, reached[i], "voxel " + i + " is not joined to its seed");
    }
  }

  private static boolean firstOfLabel(int[] labels, int i) {
    for (int j = 0; j < i; j++) {
      if (labels[j] == labels[i]) {
        return false;
      }
    }
    return true;
  }
}
