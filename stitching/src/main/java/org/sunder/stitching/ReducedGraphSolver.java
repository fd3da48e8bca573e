package org.sunder.stitching;

/**
 * Partitions a {@link ReducedGraph}: one implementation per family of solve methods
 * (agglomeration continued from the aggregated statistics; multicut on summed weights).
 * Deterministic: the same graph gives the same clusters.
 */
interface ReducedGraphSolver {

  /** A name for reports, e.g. {@code "agglomeration mean"}. */
  String name();

  /** Per node, the index of its cluster (any numbering; nodes with equal values are joined). */
  int[] clusters(ReducedGraph graph);
}
