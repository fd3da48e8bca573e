package org.sunder.blockwise.grid;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

class BlockShapeChoiceTest {

  @Test
  void overheadAndLargestBoxAgreeWithTheBlockGrid() {
    Random random = new Random(11);
    for (int trial = 0; trial < 200; trial++) {
      int n = 2 + random.nextInt(2);
      long[] volume = new long[n];
      int[] chunks = new int[n];
      int[] block = new int[n];
      int[] halo = new int[n];
      for (int d = 0; d < n; d++) {
        volume[d] = 1 + random.nextInt(90);
        chunks[d] = 1 + random.nextInt(8);
        block[d] = chunks[d] * (1 + random.nextInt(5));
        halo[d] = random.nextInt(12);
      }
      BlockGrid grid = BlockGrid.of(volume, chunks, block, halo);
      long extended = 0;
      long largest = 0;
      for (Block b : grid.blocks()) {
        long voxels = Shapes.elementCount(b.extendedShape());
        extended += voxels;
        largest = Math.max(largest, voxels);
      }
      assertEquals((double) extended / Shapes.elementCount(volume),
          BlockShapeChoice.overhead(volume, block, halo), 1e-9);
      assertTrue(BlockShapeChoice.largestExtendedVoxels(volume, block, halo) >= largest,
          "an upper bound on every task's box");
    }
  }

  @Test
  void choiceRespectsItsLimitsOnRandomVolumes() {
    Random random = new Random(5);
    for (int trial = 0; trial < 200; trial++) {
      long[] volume = {64 + random.nextInt(4000), 64 + random.nextInt(4000), 8 + random.nextInt(900)};
      int[] chunks = {32 << random.nextInt(3), 32 << random.nextInt(3), 8 << random.nextInt(3)};
      int[] halo = {random.nextInt(30), random.nextInt(30), random.nextInt(5)};
      long bytesPerVoxel = 50 + random.nextInt(400);
      long memory = (1L << 28) << random.nextInt(5);
      long minBlocks = 1 + random.nextInt(8);
      int cores = 1 + random.nextInt(4);
      BlockShapeChoice choice = BlockShapeChoice.choose(volume, chunks, halo, bytesPerVoxel,
          memory, minBlocks, cores);
      BlockShapeChoice grown = BlockShapeChoice.grow(volume, chunks, halo, bytesPerVoxel,
          memory, minBlocks);
      assertTrue(choice.overhead() <= grown.overhead() + 1e-12, "no more halo than grown");
      assertTrue(choice.largestExtendedVoxels() <= grown.largestExtendedVoxels()
          * BlockShapeChoice.EVEN_ROUNDS_MEMORY_SLACK, "about the memory of grown");
      assertTrue(choice.overhead() * BlockShapeChoice.roundWaste(choice.blockCount(), cores)
          <= grown.overhead() * BlockShapeChoice.roundWaste(grown.blockCount(), cores) + 1e-12);
      int[] shape = choice.blockShape();
      for (int d = 0; d < 3; d++) {
        assertEquals(0, shape[d] % chunks[d], "whole chunks");
      }
      BlockGrid grid = BlockGrid.of(volume, chunks, shape, halo);
      long chunkCount = grid.chunkCount();
      assertTrue(grid.blockCount() >= Math.min(minBlocks, chunkCount), "enough tasks");
      boolean startFits = BlockShapeChoice.largestExtendedVoxels(volume, chunks, halo)
          * bytesPerVoxel <= memory;
      if (startFits) {
        assertTrue(choice.largestExtendedVoxels() * bytesPerVoxel <= memory, "within budget");
      }
      if (choice.limitedBy() == BlockShapeChoice.Limit.TARGET_REACHED) {
        assertTrue(choice.overhead() <= BlockShapeChoice.TARGET_OVERHEAD);
      }
      assertTrue(choice.overhead()
          <= BlockShapeChoice.overhead(volume, chunks, halo) + 1e-12, "never worse than a chunk");
    }
  }

  /**
   * A realistic case worked by hand: 13 offsets of a dense-neurite preset reach 3 sections in z
   * and 27 voxels in y and x. With 1024 x 1024 x 1024 voxels, 64^3 chunks and room for 10^8
   * voxels per task, the shape reaches the 1.35 target: ((384 + 54) / 384)^2 x (192 + 6) / 192
   * = 1.301 x 1.031 = 1.342 for interior blocks (hand arithmetic), and clipping at the volume
   * border only lowers it.
   */
  @Test
  void aLargeAnisotropicVolumeReachesTheTarget() {
    long[] volume = {1024, 1024, 1024};
    int[] chunks = {64, 64, 64};
    int[] halo = {27, 27, 3};
    BlockShapeChoice choice = BlockShapeChoice.choose(volume, chunks, halo, 100, 10_000_000_000L,
        4, 2);
    assertEquals(BlockShapeChoice.Limit.TARGET_REACHED, choice.limitedBy());
    assertTrue(choice.overhead() <= 1.35, "overhead " + choice.overhead());
    int[] shape = choice.blockShape();
    assertTrue(shape[0] >= 256 && shape[1] >= 256, "x and y carry the deep halo: "
        + java.util.Arrays.toString(shape));
    assertTrue(shape[2] <= shape[0], "z, with a shallow halo, grows least");
  }

  @Test
  void aTightBudgetStopsTheGrowth() {
    long[] volume = {2048, 2048, 512};
    int[] chunks = {64, 64, 32};
    int[] halo = {27, 27, 3};
    long memory = 512L * 1024 * 1024;
    BlockShapeChoice choice = BlockShapeChoice.choose(volume, chunks, halo, 200, memory, 1, 1);
    assertEquals(BlockShapeChoice.Limit.MEMORY_BUDGET, choice.limitedBy());
    assertTrue(choice.largestExtendedVoxels() * 200 <= memory);
    assertTrue(choice.overhead() > 1.35);
  }

  @Test
  void aSmallVolumeKeepsEnoughBlocks() {
    long[] volume = {256, 256, 96};
    BlockShapeChoice choice = BlockShapeChoice.choose(volume, new int[] {64, 64, 32},
        new int[] {27, 27, 3}, 100, 1L << 34, 4, 2);
    assertTrue(choice.blockCount() >= 4);
    assertArrayEquals(choice.blockShape(), BlockShapeChoice.choose(volume, new int[] {64, 64, 32},
        new int[] {27, 27, 3}, 100, 1L << 34, 4, 2).blockShape(), "deterministic");
  }

  /**
   * Worked by hand: 512 x 512 x 192 voxels (x y z), halo 27 x 27 x 3. Nine blocks of 512 x 192 x
   * 64 have an overhead of 1 x (219 + 246 + 155) / 512 x (67 + 70 + 67) / 192 = 1.287 and leave
   * one core idle in the last of five rounds on two cores; eight blocks of 256 x 256 x 96 have
   * (283 + 283) / 512 x (283 + 283) / 512 x (99 + 99) / 192 = 1.260, about the same extended box
   * (310 x 310 x 102 voxels against 512 x 246 x 70) and four full rounds.
   */
  @Test
  void aFullerLastRoundIsPreferredWhenItCostsNoHalo() {
    long[] volume = {512, 512, 192};
    int[] chunks = {64, 64, 32};
    int[] halo = {27, 27, 3};
    BlockShapeChoice nine = new BlockShapeChoice(new int[] {512, 192, 64},
        BlockShapeChoice.overhead(volume, new int[] {512, 192, 64}, halo),
        BlockShapeChoice.largestExtendedVoxels(volume, new int[] {512, 192, 64}, halo), 9,
        BlockShapeChoice.Limit.TARGET_REACHED);
    assertEquals(1.287, nine.overhead(), 0.001);
    BlockShapeChoice even = BlockShapeChoice.evenRounds(volume, chunks, halo, nine,
        Long.MAX_VALUE, 4, 2);
    assertEquals(0, even.blockCount() % 2, "full rounds: " + even.blockCount() + " blocks");
    assertTrue(even.overhead() <= 1.260 + 1e-3, "overhead " + even.overhead());
    assertEquals(BlockShapeChoice.Limit.TARGET_REACHED, even.limitedBy());
    // on one core every round is full: nothing to gain unless the halo shrinks
    BlockShapeChoice oneCore = BlockShapeChoice.evenRounds(volume, chunks, halo, nine,
        Long.MAX_VALUE, 4, 1);
    assertTrue(oneCore.overhead() <= nine.overhead());
  }
}
