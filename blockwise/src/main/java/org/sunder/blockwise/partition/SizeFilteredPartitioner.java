package org.sunder.blockwise.partition;

import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;

/**
 * Any {@link Partitioner} followed by a {@link SizeFilter}: the region graph of the segments
 * over the block's signed edges gives the attraction between them, and {@link CannotLink} says
 * which pairs the method itself kept apart by a constraint. Adds one pass over the edges.
 */
public record SizeFilteredPartitioner(Partitioner inner, SizeFilter filter, WeightRule weights,
    Subsampling subsampling, CannotLink cannotLink) implements Partitioner {

  /** Which pairs of segments the size filter must not join. */
  public enum CannotLink {
    /** None: the method had no constraints (unconstrained agglomeration, multicut). */
    NONE,
    /** Pairs joined by a repulsive edge: the Mutex Watershed's mutual exclusions. */
    REPULSIVE_EDGE,
    /** Pairs with a non-zero linkage: what constrained agglomeration leaves constrained. */
    NONZERO_LINKAGE
  }

  public SizeFilteredPartitioner {
    Objects.requireNonNull(inner, "inner");
    Objects.requireNonNull(filter, "filter");
    Objects.requireNonNull(weights, "weights");
    Objects.requireNonNull(subsampling, "subsampling");
    Objects.requireNonNull(cannotLink, "cannotLink");
  }

  @Override
  public Segmentation partition(AffinityBlock block) {
    Segmentation segmentation = inner.partition(block);
    EdgeStatistics statistics = RegionGraph.of(segmentation.labels(),
        GridGraph.of(block, weights, subsampling)).statistics();
    boolean[] flags = switch (cannotLink) {
      case NONE -> null;
      case REPULSIVE_EDGE -> SizeFilter.repulsivePairs(statistics);
      case NONZERO_LINKAGE -> SizeFilter.nonZeroLinkagePairs(statistics, filter.linkage());
    };
    return filter.apply(segmentation, statistics, flags);
  }
}
