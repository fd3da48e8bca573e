package org.sunder.blockwise.partition.fragments;

import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.multicut.Multicut;
import org.sunder.blockwise.partition.multicut.MulticutResult;

/**
 * The {@code "fragments-multicut"} method: {@link BlockFragments}, then a {@link Multicut} of
 * the fragment graph whose edge weights are the {@link Linkage} values of the statistics
 * between fragments (sum of the voxel-edge weights by default: with logit weights this is the
 * usual probabilistic multicut cost), solved by greedy additive edge contraction, then
 * Kernighan–Lin refinement when {@code kernighanLin}. Deterministic; stateless.
 */
public record FragmentsMulticutPartitioner(FragmentOptions fragments, Linkage linkage,
    WeightRule weights, Subsampling subsampling, boolean kernighanLin) implements Partitioner {

  /**
   * Whether its fragments' border voxels move ({@link FragmentBorders}); the run reads every
   * channel of a block's context for it (see the method's {@code movesFragmentBorders}).
   */
  public static final boolean MOVES_BORDERS = true;

  public FragmentsMulticutPartitioner {
    Objects.requireNonNull(fragments, "fragments");
    Objects.requireNonNull(linkage, "linkage");
    Objects.requireNonNull(weights, "weights");
    Objects.requireNonNull(subsampling, "subsampling");
  }

  @Override
  public Segmentation partition(AffinityBlock block) {
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling, MOVES_BORDERS);
    MulticutResult cut = solve(f.count(), f.statistics());
    return f.toSegmentation(cut.labels(), block.maskOrNull());
  }

  /**
   * The multicut with every cluster that holds an open voxel given back as its fragments
   * (unsettled pieces), so that the global solve's multicut decides them from the
   * fragment-level costs; see {@link BlockFragments#settled}.
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
    BlockFragments f = BlockFragments.of(block, fragments, weights, subsampling, MOVES_BORDERS,
        insideOrNull);
    return f.settled(solve(f.count(), f.statistics()).labels(), open,
        block.maskOrNull());
  }

  /** The multicut of nodes 0..count−1 with the statistics of ids 1..count as edge costs. */
  private MulticutResult solve(int count, EdgeStatistics statistics) {
    return Multicut.ofLinkage(count, statistics, linkage, 1, kernighanLin);
  }

  @Override
  public byte[] ignoredVoxels(AffinityBlock block) {
    return BlockFragments.ignoredVoxels(block, fragments);
  }
}
