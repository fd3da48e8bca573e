package org.sunder.stitching;

import org.sunder.blockwise.graph.EdgeStatistics;
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
    EdgeStatistics edges = graph.edges();
    int m = edges.size();
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    for (int e = 0; e < m; e++) {
      u[e] = (int) edges.u(e);
      v[e] = (int) edges.v(e);
      w[e] = linkage.value(edges.sum(e), edges.count(e), edges.min(e), edges.max(e));
    }
    return Multicut.solve(graph.nodeCount(), u, v, w).labels();
  }
}
