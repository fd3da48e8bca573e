package org.sunder.blockwise.partition;

import org.sunder.blockwise.graph.AffinityBlock;

/**
 * Partitions one block of affinities into segments. Implementations are deterministic (the same
 * block gives the same labels) and keep no state between calls, so one instance may serve many
 * blocks, one at a time per thread. {@link PartitionConfig#create()} builds the configured one.
 */
public interface Partitioner {
  /** The segmentation of {@code block}: labels 1..n in order of first voxel, 0 = masked. */
  Segmentation partition(AffinityBlock block);
}
