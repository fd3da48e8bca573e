package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

class FragmentTilesTest {
  private static final int[][] NEAREST = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}};
  private static final WatershedFragments WATERSHED =
      new WatershedFragments(new FragmentOptions(0.5, 1.0, new double[] {1, 1, 2}, false));

  @Test
  void pieceStartsAreTheTileFacesInsideTheBox() {
    assertArrayEquals(new int[] {0}, FragmentTiles.pieceStarts(0, 8, 8));
    assertArrayEquals(new int[] {0, 8, 16}, FragmentTiles.pieceStarts(0, 20, 8));
    // a box from 5: faces at 8 and 16 lie at box coordinates 3 and 11
    assertArrayEquals(new int[] {0, 3, 11}, FragmentTiles.pieceStarts(5, 12, 8));
    assertArrayEquals(new int[] {0, 3}, FragmentTiles.pieceStarts(5, 11, 8));
    assertArrayEquals(new int[] {0}, FragmentTiles.pieceStarts(16, 8, 8));
  }

  @Test
  void oneTileCoveringTheBoxIsTheUntiledWatershed() {
    Random random = new Random(3);
    int[] shape = {20, 14, 7};
    float[] boundary = boundary(shape, random);
    int[] expected = WATERSHED.label(boundary.clone(), shape, null);
    int[] tiled = FragmentTiles.label(WATERSHED, boundary, shape, null, new long[3],
        new int[] {20, 14, 7}, new int[3]);
    assertArrayEquals(expected, tiled);
  }

  /**
   * The property runs rely on: a tile gets the same fragments from any box that holds it with
   * its margin (clipped to the volume).
   */
  @Test
  void aWholeTileHasTheSameFragmentsInEveryBoxThatHoldsIt() {
    Random random = new Random(17);
    int compared = 0;
    for (int trial = 0; trial < 20; trial++) {
      int[] volume = {30, 26, 12};
      float[] boundary = boundary(volume, random);
      int[] tile = {4 + random.nextInt(10), 4 + random.nextInt(10), 2 + random.nextInt(5)};
      int[] margin = {random.nextInt(4), random.nextInt(4), random.nextInt(2)};
      byte[] mask = new byte[boundary.length];
      for (int i = 0; i < mask.length; i++) {
        mask[i] = (byte) (random.nextInt(50) == 0 ? 0 : 1);
      }
      int[] whole =
          FragmentTiles.label(WATERSHED, boundary, volume, mask, new long[3], tile, margin);
      long[] min = new long[3];
      int[] shape = new int[3];
      for (int d = 0; d < 3; d++) {
        min[d] = random.nextInt(volume[d] / 4);
        shape[d] = (int) (volume[d] - min[d]) - random.nextInt(volume[d] / 4);
      }
      int[] part = FragmentTiles.label(WATERSHED, crop(boundary, volume, min, shape), shape,
          crop(mask, volume, min, shape), min, tile, margin);
      compared += assertSamePartitionOnWholeTiles(whole, volume, part, shape, min, tile, margin);
      assertNoFragmentCrossesATileFace(whole, volume, tile);
    }
    assertTrue(compared > 1000, compared + " voxels in whole tiles: too few to test anything");
  }

  /** Returns the number of voxels compared. */
  private static int assertSamePartitionOnWholeTiles(int[] whole, int[] volume, int[] part,
      int[] shape, long[] min, int[] tile, int[] margin) {
    Map<Integer, Integer> forward = new HashMap<>();
    Map<Integer, Integer> backward = new HashMap<>();
    int[] c = new int[3];
    int compared = 0;
    for (int i = 0; i < part.length; i++) {
      boolean inWholeTile = true;
      for (int d = 0; d < 3; d++) {
        long g = min[d] + c[d];
        long tileLo = g / tile[d] * tile[d];
        long contextLo = Math.max(0, tileLo - margin[d]);
        long contextHi = Math.min(tileLo + tile[d] + margin[d], volume[d]);
        inWholeTile &= contextLo >= min[d] && contextHi <= min[d] + shape[d];
      }
      if (inWholeTile) {
        int w = whole[(int) (min[0] + c[0] + (min[1] + c[1]) * volume[0]
            + (min[2] + c[2]) * volume[0] * volume[1])];
        int p = part[i];
        assertEquals(w, (int) forward.computeIfAbsent(p, k -> w), "one label each way");
        assertEquals(p, (int) backward.computeIfAbsent(w, k -> p));
        compared++;
      }
      VoxelBox.advance(c, shape);
    }
    return compared;
  }

  private static void assertNoFragmentCrossesATileFace(int[] labels, int[] shape, int[] tile) {
    Map<Integer, Long> tileOf = new HashMap<>();
    int[] c = new int[3];
    for (int label : labels) {
      long key = c[0] / tile[0] + 1000L * (c[1] / tile[1]) + 1_000_000L * (c[2] / tile[2]);
      if (label > 0) {
        assertEquals(key, (long) tileOf.computeIfAbsent(label, k -> key));
      }
      VoxelBox.advance(c, shape);
    }
  }

  private static float[] boundary(int[] shape, Random random) {
    int[] truth = WatershedFragmentsTest.slabs(shape, 5 + random.nextInt(6));
    float[] affinities = WatershedFragmentsTest.noisyAffinities(truth, shape, random, 0.2f);
    return BoundaryMap.of(affinities, shape, NEAREST, null, -1);
  }

  private static float[] crop(float[] values, int[] volume, long[] min, int[] shape) {
    float[] out = new float[VoxelBox.size(shape)];
    int[] c = new int[3];
    for (int i = 0; i < out.length; i++) {
      out[i] = values[index(volume, min, c)];
      VoxelBox.advance(c, shape);
    }
    return out;
  }

  private static byte[] crop(byte[] values, int[] volume, long[] min, int[] shape) {
    byte[] out = new byte[VoxelBox.size(shape)];
    int[] c = new int[3];
    for (int i = 0; i < out.length; i++) {
      out[i] = values[index(volume, min, c)];
      VoxelBox.advance(c, shape);
    }
    return out;
  }

  private static int index(int[] volume, long[] min, int[] c) {
    return (int) (min[0] + c[0] + (min[1] + c[1]) * volume[0]
        + (min[2] + c[2]) * volume[0] * volume[1]);
  }
}
