package org.sunder.stitching.task;

import java.nio.file.Path;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.metrics.LabelArrays;
import org.sunder.blockwise.partition.fragments.BoundaryMap;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.stitching.setup.AffinityReader;
import org.sunder.stitching.setup.StitchingSetup;

/** Reads of one box for pictures and reports: labels, and the boundary map of the affinities. */
public final class BoxReads {
  private BoxReads() {}

  /** The labels of {@code dataset} in the box {@code [min, max]} (inclusive), dimension 0 fastest. */
  public static long[] labels(String container, String dataset, long[] min, long[] max) {
    Dataset data = Container.open(Path.of(container)).openDataset(dataset);
    ArrayImg<?, ?> img = data.read(new FinalInterval(min, max));
    return LabelArrays.labels(img, data.dataType());
  }

  /**
   * The boundary map ({@link BoundaryMap}: 0 inside objects, 1 on predicted boundaries) of the
   * run's affinities in the box {@code [min, max]} (inclusive), dimension 0 fastest; masked
   * voxels are not treated apart.
   */
  public static float[] boundaryMap(StitchingSetup setup, long[] min, long[] max) {
    AffinityBlock block = AffinityReader.read(setup, min, max);
    int[] shape = block.shape();
    int[][] offsets = setup.offsets().vectors();
    float[] floats = block.floatValuesOrNull();
    return floats != null ? BoundaryMap.of(floats, shape, offsets, null, -1)
        : BoundaryMap.of(block.byteValuesOrNull(), shape, offsets, null, -1);
  }
}
