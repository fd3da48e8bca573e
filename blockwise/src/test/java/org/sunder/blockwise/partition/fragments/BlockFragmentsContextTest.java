package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GraphInputException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * A block with a {@linkplain AffinityBlock#withContext context}: its fragments and ignored voxels
 * are those of the context's box, restricted to the block.
 */
class BlockFragmentsContextTest {
  private static final long[] SHAPE = {72, 64, 20};
  private static final int[] BOX = {72, 64, 20};

  @Test
  void aBlockInsideTheWholeVolumeHasTheWholeVolumesFragments() {
    Random random = new Random(11);
    int differedWithoutContext = 0;
    for (TissuePreset preset : TissuePreset.values()) {
      SyntheticVolume volume = preset.volume(2, SHAPE);
      AffinityBlock whole = AffinityBlock.ofFloats(preset.affinities(volume, 2),
          BOX, new long[3], TissuePreset.offsets(), null);
      FragmentOptions options = FragmentOptions.fittedTo(volume.spec().voxelSize());
      int[] wholeLabels = BlockFragments.label(whole, options);
      byte[] wholeIgnored = BlockFragments.ignoredVoxels(whole, options);
      for (int trial = 0; trial < 3; trial++) {
        int[] min = new int[3];
        int[] shape = new int[3];
        for (int d = 0; d < 3; d++) {
          shape[d] = (int) SHAPE[d] / 2 + random.nextInt((int) SHAPE[d] / 4);
          min[d] = random.nextInt((int) SHAPE[d] - shape[d] + 1);
        }
        AffinityBlock part = subBox(whole, min, shape);
        AffinityBlock withContext = part.withContext(nearestNeighbours(whole));
        int[] inside = Shapes.subBoxIndices(BOX, min, shape);
        int[] expected = WatershedFragments.consecutive(gather(wholeLabels, inside));
        String where = preset.presetName() + " box at " + Arrays.toString(min);
        assertArrayEquals(expected, BlockFragments.label(withContext, options), where);
        assertArrayEquals(gather(wholeIgnored, inside),
            BlockFragments.ignoredVoxels(withContext, options), where);
        differedWithoutContext +=
            Arrays.equals(expected, BlockFragments.label(part, options)) ? 0 : 1;
      }
    }
    assertTrue(differedWithoutContext > 0,
        "without the context some box's fragments differ from the whole volume's");
  }

  /**
   * Fragments made per section, their borders moved ({@link FragmentBorders}): a block whose
   * context reaches twice the longest offset beyond it in-plane (the moves read one, and the
   * watershed's fragments they read need a margin, as a run's extended box and context give)
   * and holds every section, with every channel, has the whole volume's fragments at every
   * voxel, compared as "same fragment or not" between face neighbours (ids differ by their
   * numbering). A context of nearest-neighbour channels only is refused.
   */
  @Test
  void bordersMoveInTheContextAsInTheWholeVolume() {
    long[] volumeShape = {128, 128, 24};
    int[] box = {128, 128, 24};
    Random random = new Random(12);
    for (TissuePreset preset : List.of(TissuePreset.DENSE_NEURITES,
        TissuePreset.BODIES_AND_NEURITES)) {
      SyntheticVolume volume = preset.volume(3, volumeShape);
      AffinityBlock whole = AffinityBlock.ofFloats(preset.affinities(volume, 3), box,
          new long[3], TissuePreset.offsets(), null);
      FragmentOptions options = FragmentOptions.fittedTo(volume.spec().voxelSize());
      assertTrue(options.perSlice(), preset.presetName());
      int[] wholeLabels = BlockFragments.of(whole, options, WeightRule.logit(0.01),
          Subsampling.none(), true).labels();
      assertFalse(Arrays.equals(wholeLabels, BlockFragments.label(whole, options)),
          preset.presetName() + ": some border voxel moves");
      int[] reach = whole.offsets().reach();
      for (int trial = 0; trial < 2; trial++) {
        int[] min = new int[3];
        int[] shape = new int[3];
        int[] contextMin = new int[3];
        int[] contextShape = new int[3];
        for (int d = 0; d < 3; d++) {
          shape[d] = box[d] / 4 + random.nextInt(box[d] / 4);
          min[d] = random.nextInt(box[d] - shape[d] + 1);
          // every section: which sections are defective and which voxels detached (radius 2)
          // are judged across sections, as in a run whose blocks span z
          int grow = d == 2 ? box[d] : 2 * reach[d];
          contextMin[d] = Math.max(0, min[d] - grow);
          contextShape[d] = Math.min(box[d], min[d] + shape[d] + grow) - contextMin[d];
        }
        AffinityBlock part = subBox(whole, min, shape);
        String where = preset.presetName() + " box at " + Arrays.toString(min);
        BlockFragments fragments = BlockFragments.of(
            part.withContext(subBox(whole, contextMin, contextShape)), options,
            WeightRule.logit(0.01), Subsampling.none(), true);
        assertEquals(Arrays.stream(fragments.labels()).max().orElse(0), fragments.count());
        assertSameFragmentsAsNeighbours(wholeLabels, Shapes.subBoxIndices(box, min, shape),
            fragments.labels(), shape, where);
        assertThrows(IllegalArgumentException.class, () -> BlockFragments.of(
            part.withContext(nearestNeighbours(whole)), options, WeightRule.logit(0.01),
            Subsampling.none(), true), where);
      }
    }
  }

  /** Whether face neighbours share a fragment in the block as they do in the whole volume. */
  private static void assertSameFragmentsAsNeighbours(int[] whole, int[] inside, int[] block,
      int[] shape, String where) {
    int[] p = new int[3];
    int[] strides = VoxelBox.strides(shape);
    for (int i = 0; i < block.length; i++) {
      for (int d = 0; d < 3; d++) {
        if (p[d] + 1 < shape[d]) {
          int j = i + strides[d];
          assertEquals(whole[inside[i]] == whole[inside[j]], block[i] == block[j],
              where + ", voxel " + Arrays.toString(p) + ", axis " + d);
        }
      }
      VoxelBox.advance(p, shape);
    }
  }

  @Test
  void aContextOfTheBlocksOwnBoxChangesNothing() {
    SyntheticVolume volume = TissuePreset.COMPACT_CELLS.volume(1, SHAPE);
    AffinityBlock whole = AffinityBlock.ofFloats(TissuePreset.COMPACT_CELLS.affinities(volume, 1),
        BOX, new long[3], TissuePreset.offsets(), null);
    FragmentOptions options = FragmentOptions.fittedTo(volume.spec().voxelSize());
    assertArrayEquals(BlockFragments.label(whole, options),
        BlockFragments.label(whole.withContext(nearestNeighbours(whole)), options));
  }

  @Test
  void refusesAContextThatDoesNotHoldTheBlockOrLacksANearestNeighbourChannel() {
    SyntheticVolume volume = TissuePreset.COMPACT_CELLS.volume(1, SHAPE);
    AffinityBlock whole = AffinityBlock.ofFloats(TissuePreset.COMPACT_CELLS.affinities(volume, 1),
        BOX, new long[3], TissuePreset.offsets(), null);
    AffinityBlock part = subBox(whole, new int[] {8, 8, 4}, new int[] {30, 30, 10});
    AffinityBlock shifted = subBox(whole, new int[] {10, 0, 0}, new int[] {40, 40, 16});
    GraphInputException outside =
        assertThrows(GraphInputException.class, () -> part.withContext(shifted));
    assertTrue(outside.getMessage().contains("does not hold"), outside.getMessage());
    int[][] vectors = whole.offsets().vectors();
    int[][] withoutZ = Arrays.stream(vectors)
        .filter(v -> !Arrays.equals(v, new int[] {0, 0, -1})).toArray(int[][]::new);
    assertFalse(withoutZ.length == vectors.length, "the preset has a unit offset along z");
    AffinityBlock lacking = channels(whole, withoutZ);
    GraphInputException missing =
        assertThrows(GraphInputException.class, () -> part.withContext(lacking));
    assertTrue(missing.getMessage().contains("nearest-neighbour"), missing.getMessage());
  }

  /** The channels of {@code block} whose offsets are unit steps, as a block of its own box. */
  static AffinityBlock nearestNeighbours(AffinityBlock block) {
    int[][] vectors = block.offsets().vectors();
    return channels(block, Arrays.stream(vectors)
        .filter(v -> Arrays.stream(v).map(Math::abs).sum() == 1).toArray(int[][]::new));
  }

  private static AffinityBlock channels(AffinityBlock block, int[][] kept) {
    int n = block.voxelCount();
    float[] values = new float[n * kept.length];
    for (int j = 0; j < kept.length; j++) {
      int k = indexOf(block.offsets(), kept[j]);
      for (int i = 0; i < n; i++) {
        values[j * n + i] = block.affinity(i, k);
      }
    }
    return AffinityBlock.ofFloats(values, block.shape(), block.globalMin(), new Offsets(kept),
        null);
  }

  private static int indexOf(Offsets offsets, int[] vector) {
    for (int k = 0; k < offsets.count(); k++) {
      if (Arrays.equals(offsets.vector(k), vector)) {
        return k;
      }
    }
    throw new AssertionError("no offset " + Arrays.toString(vector));
  }

  /** The sub-box of {@code block} at {@code min} of {@code shape}, all channels. */
  private static AffinityBlock subBox(AffinityBlock block, int[] min, int[] shape) {
    int[] inside = Shapes.subBoxIndices(block.shape(), min, shape);
    int m = inside.length;
    float[] values = new float[m * block.channelCount()];
    for (int k = 0; k < block.channelCount(); k++) {
      for (int i = 0; i < m; i++) {
        values[k * m + i] = block.affinity(inside[i], k);
      }
    }
    long[] globalMin = new long[min.length];
    for (int d = 0; d < min.length; d++) {
      globalMin[d] = block.globalMin(d) + min[d];
    }
    return AffinityBlock.ofFloats(values, shape, globalMin, block.offsets(), null);
  }

  private static int[] gather(int[] values, int[] indices) {
    return Arrays.stream(indices).map(i -> values[i]).toArray();
  }

  private static byte[] gather(byte[] values, int[] indices) {
    byte[] out = new byte[indices.length];
    for (int i = 0; i < indices.length; i++) {
      out[i] = values[indices[i]];
    }
    return out;
  }
}
