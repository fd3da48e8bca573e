package org.sunder.stitching;

import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.Agglomeration;
import org.sunder.blockwise.partition.Linkage;

/**
 * Continues the blocks' agglomeration on the reduced graph: {@link Agglomeration} over the
 * aggregated statistics, with the configured linkage, constraints and threshold. Because a
 * cluster's linkage is computed from summed statistics, merging two segments across a face and
 * then comparing the result with a third gives the same value a whole-volume run would compute
 * from those voxel edges.
 *
 * <p>{@code keepBlockDecisions}: pairs of segments of one block that the block left apart become
 * cannot-link constraints (their minimum is replaced by {@link #APART}). Used for the Mutex
 * Watershed, which continues as absolute-maximum linkage with constraints (its published
 * equivalence, "A Generalized Framework for Agglomerative Clustering of Signed Graphs applied to
 * Instance Segmentation", 2019/2022): two touching segments the Mutex Watershed left apart were
 * separated by a mutual exclusion, which the statistics of the core alone need not show.
 */
final class AgglomerativeSolver implements ReducedGraphSolver {
  /** The weight that encodes "kept apart by its block"; larger than any edge weight. */
  static final double APART = -1e300;

  private final Agglomeration agglomeration;
  private final boolean keepBlockDecisions;
  private final String name;

  AgglomerativeSolver(Linkage linkage, boolean constraints, double threshold,
      boolean keepBlockDecisions, String name) {
    Agglomeration base = new Agglomeration(linkage, constraints);
    this.agglomeration = constraints ? base : base.withThreshold(threshold);
    this.keepBlockDecisions = keepBlockDecisions;
    this.name = name;
  }

  @Override
  public String name() {
    return name;
  }

  @Override
  public int[] clusters(ReducedGraph graph) {
    EdgeStatistics edges = keepBlockDecisions ? withBlockDecisions(graph) : graph.edges();
    return agglomeration.run(graph.nodeCount(), edges).clustering().clusterOf();
  }

  private static EdgeStatistics withBlockDecisions(ReducedGraph graph) {
    EdgeStatistics edges = graph.edges();
    double[] min = edges.copyMin();
    boolean[] sameBlock = graph.sameBlock();
    for (int e = 0; e < min.length; e++) {
      if (sameBlock[e]) {
        min[e] = APART;
      }
    }
    return EdgeStatistics.of(edges.copyU(), edges.copyV(), edges.copySum(), edges.copyCount(),
        min, edges.copyMax());
  }
}
