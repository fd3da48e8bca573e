package org.sunder.blockwise.partition.mutex;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;

/** The {@code "mutex-watershed"} method: {@link MutexWatershed} on the block's voxel graph. */
public record MutexWatershedPartitioner(WeightRule weights, Subsampling subsampling)
    implements Partitioner {

  @Override
  public Segmentation partition(AffinityBlock block) {
    return MutexWatershed.partition(GridGraph.of(block, weights, subsampling));
  }

  @Override
  public SettledPartition partitionSettled(AffinityBlock block, byte[] open) {
    return MutexWatershed.partitionSettled(GridGraph.of(block, weights, subsampling), open);
  }
}
