package org.sunder.blockwise.partition.multicut;

import java.util.Objects;
import org.sunder.blockwise.collections.IndexedMaxHeap;
import org.sunder.blockwise.collections.IntList;
import org.sunder.blockwise.graph.ContractionGraph;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.partition.agglomeration.Linkage;

/**
 * The multicut (correlation clustering) problem on a signed graph: find a partition of the
 * nodes that minimises the sum of the weights of the cut edges (edges between clusters).
 * Attractive edges ({@code w > 0}) cost when cut, repulsive ones ({@code w < 0}) gain. The
 * problem is NP-hard; this class gives the two standard heuristics:
 *
 * <ul>
 *   <li>{@link #greedyAdditive}: greedy additive edge contraction — repeatedly contract the edge
 *       of largest positive weight, summing the weights of parallel edges that the contraction
 *       creates, until no positive edge is left. {@code O(m log m)} with an indexed heap and
 *       adjacencies merged smaller into larger. Ties: larger weight first, then the smaller
 *       pair of endpoints.</li>
 *   <li>{@link #refine}: Kernighan–Lin-style local search in the spirit of "An Efficient
 *       Heuristic Procedure for Partitioning Graphs" (Bell System Technical Journal, 1970),
 *       generalised to any number of clusters: see {@link KernighanLinRefinement}. It never
 *       increases the objective.</li>
 * </ul>
 * Input graphs are arrays {@code (nodeCount, u[], v[], w[])}; parallel edges are summed, self
 * loops never count. Results are deterministic for given arrays; reordering the edges changes
 * them only through floating-point rounding of summed parallel weights and exact ties.
 */
public final class Multicut {
  private Multicut() {}

  /** Greedy additive edge contraction followed by Kernighan–Lin refinement of a sparse graph. */
  public static MulticutResult solve(SignedGraph graph) {
    Edges e = Edges.of(graph);
    return solve(graph.nodeCount(), e.u, e.v, e.w);
  }

  /** Greedy additive edge contraction of a sparse graph. */
  public static MulticutResult greedyAdditive(SignedGraph graph) {
    Edges e = Edges.of(graph);
    return greedyAdditive(graph.nodeCount(), e.u, e.v, e.w);
  }

  /** Kernighan–Lin refinement of {@code initial} on a sparse graph. */
  public static MulticutResult refine(SignedGraph graph, int[] initial) {
    Edges e = Edges.of(graph);
    return refine(graph.nodeCount(), e.u, e.v, e.w, initial);
  }

  /** The multicut objective of {@code labels} on a sparse graph. */
  public static double objective(SignedGraph graph, int[] labels) {
    Edges e = Edges.of(graph);
    return objective(e.u, e.v, e.w, labels);
  }

  /**
   * The multicut of nodes {@code 0..nodeCount-1} whose edge costs are the {@link Linkage}
   * values of aggregated statistics between ids {@code firstId..firstId+nodeCount-1} (node =
   * id - firstId): the fragments' multicut inside a block and the global solve's multicut of the
   * reduced graph: greedy additive edge contraction, then Kernighan–Lin refinement when
   * {@code kernighanLin}. O(m) to build plus {@link #greedyAdditive(int, int[], int[], double[])}
   * or {@link #solve(int, int[], int[], double[])}.
   */
  public static MulticutResult ofLinkage(int nodeCount, EdgeStatistics statistics,
      Linkage linkage, long firstId, boolean kernighanLin) {
    int m = statistics.size();
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    for (int i = 0; i < m; i++) {
      u[i] = (int) (statistics.u(i) - firstId);
      v[i] = (int) (statistics.v(i) - firstId);
      w[i] = linkage.value(statistics.sum(i), statistics.count(i), statistics.min(i),
          statistics.max(i));
    }
    return kernighanLin ? solve(nodeCount, u, v, w) : greedyAdditive(nodeCount, u, v, w);
  }

  /** Greedy additive edge contraction followed by Kernighan–Lin refinement. */
  public static MulticutResult solve(int nodeCount, int[] u, int[] v, double[] w) {
    MulticutResult greedy = greedyAdditive(nodeCount, u, v, w);
    return refine(nodeCount, u, v, w, greedy.labels());
  }

  /** Greedy additive edge contraction from singletons. */
  public static MulticutResult greedyAdditive(int nodeCount, int[] u, int[] v, double[] w) {
    check(nodeCount, u, v, w);
    double[] weight = w.clone();
    // the positive edges, each keyed by its current weight and pair of ends
    IndexedMaxHeap heap = new IndexedMaxHeap(u.length);
    ContractionGraph.EdgeMerge sum = (into, from) -> {
      weight[into] += weight[from];
      heap.remove(from);
    };
    ContractionGraph graph = ContractionGraph.build(nodeCount, u, v, sum);
    for (int e = 0; e < u.length; e++) {
      if (graph.alive(e) && weight[e] > 0) {
        heap.set(e, weight[e], tie(graph, e));
      }
    }
    int[] parent = new int[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      parent[i] = i;
    }
    IntList touched = new IntList(16);
    while (!heap.isEmpty()) {
      int e = heap.pop();
      int a = graph.endA(e);
      int b = graph.endB(e);
      int keep = graph.degree(b) > graph.degree(a) ? b : a;
      int gone = keep == a ? b : a;
      touched.clear();
      graph.contract(keep, gone, sum, touched);
      parent[gone] = keep;
      for (int t = 0; t < touched.size(); t++) {
        int f = touched.get(t);
        if (weight[f] > 0) {
          heap.set(f, weight[f], tie(graph, f));
        } else {
          heap.remove(f);
        }
      }
    }
    int[] labels = new int[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      labels[i] = root(parent, i);
    }
    return result(labels, u, v, w);
  }

  /** Kernighan–Lin refinement of {@code initial} (any labels ≥ 0 and < nodeCount). */
  public static MulticutResult refine(int nodeCount, int[] u, int[] v, double[] w,
      int[] initial) {
    check(nodeCount, u, v, w);
    Objects.requireNonNull(initial, "initial");
    if (initial.length != nodeCount) {
      throw new IllegalArgumentException("initial labels have " + initial.length
          + " entries for " + nodeCount + " nodes");
    }
    int[] labels = consecutiveFromZero(initial);
    new KernighanLinRefinement(nodeCount, u, v, w).improve(labels);
    return result(labels, u, v, w);
  }

  /** The multicut objective of {@code labels}: the sum of {@code w[e]} over cut edges. */
  public static double objective(int[] u, int[] v, double[] w, int[] labels) {
    double sum = 0;
    for (int e = 0; e < u.length; e++) {
      if (labels[u[e]] != labels[v[e]]) {
        sum += w[e];
      }
    }
    return sum;
  }

  private static MulticutResult result(int[] labels, int[] u, int[] v, double[] w) {
    int[] consecutive = consecutiveFromZero(labels);
    int count = 0;
    for (int l : consecutive) {
      count = Math.max(count, l + 1);
    }
    return new MulticutResult(consecutive, count, objective(u, v, w, consecutive));
  }

  /** Renumbers labels 0..k−1 in order of first node. */
  static int[] consecutiveFromZero(int[] labels) {
    int n = labels.length;
    int[] map = new int[n];
    java.util.Arrays.fill(map, -1);
    int[] out = new int[n];
    int next = 0;
    for (int i = 0; i < n; i++) {
      int l = labels[i];
      if (l < 0 || l >= n) {
        throw new IllegalArgumentException("label " + l + " of node " + i + " is outside 0.."
            + (n - 1));
      }
      if (map[l] < 0) {
        map[l] = next++;
      }
      out[i] = map[l];
    }
    return out;
  }

  private static long tie(ContractionGraph graph, int e) {
    return ((long) graph.endA(e) << 32) | graph.endB(e);
  }

  private static int root(int[] parent, int i) {
    int r = i;
    while (parent[r] != r) {
      r = parent[r];
    }
    while (parent[i] != r) {
      int next = parent[i];
      parent[i] = r;
      i = next;
    }
    return r;
  }

  private static void check(int nodeCount, int[] u, int[] v, double[] w) {
    Objects.requireNonNull(u, "u");
    Objects.requireNonNull(v, "v");
    Objects.requireNonNull(w, "w");
    if (nodeCount < 0) {
      throw new IllegalArgumentException("node count " + nodeCount + " is negative");
    }
    if (u.length != v.length || u.length != w.length) {
      throw new IllegalArgumentException("edge arrays have lengths " + u.length + ", "
          + v.length + ", " + w.length + "; expected equal");
    }
    for (int e = 0; e < w.length; e++) {
      if (u[e] < 0 || u[e] >= nodeCount || v[e] < 0 || v[e] >= nodeCount) {
        throw new IllegalArgumentException("edge " + e + " joins " + u[e] + " and " + v[e]
            + "; expected nodes in 0.." + (nodeCount - 1));
      }
      if (!Double.isFinite(w[e])) {
        throw new IllegalArgumentException("edge " + e + " has weight " + w[e]
            + "; expected a finite value");
      }
    }
  }

  /** The edge arrays of a sparse graph (copied). */
  private record Edges(int[] u, int[] v, double[] w) {
    static Edges of(SignedGraph graph) {
      int m = graph.edgeCount();
      int[] u = new int[m];
      int[] v = new int[m];
      double[] w = new double[m];
      for (int e = 0; e < m; e++) {
        u[e] = graph.edgeU(e);
        v[e] = graph.edgeV(e);
        w[e] = graph.weight(e);
      }
      return new Edges(u, v, w);
    }
  }
}
