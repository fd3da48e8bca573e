package org.sunder.blockwise.partition;

import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * The graph a {@link ReducedGraphSolver} partitions: nodes are segments that blocks could not
 * settle on their own, edges the aggregated statistics of the voxel edges between them, and
 * the pairs a block kept apart. The stitching module's reduced graph is one.
 */
public interface SegmentGraph {

  /** A key per node (for a reduced graph: its provisional id), ascending. */
  long[] nodeIds();

  /** Statistics between node indices ({@code u < v}, canonical order). */
  EdgeStatistics edges();

  /** With {@link #separatedV()}: node-index pairs a block kept apart. */
  int[] separatedU();

  /** See {@link #separatedU()}. */
  int[] separatedV();

  default int nodeCount() {
    return nodeIds().length;
  }
}
