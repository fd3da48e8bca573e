package org.sunder.blockwise.partition.agglomeration;

import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.SegmentGraph;
import org.sunder.blockwise.partition.Segmentation;


/**
 * Continues the blocks' agglomeration on the reduced graph: {@link Agglomeration} over the
 * aggregated statistics, with the configured linkage, constraints and threshold ("A Generalized
 * Framework for Agglomerative Clustering of Signed Graphs applied to Instance Segmentation",
 * 2019/2022). Because a cluster's linkage is computed from summed statistics, merging two
 * segments across a face and then comparing the result with a third gives the value a
 * whole-volume run would compute from those voxel edges. O(p log p) for p pairs.
 */
public final class AgglomerativeSolver implements ReducedGraphSolver {
  private final Agglomeration agglomeration;
  private final String name;

  public AgglomerativeSolver(Linkage linkage, boolean constraints, double threshold, String name) {
    Agglomeration base = new Agglomeration(linkage, constraints);
    this.agglomeration = constraints ? base : base.withThreshold(threshold);
    this.name = name;
  }

  @Override
  public String name() {
    return name;
  }

  @Override
  public int[] clusters(SegmentGraph graph) {
    return agglomeration.run(graph.nodeCount(), graph.edges()).clustering().clusterOf();
  }
}
