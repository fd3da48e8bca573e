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
 * <p>{@code keepBlockDecisions}: pairs of segments of one block that the block kept apart by a
 * repulsive edge become cannot-link constraints (a row of weight {@link #APART} is merged in,
 * so their minimum becomes {@link #APART}; only minimum and maximum matter to the
 * absolute-maximum linkage). Used for the Mutex
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
    int n = graph.separatedU().length;
    long[] u = new long[n];
    long[] v = new long[n];
    double[] value = new double[n];
    long[] count = new long[n];
    for (int i = 0; i < n; i++) {
      u[i] = graph.separatedU()[i];
      v[i] = graph.separatedV()[i];
      value[i] = APART;
      count[i] = 1;
    }
    EdgeStatistics apart = EdgeStatistics.of(u, v, value, count, value, value);
    return graph.edges().merge(apart);
  }
}
