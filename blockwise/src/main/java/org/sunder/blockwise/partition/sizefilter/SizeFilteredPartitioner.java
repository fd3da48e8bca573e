package org.sunder.blockwise.partition.sizefilter;

import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;
import org.sunder.blockwise.partition.agglomeration.Linkage;

/**
 * Any {@link Partitioner} followed by a {@link SizeFilter}: the region graph of the segments
 * over the block's signed edges gives the attraction between them, and {@link CannotLink} says
 * which pairs the method itself kept apart by a constraint ({@code methodLinkage} is the
 * method's linkage, used only for {@link CannotLink#NONZERO_LINKAGE}). The edges the method
 * leaves out ({@link Partitioner#ignoredVoxels}) stay out. Adds one pass over the edges.
 *
 * <p>In a blockwise run ({@link #partitionSettled(AffinityBlock, byte[], byte[])}) a piece that
 * is unsettled or reaches a voxel the caller marks (a block's halo and the core's voxels near a
 * face) may be part of a larger segment of the volume, so the filter leaves it alone: it is
 * never merged away as a small one, though it may absorb a small whole segment beside it.
 */
public record SizeFilteredPartitioner(Partitioner inner, SizeFilter filter, WeightRule weights,
    Subsampling subsampling, CannotLink cannotLink, Linkage methodLinkage)
    implements Partitioner {

  /** Which pairs of segments the size filter must not join. */
  public enum CannotLink {
    /** None: the method had no constraints (unconstrained agglomeration, multicut). */
    NONE,
    /** Pairs joined by a repulsive edge: the Mutex Watershed's mutual exclusions. */
    REPULSIVE_EDGE,
    /**
     * Pairs with a non-zero {@code methodLinkage}: what constrained agglomeration leaves
     * constrained.
     */
    NONZERO_LINKAGE
  }

  public SizeFilteredPartitioner {
    Objects.requireNonNull(inner, "inner");
    Objects.requireNonNull(filter, "filter");
    Objects.requireNonNull(weights, "weights");
    Objects.requireNonNull(subsampling, "subsampling");
    Objects.requireNonNull(cannotLink, "cannotLink");
    Objects.requireNonNull(methodLinkage, "methodLinkage");
  }

  @Override
  public Segmentation partition(AffinityBlock block) {
    return filtered(block, inner.partition(block), null);
  }

  /** As {@link #partitionSettled(AffinityBlock, byte[], byte[])} with the open voxels marked. */
  @Override
  public SettledPartition partitionSettled(AffinityBlock block, byte[] open) {
    return partitionSettled(block, open, open);
  }

  /**
   * The inner method's settled partition, then the filter, leaving alone every unsettled piece
   * and every piece with a voxel marked in {@code leaveAlone} (one flag per voxel, non-zero =
   * marked). A piece that absorbs a small one keeps its unsettled flag.
   */
  public SettledPartition partitionSettled(AffinityBlock block, byte[] open, byte[] leaveAlone) {
    SettledPartition.checkOpen(leaveAlone, block.voxelCount());
    SettledPartition settled = inner.partitionSettled(block, open);
    Segmentation pieces = settled.pieces();
    int[] labels = pieces.labels();
    boolean[] alone = settled.unsettled().clone();
    for (int i = 0; i < labels.length; i++) {
      if (leaveAlone[i] != 0) {
        alone[labels[i]] = true;
      }
    }
    alone[0] = false;
    Segmentation out = filtered(block, pieces, alone);
    boolean[] unsettled = new boolean[out.segmentCount() + 1];
    int[] outLabels = out.labels();
    for (int i = 0; i < labels.length; i++) {
      if (settled.unsettled()[labels[i]]) {
        unsettled[outLabels[i]] = true;
      }
    }
    unsettled[0] = false;
    return new SettledPartition(out, unsettled);
  }

  @Override
  public byte[] ignoredVoxels(AffinityBlock block) {
    return inner.ignoredVoxels(block);
  }

  private Segmentation filtered(AffinityBlock block, Segmentation segmentation,
      boolean[] leaveAloneOrNull) {
    EdgeStatistics statistics = RegionGraph.of(segmentation.labels(),
        GridGraph.of(block, weights, subsampling), null, inner.ignoredVoxels(block)).statistics();
    return filter.apply(segmentation, statistics,
        cannotLinkFlags(cannotLink, statistics, methodLinkage), leaveAloneOrNull);
  }

  /** The cannot-link flags of {@code statistics}' rows, or null for {@link CannotLink#NONE}. */
  public static boolean[] cannotLinkFlags(CannotLink cannotLink, EdgeStatistics statistics,
      Linkage methodLinkage) {
    return switch (cannotLink) {
      case NONE -> null;
      case REPULSIVE_EDGE -> SizeFilter.repulsivePairs(statistics);
      case NONZERO_LINKAGE -> SizeFilter.nonZeroLinkagePairs(statistics, methodLinkage);
    };
  }
}
