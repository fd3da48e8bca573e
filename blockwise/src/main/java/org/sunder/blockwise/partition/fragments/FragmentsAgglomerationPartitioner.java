package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;
import org.sunder.blockwise.partition.agglomeration.Agglomeration;

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
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling, false);
    return f.toSegmentation(clusterOfFragment(f), block.maskOrNull());
  }

  /**
   * The agglomeration with every cluster that holds an open voxel given back as its fragments
   * (unsettled pieces), so that the global solve continues the agglomeration from the
   * fragment-level statistics; see {@link BlockFragments#settled}.
   */
  @Override
  public SettledPartition partitionSettled(AffinityBlock block, byte[] open) {
    return settled(block, open, null);
  }

  /** As {@link #partitionSettled(AffinityBlock, byte[])}, with the pieces' statistics. */
  @Override
  public SettledPartition partitionSettled(AffinityBlock block, byte[] open, byte[] inside) {
    return settled(block, open, Objects.requireNonNull(inside, "inside"));
  }

  private SettledPartition settled(AffinityBlock block, byte[] open, byte[] insideOrNull) {
    SettledPartition.checkOpen(open, block.voxelCount());
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling, false,
        insideOrNull);
    return f.settled(clusterOfFragment(f), open, block.maskOrNull());
  }

  private int[] clusterOfFragment(BlockFragments f) {
    int[] clusterOfNode = agglomeration.run(f.count() + 1, f.statistics()).clustering()
        .clusterOf();
    return Arrays.copyOfRange(clusterOfNode, 1, clusterOfNode.length);
  }

  @Override
  public byte[] ignoredVoxels(AffinityBlock block) {
    return BlockFragments.ignoredVoxels(block, fragments);
  }
}
