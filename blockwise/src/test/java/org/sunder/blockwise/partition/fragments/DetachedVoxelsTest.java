package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.testing.PythonReference;

class DetachedVoxelsTest {
  /** Nearest neighbours along x, y, z and one long-range offset, memory order. */
  private static final int[][] OFFSETS = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {-3, 0, 0}};

  @Test
  void theMiddleOfABackgroundGapIsDetachedAndItsSidesAreNot() {
    // objects in x 0-2 and 6-8, background in x 3-5: an exact prediction gives every edge
    // touching background affinity 0 (the definition of an affinity), so the whole gap attracts
    // nothing; its sides touch object voxels that attract their own neighbours
    int[] shape = {9, 3, 3};
    long[] labels = new long[9 * 3 * 3];
    for (int i = 0; i < labels.length; i++) {
      int x = i % 9;
      labels[i] = x <= 2 ? 1 : x >= 6 ? 2 : 0;
    }
    float[] affinities = ExactAffinities.compute(labels, new long[] {9, 3, 3}, OFFSETS);
    byte[] detached = DetachedVoxels.find(AffinityBlock.ofFloats(affinities, shape, new long[3],
        new Offsets(OFFSETS), null));
    for (int i = 0; i < labels.length; i++) {
      assertEquals(i % 9 == 4 ? 1 : 0, detached[i], "voxel x=" + i % 9);
    }
  }

  @Test
  void bothEndsOfAnAttractingEdgeAreNeverDetached() {
    Random random = new Random(3);
    int[] shape = {8, 7, 6};
    for (int trial = 0; trial < 20; trial++) {
      AffinityBlock block = randomBlock(random, shape, 0.02 + 0.03 * trial);
      byte[] detached = DetachedVoxels.find(block);
      int n = block.voxelCount();
      for (int k = 0; k < 3; k++) {
        int stride = k == 0 ? 1 : k == 1 ? shape[0] : shape[0] * shape[1];
        for (int i = 0; i < n; i++) {
          int c = i / stride % shape[k];
          if (c > 0 && block.affinity(i, k) >= DetachedVoxels.ATTRACTS) {
            assertEquals(0, detached[i]);
            assertEquals(0, detached[i - stride]);
          }
        }
      }
    }
  }

  @Test
  void aVoxelFarFromTheCutFacesIsJudgedAsInTheWholeBox() {
    Random random = new Random(5);
    int[] shape = {12, 11, 10};
    int[] from = {3, 2, 4};
    int[] sub = {7, 6, 5};
    int compared = 0;
    int detachedSeen = 0;
    for (int trial = 0; trial < 10; trial++) {
      AffinityBlock whole = randomBlock(random, shape, 0.05);
      byte[] all = DetachedVoxels.find(whole);
      float[] values = new float[sub[0] * sub[1] * sub[2] * OFFSETS.length];
      int m = sub[0] * sub[1] * sub[2];
      for (int k = 0; k < OFFSETS.length; k++) {
        for (int i = 0; i < m; i++) {
          values[k * m + i] = whole.affinity(wholeIndex(i, sub, from, shape), k);
        }
      }
      byte[] part = DetachedVoxels.find(AffinityBlock.ofFloats(values, sub,
          new long[] {from[0], from[1], from[2]}, new Offsets(OFFSETS), null));
      for (int i = 0; i < m; i++) {
        int x = i % sub[0];
        int y = i / sub[0] % sub[1];
        int z = i / (sub[0] * sub[1]);
        if (inner(x, sub[0]) && inner(y, sub[1]) && inner(z, sub[2])) {
          assertEquals(all[wholeIndex(i, sub, from, shape)], part[i]);
          compared++;
          detachedSeen += part[i];
        }
      }
    }
    assertTrue(compared > 0 && detachedSeen > 0, "the comparison sees detached voxels");
  }

  /**
   * Against scipy: the voxels no nearest-neighbour edge of 0.5 or more touches, eroded by the
   * cross-shaped structuring element with the box's border left alone
   * ({@code scipy.ndimage.binary_erosion}, {@code border_value=1}).
   */
  @Test
  void matchesAnErosionByScipy(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "scipy");
    Random random = new Random(11);
    int[] shape = {9, 7, 6};
    List<String> manifest = new ArrayList<>();
    List<byte[]> ours = new ArrayList<>();
    int detachedTotal = 0;
    for (int trial = 0; trial < 12; trial++) {
      AffinityBlock block = randomBlock(random, shape, 0.02 + 0.03 * trial);
      byte[] detached = DetachedVoxels.find(block);
      ours.add(detached);
      for (byte b : detached) {
        detachedTotal += b;
      }
      ReferenceFiles.write(dir, "aff" + trial, block.floatValuesOrNull());
      manifest.add(trial + " " + shape[0] + " " + shape[1] + " " + shape[2]);
    }
    assertTrue(detachedTotal > 100, "the cases hold detached voxels: " + detachedTotal);
    Files.write(dir.resolve("manifest"), manifest);
    PythonReference.runChecked("""
        import sys, numpy as np
        from scipy import ndimage
        d = sys.argv[1]
        for line in open(d + '/manifest'):
            t, sx, sy, sz = line.split()
            sx, sy, sz = int(sx), int(sy), int(sz)
            a = np.fromfile(f'{d}/aff{t}', '<f4').reshape(4, sz, sy, sx)
            attached = np.zeros((sz, sy, sx), bool)
            for k in range(3):  # channel k: the edge to the lower neighbour along memory axis k
                ax = 2 - k
                hi = [slice(None)] * 3; hi[ax] = slice(1, None)
                lo = [slice(None)] * 3; lo[ax] = slice(None, -1)
                strong = a[k][tuple(hi)] >= 0.5
                attached[tuple(hi)] |= strong
                attached[tuple(lo)] |= strong
            detached = ndimage.binary_erosion(~attached,
                structure=ndimage.generate_binary_structure(3, 1), border_value=1)
            detached.astype(np.uint8).tofile(f'{d}/ref{t}')
        """, dir.toString());
    for (int trial = 0; trial < ours.size(); trial++) {
      assertArrayEquals(Files.readAllBytes(dir.resolve("ref" + trial)), ours.get(trial),
          "trial " + trial);
    }
  }

  /**
   * Affinities 0, 0.25, 0.5, 0.75 or 1 (ties at the threshold included); each at least 0.5 with
   * probability {@code attract}.
   */
  private static AffinityBlock randomBlock(Random random, int[] shape, double attract) {
    int n = shape[0] * shape[1] * shape[2];
    float[] values = new float[n * OFFSETS.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = random.nextDouble() < attract ? 0.5f + 0.25f * random.nextInt(3)
          : 0.25f * random.nextInt(2);
    }
    return AffinityBlock.ofFloats(values, shape, new long[3], new Offsets(OFFSETS), null);
  }

  private static boolean inner(int c, int size) {
    return c >= DetachedVoxels.REACH && c < size - DetachedVoxels.REACH;
  }

  private static int wholeIndex(int i, int[] sub, int[] from, int[] shape) {
    int x = i % sub[0] + from[0];
    int y = i / sub[0] % sub[1] + from[1];
    int z = i / (sub[0] * sub[1]) + from[2];
    return x + shape[0] * (y + shape[1] * z);
  }
}
