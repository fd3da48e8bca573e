package org.sunder.stitching.setup;

import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.store.Container;

/** Reads the affinities (all channels) and the optional mask of a box into an {@link AffinityBlock}. */
public final class AffinityReader {
  private AffinityReader() {}

  public static AffinityBlock read(StitchingSetup setup, long[] min, long[] max) {
    Container input = setup.openInput();
    int n = min.length;
    long[] amin = java.util.Arrays.copyOf(min, n + 1);
    long[] amax = java.util.Arrays.copyOf(max, n + 1);
    amax[n] = setup.offsets().count() - 1;
    ArrayImg<?, ?> affinities = input.openDataset(setup.affinitiesPath())
        .read(new FinalInterval(amin, amax));
    ArrayImg<?, ?> mask = setup.hasMask()
        ? input.openDataset(setup.maskPath()).read(new FinalInterval(min, max)) : null;
    return AffinityBlock.of(affinities, min, setup.offsets(), mask);
  }
}
