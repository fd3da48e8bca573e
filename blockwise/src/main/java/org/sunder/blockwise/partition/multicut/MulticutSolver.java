package org.sunder.blockwise.partition.multicut;

import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.SegmentGraph;
import org.sunder.blockwise.partition.agglomeration.Linkage;


/**
 * The reduced graph as a multicut problem: each pair's weight is its linkage value over the
 * aggregated statistics (with the default sum linkage: the summed weights of all its voxel
 * edges, as the fragments' multicut inside a block uses), solved by greedy additive edge
 * contraction and, when asked, Kernighan–Lin refinement ({@link Multicut}).
 */
public final class MulticutSolver implements ReducedGraphSolver {
  private final Linkage linkage;
  private final boolean kernighanLin;

  public MulticutSolver(Linkage linkage, boolean kernighanLin) {
    this.linkage = linkage;
    this.kernighanLin = kernighanLin;
  }

  @Override
  public String name() {
    return "multicut on " + linkage.jsonName() + " weights"
        + (kernighanLin ? " with Kernighan-Lin refinement" : "");
  }

  @Override
  public int[] clusters(SegmentGraph graph) {
    return Multicut.ofLinkage(graph.nodeCount(), graph.edges(), linkage, 0, kernighanLin)
        .labels();
  }
}
