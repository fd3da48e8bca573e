package org.sunder.stitching;

import org.sunder.blockwise.partition.Linkage;
import org.sunder.blockwise.partition.Multicut;

/**
 * The reduced graph as a multicut problem: each pair's weight is its linkage value over the
 * aggregated statistics (with the default sum linkage: the summed weights of all its voxel
 * edges, as the fragments' multicut inside a block uses), solved by greedy additive edge
 * contraction and Kernighan–Lin refinement ({@link Multicut}).
 */
final class MulticutSolver implements ReducedGraphSolver {
  private final Linkage linkage;

  MulticutSolver(Linkage linkage) {
    this.linkage = linkage;
  }

  @Override
  public String name() {
    return "multicut on " + linkage.jsonName() + " weights";
  }

  @Override
  public int[] clusters(ReducedGraph graph) {
    return Multicut.ofLinkage(graph.nodeCount(), graph.edges(), linkage, 0).labels();
  }
}
