package org.sunder.stitching.task;

import java.io.Serializable;
import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * The aggregated voxel edges a face owns, keyed by the provisional ids of their two ends.
 *
 * <p>Ownership: a voxel edge whose ends lie in the cores of different blocks belongs to exactly
 * one face. Let {@code a} be the smallest axis along which the two blocks' grid positions differ
 * and {@code r} the end in the block with the smaller grid position along {@code a}; the edge
 * belongs to the face on the upper side of {@code r}'s block along {@code a}. For blocks adjacent
 * across a face that is simply that face; edges between blocks that only meet at an edge or a
 * corner of the grid (diagonal long-range offsets) are owned the same way, so nothing is counted
 * twice or lost.
 *
 * <p>Continued pairs: a voxel pair straddling the face (nearest neighbours along its axis) is
 * <em>continued</em> when both blocks saw one piece run through it: each block's partition of
 * its extended box gave the two voxels the same piece (see
 * {@link CoreSegments#continuations}). For the fragment methods such pieces are the two
 * halves of one fragment that the face cut; the solve joins them before it continues the
 * method.
 *
 * @param face the face index
 * @param edges sum, count, min and max of the edge weights per pair of provisional ids
 * @param continued per pair of provisional ids, the number of continued voxel pairs (as the
 *     count; sum = count, min = max = 1); empty for methods that track no continuations
 */
public record SeamEdges(int face, EdgeStatistics edges, EdgeStatistics continued)
    implements Serializable {

  /** Seam edges without continued pairs. */
  public SeamEdges(int face, EdgeStatistics edges) {
    this(face, edges, EdgeStatistics.empty());
  }
}
