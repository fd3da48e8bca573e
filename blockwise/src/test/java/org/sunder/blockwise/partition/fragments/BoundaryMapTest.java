package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

class BoundaryMapTest {

  /**
   * Random boxes of one to three dimensions (rows of one voxel among them), offsets of either
   * sign along every axis beside long-range ones, with and without a mask, every slice axis:
   * the same floats, bit for bit, as a voxel-by-voxel search over all pairs.
   */
  @Test
  void eachVoxelTakesTheStrongestBoundaryOfItsNearestNeighbourEdges() {
    Random random = new Random(13);
    for (int trial = 0; trial < 60; trial++) {
      int dims = 1 + trial % 3;
      int[] shape = new int[dims];
      for (int d = 0; d < dims; d++) {
        shape[d] = 1 + random.nextInt(6);
      }
      int n = VoxelBox.size(shape);
      int[][] offsets = new int[2 * dims + 1][dims];
      for (int d = 0; d < dims; d++) {
        offsets[2 * d][d] = -1;
        offsets[2 * d + 1][d] = 1;
      }
      offsets[2 * dims][random.nextInt(dims)] = -2;
      float[] affinities = new float[n * offsets.length];
      for (int i = 0; i < affinities.length; i++) {
        affinities[i] = random.nextFloat();
      }
      byte[] mask = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextDouble() < 0.85 ? 1 : 0);
      }
      byte[] allIn = new byte[n];
      Arrays.fill(allIn, (byte) 1);
      for (int sliceAxis = -1; sliceAxis < dims; sliceAxis++) {
        assertArrayEquals(bruteForce(affinities, shape, offsets, mask, sliceAxis),
            BoundaryMap.of(affinities, shape, offsets, mask, sliceAxis));
        assertArrayEquals(bruteForce(affinities, shape, offsets, allIn, sliceAxis),
            BoundaryMap.of(affinities, shape, offsets, null, sliceAxis));
      }
    }
  }

  @Test
  void bytesAreScaledBy255() {
    int[] shape = {3, 2};
    int[][] offsets = {{-1, 0}, {0, -1}};
    byte[] bytes = new byte[12];
    float[] floats = new float[12];
    for (int i = 0; i < 12; i++) {
      bytes[i] = (byte) (i * 20);
      floats[i] = (i * 20) / 255f;
    }
    assertArrayEquals(BoundaryMap.of(floats, shape, offsets, null, -1),
        BoundaryMap.of(bytes, shape, offsets, null, -1), 1e-7f);
  }

  @Test
  void voxelWithoutEdgesReadsOne() {
    float[] b = BoundaryMap.of(new float[] {1f, 1f}, new int[] {2}, new int[][] {{-1}},
        new byte[] {1, 0}, -1);
    assertArrayEquals(new float[] {1f, 1f}, b);
    assertEquals(0f, BoundaryMap.of(new float[] {1f, 1f}, new int[] {2}, new int[][] {{-1}},
        null, -1)[0]);
  }

  private static float[] bruteForce(float[] aff, int[] shape, int[][] offsets, byte[] mask,
      int sliceAxis) {
    int n = VoxelBox.size(shape);
    float[] out = new float[n];
    int[] strides = VoxelBox.strides(shape);
    for (int i = 0; i < n; i++) {
      float best = -1;
      for (int k = 0; k < offsets.length; k++) {
        if (!BoundaryMap.isNearestNeighbour(offsets[k], sliceAxis)) {
          continue;
        }
        for (int j = 0; j < n; j++) {
          boolean joins = true;
          for (int d = 0; d < shape.length; d++) {
            int cj = (j / strides[d]) % shape[d];
            int ci = (i / strides[d]) % shape[d];
            joins &= cj + offsets[k][d] == ci;
          }
          boolean fromI = true;
          for (int d = 0; d < shape.length; d++) {
            int cj = (j / strides[d]) % shape[d];
            int ci = (i / strides[d]) % shape[d];
            fromI &= ci + offsets[k][d] == cj;
          }
          if (fromI && mask[i] != 0 && mask[j] != 0) {
            best = Math.max(best, 1 - aff[k * n + i]);
          }
          if (joins && mask[i] != 0 && mask[j] != 0) {
            best = Math.max(best, 1 - aff[k * n + j]);
          }
        }
      }
      out[i] = best < 0 || mask[i] == 0 ? 1f : best;
    }
    return out;
  }
}
