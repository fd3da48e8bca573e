package org.sunder.blockwise.partition;

import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;

/**
 * The {@code "fragments-multicut"} method: {@link BlockFragments}, then a {@link Multicut} of
 * the fragment graph whose edge weights are the {@link Linkage} values of the statistics
 * between fragments (sum of the voxel-edge weights by default: with logit weights this is the
 * usual probabilistic multicut cost), solved by greedy additive edge contraction and
 * Kernighan–Lin refinement. Deterministic; stateless.
 */
public record FragmentsMulticutPartitioner(FragmentOptions fragments, Linkage linkage,
    WeightRule weights, Subsampling subsampling) implements Partitioner {

  public FragmentsMulticutPartitioner {
    Objects.requireNonNull(fragments, "fragments");
    Objects.requireNonNull(linkage, "linkage");
    Objects.requireNonNull(weights, "weights");
    Objects.requireNonNull(subsampling, "subsampling");
  }

  @Override
  public Segmentation partition(AffinityBlock block) {
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling);
    MulticutResult cut = solve(f.count(), f.statistics(), linkage);
    return f.toSegmentation(cut.labels(), block.maskOrNull());
  }

  /**
   * The multicut with every cluster that holds an open voxel given back as its fragments
   * (unsettled pieces), so that the global solve's multicut decides them from the
   * fragment-level costs; see {@link BlockFragments#settled}.
   */
  @Override
  public SettledPartition partitionSettled(AffinityBlock block, byte[] open) {
    SettledPartition.checkOpen(open, block.voxelCount());
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling);
    return f.settled(solve(f.count(), f.statistics(), linkage).labels(), open,
        block.maskOrNull());
  }

  /** The multicut of nodes 0..count−1 with the statistics of ids 1..count as edge costs. */
  static MulticutResult solve(int count, EdgeStatistics statistics, Linkage linkage) {
    return Multicut.ofLinkage(count, statistics, linkage, 1);
  }
}
