package org.sunder.blockwise.partition;

import org.sunder.blockwise.partition.config.PartitionMethod;


/**
 * Partitions a {@link SegmentGraph} (the global solve's reduced graph): one implementation per
 * family of solve methods (agglomeration continued from the aggregated statistics; multicut on
 * summed weights; the Mutex Watershed), chosen by {@link PartitionMethod#solver}.
 * Deterministic: the same graph gives the same clusters.
 */
public interface ReducedGraphSolver {

  /** A name for reports, e.g. {@code "agglomeration mean"}. */
  String name();

  /** Per node, the index of its cluster (any numbering; nodes with equal values are joined). */
  int[] clusters(SegmentGraph graph);
}
