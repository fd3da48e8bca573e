package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.partition.PartitionConfigException;

class WatershedFragmentsTest {
  private static final int[][] NEAREST = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}};

  @Test
  void fragmentsNeverStraddleAPredictedBoundary() {
    Random random = new Random(13);
    int[] shape = {24, 17, 9};
    int[] truth = slabs(shape, 11);
    float[] affinities = noisyAffinities(truth, shape, random, 0.15f);
    byte[] mask = new byte[truth.length];
    for (int i = 0; i < mask.length; i++) {
      mask[i] = (byte) (i % 97 == 3 ? 0 : 1);
    }
    for (boolean perSlice : new boolean[] {false, true}) {
      FragmentOptions options = new FragmentOptions(0.5, 1.0, new double[] {1, 1, 2}, perSlice);
      float[] boundary = BoundaryMap.of(affinities, shape, NEAREST, mask, options.sliceAxis());
      int[] labels = new WatershedFragments(options).label(boundary, shape, mask);
      assertConsecutiveAndMasked(labels, mask);
      Map<Long, Integer> overlap = new HashMap<>();
      Map<Integer, Integer> size = new HashMap<>();
      for (int i = 0; i < labels.length; i++) {
        if (labels[i] > 0) {
          overlap.merge((long) labels[i] << 32 | truth[i], 1, Integer::sum);
          size.merge(labels[i], 1, Integer::sum);
        }
      }
      Map<Integer, Integer> majority = new HashMap<>();
      overlap.forEach((key, count) -> majority.merge((int) (key >>> 32), count, Math::max));
      int straddling = 0;
      for (Map.Entry<Integer, Integer> e : size.entrySet()) {
        straddling += e.getValue() - majority.get(e.getKey());
      }
      assertTrue(straddling < labels.length / 200, straddling + " voxels outside the object"
          + " of their fragment's majority");
      if (perSlice) {
        assertEachLabelInOneSlice(labels, shape);
      }
    }
  }

  @Test
  void boxWithoutBoundaryIsOneFragmentPerMaskComponent() {
    int[] shape = {6, 5, 4};
    float[] boundary = new float[120];
    byte[] mask = new byte[120];
    for (int i = 0; i < 120; i++) {
      mask[i] = (byte) ((i % 6) == 2 ? 0 : 1);
    }
    int[] labels = new WatershedFragments(FragmentOptions.defaults()).label(boundary, shape, mask);
    assertConsecutiveAndMasked(labels, mask);
    assertEquals(1, labels[0]);
    assertEquals(2, labels[3]);
    assertEquals(2, java.util.Arrays.stream(labels).max().getAsInt());
  }

  @Test
  void optionsRejectValuesOutOfRangeNamingTheKey() {
    PartitionConfigException e = assertThrows(PartitionConfigException.class,
        () -> new FragmentOptions(0.0, 1, new double[] {1, 1, 1}, false));
    assertTrue(e.getMessage().startsWith("fragments.boundaryThreshold: 0.0"), e.getMessage());
    assertThrows(PartitionConfigException.class,
        () -> new FragmentOptions(0.5, -1, new double[] {1, 1, 1}, false));
    assertThrows(PartitionConfigException.class,
        () -> new FragmentOptions(0.5, 1, new double[] {1, 0, 1}, false));
    e = assertThrows(PartitionConfigException.class,
        () -> new WatershedFragments(new FragmentOptions(0.5, 1, new double[] {1, 1}, false))
            .label(new float[8], new int[] {2, 2, 2}, null));
    assertTrue(e.getMessage().contains("fragments.voxelSize"), e.getMessage());
    assertEquals(org.sunder.blockwise.ErrorKind.INVALID_CONFIG, e.kind());
  }

  /** Objects: slabs along x of the given width, each split in y halves. */
  static int[] slabs(int[] shape, int width) {
    int n = VoxelBox.size(shape);
    int[] truth = new int[n];
    int[] c = new int[3];
    for (int i = 0; i < n; i++) {
      truth[i] = 1 + (c[0] / width) * 2 + (c[1] < shape[1] / 2 ? 0 : 1);
      VoxelBox.advance(c, shape);
    }
    return truth;
  }

  static float[] noisyAffinities(int[] truth, int[] shape, Random random, float noise) {
    int n = truth.length;
    int[] strides = VoxelBox.strides(shape);
    float[] aff = new float[n * 3];
    int[] c = new int[3];
    for (int i = 0; i < n; i++) {
      for (int k = 0; k < 3; k++) {
        float a = 1f;
        if (c[k] > 0 && truth[i - strides[k]] != truth[i]) {
          a = 0f;
        }
        a += (float) (random.nextGaussian() * noise);
        aff[k * n + i] = Math.min(1f, Math.max(0f, a));
      }
      VoxelBox.advance(c, shape);
    }
    return aff;
  }

  private static void assertConsecutiveAndMasked(int[] labels, byte[] mask) {
    int next = 0;
    for (int i = 0; i < labels.length; i++) {
      if (mask != null && mask[i] == 0) {
        assertEquals(0, labels[i]);
      } else {
        assertTrue(labels[i] >= 1 && labels[i] <= next + 1, "consecutive from 1");
        next = Math.max(next, labels[i]);
      }
    }
  }

  private static void assertEachLabelInOneSlice(int[] labels, int[] shape) {
    Map<Integer, Integer> sliceOf = new HashMap<>();
    int plane = shape[0] * shape[1];
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] > 0) {
        Integer z = sliceOf.putIfAbsent(labels[i], i / plane);
        assertTrue(z == null || z == i / plane, "label " + labels[i] + " spans slices");
      }
    }
  }
}
