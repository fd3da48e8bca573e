package org.sunder.blockwise.partition;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayDeque;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.fragments.VoxelBox;
import org.sunder.blockwise.partition.sizefilter.SizeFilterTest;

/**
 * What every {@link Partitioner} promises, run against each implementation (the nested classes
 * of {@link PartitionerImplementationsTest} supply them): labels 1..n numbered in order of first
 * voxel, every voxel inside the mask labelled and every masked voxel 0, each segment connected
 * through the block's edges (its offsets and the face neighbours, inside the mask), and the same
 * labels for the same block from the same or a fresh instance. Inputs: noisy affinities of
 * random Voronoi cells (seeded), float and 8-bit, with and without a mask, on a non-cubic box.
 */
public abstract class PartitionerContract {
  static final int[] SHAPE = {17, 11, 7};
  static final Offsets OFFSETS = PartitionFixtures.OFFSETS;

  /** A new instance of the implementation under test. */
  abstract Partitioner partitioner();

  @Test
  void everyVoxelInTheMaskIsLabelledInOrderAndMaskedVoxelsAreZero() {
    Random random = new Random(13);
    for (int trial = 0; trial < 6; trial++) {
      byte[] mask = trial % 2 == 0 ? null : randomMask(random);
      AffinityBlock block = noisyCells(random, mask, trial % 3 == 2);
      Segmentation s = partitioner().partition(block);
      assertValidSegmentation(s, mask, block.voxelCount(), "trial " + trial);
      assertTrue(s.segmentCount() >= 1, "trial " + trial);
    }
  }

  @Test
  void everySegmentIsConnectedThroughTheBlocksEdges() {
    Random random = new Random(14);
    for (int trial = 0; trial < 6; trial++) {
      byte[] mask = trial % 2 == 0 ? null : randomMask(random);
      Segmentation s = partitioner().partition(noisyCells(random, mask, trial % 3 == 2));
      assertConnected(s, "trial " + trial);
    }
  }

  @Test
  void theSameBlockGivesTheSameLabels() {
    Random random = new Random(15);
    for (int trial = 0; trial < 3; trial++) {
      byte[] mask = trial == 1 ? randomMask(random) : null;
      AffinityBlock block = noisyCells(random, mask, trial == 2);
      Partitioner p = partitioner();
      Segmentation first = p.partition(block);
      assertEquals(first, p.partition(block), "same instance, trial " + trial);
      assertEquals(first, partitioner().partition(block), "fresh instance, trial " + trial);
    }
  }

  /**
   * The promise of {@link Partitioner#partition}: labels 1..n in order of first voxel, 0 exactly
   * at masked voxels, {@code segmentCount() == n}.
   */
  public static void assertValidSegmentation(Segmentation s, byte[] mask, int voxels, String what) {
    int[] labels = s.labels();
    assertEquals(voxels, labels.length, what);
    int seen = 0;
    for (int i = 0; i < labels.length; i++) {
      boolean inside = mask == null || mask[i] != 0;
      assertEquals(inside, labels[i] > 0, what + ": voxel " + i + " label " + labels[i]);
      assertTrue(labels[i] <= seen + 1, what + ": labels not in order of first voxel at " + i);
      seen = Math.max(seen, labels[i]);
    }
    assertEquals(seen, s.segmentCount(), what);
  }

  /** One breadth-first search per segment over offsets (both ways) and face neighbours. */
  private static void assertConnected(Segmentation s, String what) {
    int[] labels = s.labels();
    int[][] steps = new int[OFFSETS.count() + 3][];
    for (int k = 0; k < OFFSETS.count(); k++) {
      steps[k] = OFFSETS.vector(k);
    }
    for (int d = 0; d < 3; d++) {
      steps[OFFSETS.count() + d] = new int[3];
      steps[OFFSETS.count() + d][d] = 1;
    }
    boolean[] reached = new boolean[labels.length];
    boolean[] started = new boolean[s.segmentCount() + 1];
    ArrayDeque<Integer> queue = new ArrayDeque<>();
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] == 0 || reached[i]) {
        continue;
      }
      assertTrue(!started[labels[i]], what + ": segment " + labels[i] + " is in two pieces");
      started[labels[i]] = true;
      reached[i] = true;
      queue.add(i);
      while (!queue.isEmpty()) {
        int v = queue.poll();
        int x = v % SHAPE[0];
        int y = (v / SHAPE[0]) % SHAPE[1];
        int z = v / (SHAPE[0] * SHAPE[1]);
        for (int[] step : steps) {
          for (int sign = -1; sign <= 1; sign += 2) {
            int nx = x + sign * step[0];
            int ny = y + sign * step[1];
            int nz = z + sign * step[2];
            if (nx < 0 || ny < 0 || nz < 0 || nx >= SHAPE[0] || ny >= SHAPE[1] || nz >= SHAPE[2]) {
              continue;
            }
            int w = nx + SHAPE[0] * (ny + SHAPE[1] * nz);
            if (!reached[w] && labels[w] == labels[v]) {
              reached[w] = true;
              queue.add(w);
            }
          }
        }
      }
    }
  }

  /** A mask that cuts a slanted half-space and random holes out of the box. */
  static byte[] randomMask(Random random) {
    int n = VoxelBox.size(SHAPE);
    byte[] mask = new byte[n];
    int cut = 4 + random.nextInt(8);
    for (int i = 0; i < n; i++) {
      int x = i % SHAPE[0];
      int z = i / (SHAPE[0] * SHAPE[1]);
      mask[i] = (byte) (x + 2 * z < cut || random.nextInt(20) == 0 ? 0 : 1);
    }
    return mask;
  }

  /**
   * Affinities of random Voronoi cells: near 1 inside a cell, near 0 across cells, plus uniform
   * noise of amplitude 0.3, clipped; the 8-bit copy is {@code round(255 a)}.
   */
  static AffinityBlock noisyCells(Random random, byte[] mask, boolean eightBit) {
    int n = VoxelBox.size(SHAPE);
    int[] cells = SizeFilterTest.randomSegments(random, SHAPE, 6 + random.nextInt(6));
    float[] a = new float[n * OFFSETS.count()];
    for (int k = 0; k < OFFSETS.count(); k++) {
      int[] o = OFFSETS.vector(k);
      for (int i = 0; i < n; i++) {
        int x = i % SHAPE[0] + o[0];
        int y = (i / SHAPE[0]) % SHAPE[1] + o[1];
        int z = i / (SHAPE[0] * SHAPE[1]) + o[2];
        boolean same = x >= 0 && y >= 0 && z >= 0 && x < SHAPE[0] && y < SHAPE[1] && z < SHAPE[2]
            && cells[x + SHAPE[0] * (y + SHAPE[1] * z)] == cells[i];
        float value = (same ? 0.9f : 0.1f) + 0.3f * (random.nextFloat() - 0.5f);
        a[i + k * n] = Math.max(0f, Math.min(1f, value));
      }
    }
    if (!eightBit) {
      return AffinityBlock.ofFloats(a, SHAPE, new long[3], OFFSETS, mask);
    }
    byte[] b = new byte[a.length];
    for (int i = 0; i < a.length; i++) {
      b[i] = (byte) Math.round(255 * a[i]);
    }
    return AffinityBlock.ofBytes(b, SHAPE, new long[3], OFFSETS, mask);
  }
}
