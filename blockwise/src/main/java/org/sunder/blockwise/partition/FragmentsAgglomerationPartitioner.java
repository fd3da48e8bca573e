package org.sunder.blockwise.partition;

import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;

/**
 * The {@code "fragments-agglomeration"} method: {@link BlockFragments}, then
 * {@link Agglomeration} (its linkage, constraints and threshold) on the fragment graph,
 * continuing from the aggregated statistics between fragments. Deterministic; stateless.
 */
public record FragmentsAgglomerationPartitioner(FragmentOptions fragments,
    Agglomeration agglomeration, WeightRule weights, Subsampling subsampling)
    implements Partitioner {

  public FragmentsAgglomerationPartitioner {
    Objects.requireNonNull(fragments, "fragments");
    Objects.requireNonNull(agglomeration, "agglomeration");
    Objects.requireNonNull(weights, "weights");
    Objects.requireNonNull(subsampling, "subsampling");
  }

  @Override
  public Segmentation partition(AffinityBlock block) {
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling);
    int[] clusterOfNode = agglomeration.run(f.count() + 1, f.statistics()).clustering()
        .clusterOf();
    return f.toSegmentation(Arrays.copyOfRange(clusterOfNode, 1, clusterOfNode.length),
        block.maskOrNull());
  }
}
