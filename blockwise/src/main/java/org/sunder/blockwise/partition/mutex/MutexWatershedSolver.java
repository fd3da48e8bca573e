package org.sunder.blockwise.partition.mutex;

import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.SegmentGraph;
import org.sunder.blockwise.partition.Segmentation;

/**
 * Continues the blocks' Mutex Watershed ("The Mutex Watershed and its Objective: Efficient,
 * Parameter-Free Graph Partitioning", TPAMI 2020) on the reduced graph. Between two clusters
 * only the strongest attractive and the strongest repulsive edge can decide anything in the
 * Mutex Watershed (a weaker edge finds its two ends already joined or already separated), so
 * each pair contributes those two edges, its maximum (if positive) and its minimum (if
 * negative), and the Mutex Watershed of that sparse graph, started from the provisional segments,
 * is the Mutex Watershed of all their voxel edges. This is the absolute-maximum linkage with
 * constraints of "A Generalized Framework for Agglomerative Clustering of Signed Graphs applied
 * to Instance Segmentation" (2019/2022), computed with the Mutex Watershed's own order on ties.
 *
 * <p>Pairs a block kept apart through a repulsive edge ({@link SegmentGraph#separatedU()})
 * become repulsive edges of weight {@link #APART}, taken first: the block's
 * mutual exclusion stands. O(p log p) for p pairs.
 */
public final class MutexWatershedSolver implements ReducedGraphSolver {
  /** The weight that encodes "kept apart by its block"; stronger than any edge weight. */
  static final double APART = -1e300;

  @Override
  public String name() {
    return "mutex-watershed";
  }

  @Override
  public int[] clusters(SegmentGraph graph) {
    EdgeStatistics edges = graph.edges();
    int[] separatedU = graph.separatedU();
    int capacity = 2 * edges.size() + separatedU.length;
    int[] u = new int[capacity];
    int[] v = new int[capacity];
    double[] w = new double[capacity];
    int m = 0;
    for (int i = 0; i < separatedU.length; i++) {
      u[m] = separatedU[i];
      v[m] = graph.separatedV()[i];
      w[m++] = APART;
    }
    for (int e = 0; e < edges.size(); e++) {
      if (edges.max(e) > 0) {
        u[m] = (int) edges.u(e);
        v[m] = (int) edges.v(e);
        w[m++] = edges.max(e);
      }
      if (edges.min(e) < 0) {
        u[m] = (int) edges.u(e);
        v[m] = (int) edges.v(e);
        w[m++] = edges.min(e);
      }
    }
    SignedGraph sparse = SignedGraph.of(graph.nodeCount(), java.util.Arrays.copyOf(u, m),
        java.util.Arrays.copyOf(v, m), java.util.Arrays.copyOf(w, m));
    return MutexWatershed.partition(sparse).clusterOf();
  }
}
