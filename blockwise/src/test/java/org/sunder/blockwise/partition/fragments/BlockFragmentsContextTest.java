package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
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
 * A block with a {@linkplain AffinityBlock#withContext context}: its watershed fragments and
 * ignored voxels are those of the context's box, restricted to the block; after
 * {@link FragmentBorders}, its fragments are the whole volume's where it holds every edge.
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
   * After {@link FragmentBorders} a block's fragments are the whole volume's on the voxels whose
   * every edge lies in the block: compared as "same fragment or not" between face neighbours
   * (ids differ by their numbering, and a fragment that leaves the block may fall into pieces).
   */
  @Test
  void aBlocksFragmentsAreTheWholeVolumesWhereTheBlockHoldsEveryEdge() {
    long[] volumeShape = {128, 128, 24};
    int[] box = {128, 128, 24};
    Random random = new Random(12);
    for (TissuePreset preset : TissuePreset.values()) {
      SyntheticVolume volume = preset.volume(3, volumeShape);
      AffinityBlock whole = AffinityBlock.ofFloats(preset.affinities(volume, 3), box,
          new long[3], TissuePreset.offsets(), null);
      FragmentOptions options = FragmentOptions.fittedTo(volume.spec().voxelSize());
      int[] wholeLabels = BlockFragments.of(whole, options, WeightRule.logit(0.01),
          Subsampling.none(), true).labels();
      assertFalse(Arrays.equals(wholeLabels, BlockFragments.label(whole, options)),
          preset.presetName() + ": some border voxel moves");
      int[] reach = whole.offsets().reach();
      for (int trial = 0; trial < 2; trial++) {
        int[] min = new int[3];
        int[] shape = new int[3];
        for (int d = 0; d < 3; d++) {
          shape[d] = box[d] * 5 / 8 + random.nextInt(box[d] / 4);
          min[d] = random.nextInt(box[d] - shape[d] + 1);
        }
        BlockFragments fragments = BlockFragments.of(
            subBox(whole, min, shape).withContext(nearestNeighbours(whole)), options,
            WeightRule.logit(0.01), Subsampling.none(), true);
        int[] labels = fragments.labels();
        assertEquals(Arrays.stream(labels).max().orElse(0), fragments.count());
        int[] inside = Shapes.subBoxIndices(box, min, shape);
        int[] strides = VoxelBox.strides(shape);
        int compared = 0;
        int[] p = new int[3];
        for (int i = 0; i < labels.length; i++) {
          for (int d = 0; d < 3; d++) {
            int j = i + strides[d];
            if (interior(p, reach, shape) && p[d] + 1 < shape[d] - reach[d]) {
              assertEquals(wholeLabels[inside[i]] == wholeLabels[inside[j]],
                  labels[i] == labels[j], preset.presetName() + " box at "
                      + Arrays.toString(min) + ", voxel " + Arrays.toString(p) + ", axis " + d);
              compared++;
            }
          }
          VoxelBox.advance(p, shape);
        }
        assertTrue(compared > 10_000, "compared " + compared + " voxel pairs");
      }
    }
  }

  private static boolean interior(int[] p, int[] reach, int[] shape) {
    for (int d = 0; d < p.length; d++) {
      if (p[d] < reach[d] || p[d] >= shape[d] - reach[d]) {
        return false;
      }
    }
    return true;
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
