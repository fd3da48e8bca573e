package org.sunder.stitching.task;

import net.imglib2.img.array.ArrayImgs;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.SettledPartition;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;
import org.sunder.blockwise.store.Dataset;
import org.sunder.stitching.setup.AffinityReader;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The partition stage's task for one block: read the extended box's affinities (and mask; for
 * the fragment methods with a context, see {@link AffinityReader#readBlock}), partition them with the configured method (merges that lean on the halo's open voxels held
 * back for the global solve, see {@link CoreSegments}; a size filter, for the voxel methods,
 * left to segments wholly in the core away from its faces; see {@link #filtersAfterSolve}), crop to the core, write the core's provisional ids (whole
 * chunks, so no other block's task touches them), for the fragment methods also the core's
 * continuation flags ({@link StitchingSetup#continuationsPath()}), and return the
 * {@link BlockSummary}.
 * Deterministic: a rerun writes the same bytes. Nothing is written before the partition is
 * complete. Cost: the partition of the extended box plus one pass over its edges for the inner
 * edges (see {@link CoreSegments}).
 */
public final class PartitionTask {
  private PartitionTask() {}

  /** Runs the task for block {@code blockIndex}; the label dataset must exist. */
  public static BlockSummary run(StitchingSetup setup, int blockIndex) {
    Block block = setup.grid().block(blockIndex);
    AffinityBlock affinities = AffinityReader.readBlock(setup, block);
    PartitionConfig config = setup.partition();
    CoreSegments.Result result = partition(setup, block, affinities, config);
    Dataset labels = setup.openLabels();
    int[] shape = block.coreShape();
    long[] dims = new long[shape.length];
    for (int d = 0; d < shape.length; d++) {
      dims[d] = shape[d];
    }
    if (result.continuations() != null) {
      setup.openContinuations().write(ArrayImgs.unsignedBytes(result.continuations(), dims),
          block.coreMin());
    }
    labels.write(ArrayImgs.unsignedLongs(result.provisionalLabels(), dims), block.coreMin());
    return result.summary();
  }

  /**
   * Runs the task's computation for block {@code blockIndex} (read the extended box, partition
   * it, crop to the core) exactly as {@link #run} does, writing nothing, and returns its wall
   * time in seconds: what {@code plan} times on a sample block.
   */
  public static double timeWithoutWriting(StitchingSetup setup, int blockIndex) {
    long start = System.nanoTime();
    Block block = setup.grid().block(blockIndex);
    AffinityBlock affinities = AffinityReader.readBlock(setup, block);
    partition(setup, block, affinities, setup.partition());
    return (System.nanoTime() - start) / 1e9;
  }

  static CoreSegments.Result partition(StitchingSetup setup, Block block,
      AffinityBlock affinities, PartitionConfig config) {
    byte[] open = CoreSegments.openVoxels(setup.grid(), block, setup.offsets());
    byte[] core = CoreSegments.coreVoxels(block);
    Partitioner partitioner = config.create();
    boolean filterAfterSolve = filtersAfterSolve(config);
    SettledPartition partition;
    if (partitioner instanceof SizeFilteredPartitioner filtered) {
      partition = filterAfterSolve ? filtered.inner().partitionSettled(affinities, open, core)
          : filtered.partitionSettled(affinities, open,
              union(open, CoreSegments.partialVoxels(setup.grid(), block, setup.offsets())));
    } else {
      partition = partitioner.partitionSettled(affinities, open, core);
    }
    GridGraph graph = partition.edgesOrNull() != null ? null
        : GridGraph.of(affinities, config.weights(), config.subsampling());
    int filterNodesBelow = config.minSegmentSize() <= 1 ? 0
        : filterAfterSolve ? config.minSegmentSize() : 1;
    return CoreSegments.of(setup.grid(), setup.idLayout(), block, setup.offsets(), partition,
        graph, filterNodesBelow, setup.tracksContinuations());
  }

  /**
   * Whether the size filter runs wholly after the global solve, on every segment of the volume
   * (the fragment methods, whose blocks hold few segments), so that a blockwise run filters in
   * the one-block run's order; otherwise each block filters the segments wholly inside its core
   * away from the faces and the solve filters the rest (the voxel methods, whose blocks may
   * hold a small segment per few dozen voxels, too many for one solve).
   */
  public static boolean filtersAfterSolve(PartitionConfig config) {
    return config.minSegmentSize() > 1 && config.method().usesFragments();
  }

  private static byte[] union(byte[] a, byte[] b) {
    byte[] either = new byte[a.length];
    for (int i = 0; i < a.length; i++) {
      either[i] = (byte) (a[i] | b[i]);
    }
    return either;
  }
}
