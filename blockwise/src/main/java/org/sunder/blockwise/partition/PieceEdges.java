package org.sunder.blockwise.partition;

import java.util.Objects;
import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * Statistics between the pieces of a {@link SettledPartition} (piece labels as in its
 * segmentation) that a method measured while partitioning, so that the caller need not walk the
 * box's edges a second time.
 *
 * @param inside over the edges whose ends both lie in the region the caller marked (for a
 *     block, its core)
 * @param anywhere over every edge of the box
 */
public record PieceEdges(EdgeStatistics inside, EdgeStatistics anywhere) {

  public PieceEdges {
    Objects.requireNonNull(inside, "inside");
    Objects.requireNonNull(anywhere, "anywhere");
  }
}
