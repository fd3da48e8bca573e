package org.sunder.stitching.solve;

import java.io.Serializable;

/**
 * What one part of a hierarchical solve level decided and what it hands up.
 *
 * @param merged nodes whose cluster representative changed in this part, ascending
 * @param representative per merged node, the representative of its cluster (the smallest
 *     provisional id in it)
 * @param remaining the edges for the next level: undecided edges inside the part and the edges
 *     leaving it, ends inside the part relabelled to their representatives
 * @param decidedEdges edges inside the part settled here
 * @param heldBackEdges edges inside the part left to the next level
 */
public record PartResult(long[] merged, long[] representative, SolveEdges remaining,
    long decidedEdges, long heldBackEdges) implements Serializable {}
