package org.sunder.blockwise.partition;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.partition.config.PartitionConfig;

/**
 * Partitions one block of affinities into segments. Implementations are deterministic (the same
 * block gives the same labels) and keep no state between calls, so one instance may serve many
 * blocks, one at a time per thread. {@link PartitionConfig#create()} builds the configured one.
 */
public interface Partitioner {
  /** The segmentation of {@code block}: labels 1..n in order of first voxel, 0 = masked. */
  Segmentation partition(AffinityBlock block);

  /**
   * The partition of {@code block} with the merges that lean on its open voxels ({@code open[i]
   * != 0}, one flag per voxel) held back; see {@link SettledPartition}. The Mutex Watershed
   * holds merges back; the fragment methods give back the clusters that hold an open voxel as
   * their fragments, from which the solve continues the agglomeration or multicut. The other
   * methods return their partition with every segment settled (cutting a voxel agglomeration's
   * clusters at open voxels changes the order in which the solve would continue it, and
   * measured worse), and blockwise runs then rely on the halo alone.
   */
  default SettledPartition partitionSettled(AffinityBlock block, byte[] open) {
    SettledPartition.checkOpen(open, block.voxelCount());
    return SettledPartition.whole(partition(block));
  }

  /**
   * As {@link #partitionSettled(AffinityBlock, byte[])}, with leave to measure the statistics
   * between the pieces in passing ({@link SettledPartition#edgesOrNull()}): over every edge, and
   * over the edges whose ends are both marked in {@code inside} (one flag per voxel; for a block,
   * its core). The fragment methods do, since they walk the edges anyway; the others measure
   * nothing and the caller walks the edges itself.
   */
  default SettledPartition partitionSettled(AffinityBlock block, byte[] open, byte[] inside) {
    return partitionSettled(block, open);
  }

  /**
   * Per voxel of {@code block}, 1 where the method leaves the voxel's edges out of the
   * statistics between segments, or null when it counts every edge; a size filter after the
   * method weighs the segments' attraction by the same edges. The fragment methods leave out
   * defective sections and detached voxels ({@code BlockFragments#ignoredVoxels}).
   */
  default byte[] ignoredVoxels(AffinityBlock block) {
    return null;
  }
}
