package org.sunder.blockwise.partition.agglomeration;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;

/** The {@code "agglomeration"} method: {@link Agglomeration} on the block's voxel graph. */
public record AgglomerationPartitioner(Agglomeration agglomeration, WeightRule weights,
    Subsampling subsampling) implements Partitioner {

  @Override
  public Segmentation partition(AffinityBlock block) {
    Clustering clusters = agglomeration.run(GridGraph.of(block, weights, subsampling))
        .clustering();
    return Segmentation.fromClusters(clusters.clusterOf(), block.maskOrNull());
  }
}
