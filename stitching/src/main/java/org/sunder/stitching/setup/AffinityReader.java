package org.sunder.stitching.setup;

import java.util.Arrays;
import java.util.List;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.store.Container;

/** Reads the affinities and the optional mask of a box into an {@link AffinityBlock}. */
public final class AffinityReader {
  private AffinityReader() {}

  /** All channels of the box {@code min..max} (inclusive, memory order). */
  public static AffinityBlock read(StitchingSetup setup, long[] min, long[] max) {
    return read(setup, min, max, 0, setup.offsets().count() - 1);
  }

  /**
   * The extended box of {@code block}; for a method that {@linkplain
   * org.sunder.blockwise.partition.config.PartitionMethod#usesFragments uses fragments}, with its
   * {@linkplain AffinityBlock#withContext context}: the nearest-neighbour channels of the
   * {@link #contextBox} (every channel for a method that moves the borders of fragments made per
   * section), so that the fragments in the extended box are those a whole-volume run makes
   * there but for rare floods from farther away.
   */
  public static AffinityBlock readBlock(StitchingSetup setup, Block block) {
    long[] min = block.extendedMin();
    long[] max = block.extendedMax();
    int halos = setup.partition().method().contextHalos();
    if (halos == 0) {
      return read(setup, min, max);
    }
    FragmentOptions fragments = setup.partition().fragments();
    int sliceAxis = fragments == null ? -1
        : fragments.forDimension(block.numDimensions()).sliceAxis();
    long[][] context = contextBox(setup.grid(), block, sliceAxis, halos);
    if (Arrays.equals(context[0], min) && Arrays.equals(context[1], max)) {
      return read(setup, min, max);
    }
    int all = setup.offsets().count() - 1;
    int[] channels = setup.partition().method().movesFragmentBorders() && sliceAxis >= 0
        ? new int[] {0, all} : nearestNeighbourChannels(setup.offsets());
    // one pass over the chunks: the context holds the extended box, whose chunks then decode once
    Container input = setup.openInput();
    List<ArrayImg<?, ?>> images = input.openDataset(setup.affinitiesPath()).read(
        List.of(channelBox(min, max, 0, all),
            channelBox(context[0], context[1], channels[0], channels[1])));
    List<ArrayImg<?, ?>> masks = setup.hasMask()
        ? input.openDataset(setup.maskPath()).read(List.of(new FinalInterval(min, max),
            new FinalInterval(context[0], context[1])))
        : Arrays.asList(null, null);
    return block(setup, min, images.get(0), masks.get(0), 0, all).withContext(
        block(setup, context[0], images.get(1), masks.get(1), channels[0], channels[1]));
  }

  /**
   * The box of a block's fragment context: its extended box grown by {@code halos} times the
   * grid's halo on every side, clipped to the volume ({@code {min, max}}, inclusive, memory
   * order), except along {@code sliceAxis} (or none, when −1): fragments made plane by plane
   * flood within a plane.
   */
  public static long[][] contextBox(BlockGrid grid, Block block, int sliceAxis, int halos) {
    int n = grid.numDimensions();
    long[] min = new long[n];
    long[] max = new long[n];
    for (int d = 0; d < n; d++) {
      int grow = d == sliceAxis ? 0 : halos * grid.halo()[d];
      min[d] = Math.max(0, block.extendedMin()[d] - grow);
      max[d] = Math.min(grid.volumeShape()[d] - 1, block.extendedMax()[d] + grow);
    }
    return new long[][] {min, max};
  }

  /** The first and last channel of the smallest run of channels holding every unit offset. */
  static int[] nearestNeighbourChannels(Offsets offsets) {
    int first = -1;
    int last = -1;
    for (int k = 0; k < offsets.count(); k++) {
      if (!offsets.isLongRange(k)) {
        first = first < 0 ? k : first;
        last = k;
      }
    }
    return first < 0 ? new int[] {0, offsets.count() - 1} : new int[] {first, last};
  }

  private static AffinityBlock read(StitchingSetup setup, long[] min, long[] max,
      int firstChannel, int lastChannel) {
    Container input = setup.openInput();
    ArrayImg<?, ?> affinities = input.openDataset(setup.affinitiesPath())
        .read(channelBox(min, max, firstChannel, lastChannel));
    ArrayImg<?, ?> mask = setup.hasMask()
        ? input.openDataset(setup.maskPath()).read(new FinalInterval(min, max)) : null;
    return block(setup, min, affinities, mask, firstChannel, lastChannel);
  }

  /** The box {@code min..max} with channels {@code firstChannel..lastChannel} as its last axis. */
  private static FinalInterval channelBox(long[] min, long[] max, int firstChannel,
      int lastChannel) {
    int n = min.length;
    long[] amin = Arrays.copyOf(min, n + 1);
    long[] amax = Arrays.copyOf(max, n + 1);
    amin[n] = firstChannel;
    amax[n] = lastChannel;
    return new FinalInterval(amin, amax);
  }

  /** The channels' affinities of the box at {@code min}, with its mask or null. */
  private static AffinityBlock block(StitchingSetup setup, long[] min, ArrayImg<?, ?> affinities,
      ArrayImg<?, ?> maskOrNull, int firstChannel, int lastChannel) {
    Offsets offsets = firstChannel == 0 && lastChannel == setup.offsets().count() - 1
        ? setup.offsets()
        : new Offsets(Arrays.copyOfRange(setup.offsets().vectors(), firstChannel, lastChannel + 1));
    return AffinityBlock.of(affinities, min, offsets, maskOrNull);
  }
}
