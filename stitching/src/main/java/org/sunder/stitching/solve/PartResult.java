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
    long decidedEdges, long heldBackEdges) implements Serializable {

  /**
   * The result of a part whose node {@code nodes[i]} (ascending) now has representative
   * {@code rep[i]}: the merged nodes are those whose representative differs from themselves.
   */
  static PartResult of(long[] nodes, long[] rep, SolveEdges remaining, long decidedEdges,
      long heldBackEdges) {
    int changed = 0;
    for (int i = 0; i < nodes.length; i++) {
      if (rep[i] != nodes[i]) {
        changed++;
      }
    }
    long[] merged = new long[changed];
    long[] representative = new long[changed];
    changed = 0;
    for (int i = 0; i < nodes.length; i++) {
      if (rep[i] != nodes[i]) {
        merged[changed] = nodes[i];
        representative[changed++] = rep[i];
      }
    }
    return new PartResult(merged, representative, remaining, decidedEdges, heldBackEdges);
  }
}
