package org.sunder.stitching.task;

import net.imglib2.FinalInterval;
import net.imglib2.img.basictypeaccess.array.ByteArray;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.DefectiveSections;
import org.sunder.stitching.setup.AffinityReader;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The seam stage's task for one face: read the provisional ids and the affinities of the face's
 * slab (as deep on each side as the longest offset along the face's axis) and aggregate every
 * voxel edge the face owns (all offsets, long-range ones with the partition's subsampling, which
 * is a function of global coordinates) into {@link SeamEdges}; for the fragment methods also the
 * pairs that continue across the face, from the continuation flags both blocks wrote. Reads only; runs after every
 * block of the partition stage. O(slab voxels * offsets).
 */
public final class SeamTask {
  private SeamTask() {}

  /** Runs the task for face {@code faceIndex}. */
  public static SeamEdges run(StitchingSetup setup, int faceIndex) {
    Face face = setup.grid().face(faceIndex);
    SeamExtraction.Box slab = SeamExtraction.slab(setup.grid(), face, setup.offsets());
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
        ? DefectiveSections.ignoredVoxels(affinities, config.fragments()) : null;
    return SeamExtraction.extract(setup.grid(), face, labels, continuations, ignored, graph);
  }
}
