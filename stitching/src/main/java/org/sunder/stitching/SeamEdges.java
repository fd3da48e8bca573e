package org.sunder.stitching;

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
 * @param face the face index
 * @param edges sum, count, min and max of the edge weights per pair of provisional ids
 */
public record SeamEdges(int face, EdgeStatistics edges) implements Serializable {}
