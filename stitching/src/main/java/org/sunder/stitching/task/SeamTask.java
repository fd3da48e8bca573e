package org.sunder.stitching.task;

import net.imglib2.FinalInterval;
import net.imglib2.img.basictypeaccess.array.ByteArray;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BlockFragments;
import org.sunder.blockwise.partition.fragments.DetachedVoxels;
import org.sunder.stitching.setup.AffinityReader;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The seam stage's task for one face: read the provisional ids and the affinities of the face's
 * slab (as deep on each side as the longest offset along the face's axis; see {@link #readBox})
 * and aggregate every voxel edge the face owns (all offsets, long-range ones with the
 * partition's subsampling, which is a function of global coordinates) into {@link SeamEdges};
 * for the fragment methods also the pairs that continue across the face, from the continuation
 * flags both blocks wrote. Reads only; runs after every block of the partition stage.
 * O(slab voxels * offsets).
 */
public final class SeamTask {
  private SeamTask() {}

  /** Runs the task for face {@code faceIndex}. */
  public static SeamEdges run(StitchingSetup setup, int faceIndex) {
    Face face = setup.grid().face(faceIndex);
    SeamExtraction.Box slab = readBox(setup, face);
    AffinityBlock affinities = AffinityReader.read(setup, slab.min(), slab.max());
    long[] labels = ((LongArray) setup.openLabels()
        .read(new FinalInterval(slab.min(), slab.max())).update(null)).getCurrentStorageArray();
    PartitionConfig config = setup.partition();
    GridGraph graph = GridGraph.of(affinities, config.weights(), config.subsampling());
    byte[] continuations = setup.tracksContinuations()
        ? ((ByteArray) setup.openContinuations().read(new FinalInterval(slab.min(), slab.max()))
            .update(null)).getCurrentStorageArray()
        : null;
    byte[] ignored = setup.tracksContinuations()
        ? BlockFragments.ignoredVoxels(affinities, config.fragments()) : null;
    return SeamExtraction.extract(setup.grid(), face, labels, continuations, ignored, graph);
  }

  /**
   * The box the task reads for {@code face}: its slab ({@link SeamExtraction#slab}), for the
   * fragment methods grown by {@link DetachedVoxels#REACH} voxels on every side (clipped to the
   * volume) so that every voxel of the slab is judged from its whole neighbourhood. A wider
   * slab holds the same edges of the face (each has both ends within the slab) and the same
   * face voxel pairs.
   */
  public static SeamExtraction.Box readBox(StitchingSetup setup, Face face) {
    SeamExtraction.Box slab = SeamExtraction.slab(setup.grid(), face, setup.offsets());
    if (!setup.tracksContinuations()) {
      return slab;
    }
    long[] volume = setup.grid().volumeShape();
    long[] min = slab.min().clone();
    long[] max = slab.max().clone();
    for (int d = 0; d < min.length; d++) {
      min[d] = Math.max(0, min[d] - DetachedVoxels.REACH);
      max[d] = Math.min(volume[d] - 1, max[d] + DetachedVoxels.REACH);
    }
    return new SeamExtraction.Box(min, max);
  }
}
