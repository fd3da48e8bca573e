package org.sunder.blockwise.graph;

import java.util.Arrays;

/**
 * A sparse signed graph in compressed sparse row form, on primitive arrays. Nodes are
 * {@code 0..nodeCount-1}; edge {@code e} joins {@code edgeU(e) < edgeV(e)} with weight
 * {@code weight(e)} ({@code > 0} attractive, {@code < 0} repulsive). Parallel edges are allowed
 * and kept apart (see {@link #statistics()} to aggregate them); self-loops are rejected.
 *
 * <p>The adjacency of node {@code n} is the range {@code adjacencyStart(n)..adjacencyEnd(n)-1}
 * of {@link #adjacentNode}/{@link #adjacentEdge}, in ascending edge id. Built in
 * {@code O(nodeCount + edgeCount)}; immutable (input arrays are copied), thread-safe.
 */
public final class SignedGraph {
  private final int nodeCount;
  private final int[] u;
  private final int[] v;
  private final double[] w;
  private final int[] start;
  private final int[] neighbour;
  private final int[] incident;

  private SignedGraph(int nodeCount, int[] u, int[] v, double[] w) {
    this.nodeCount = nodeCount;
    this.u = u;
    this.v = v;
    this.w = w;
    this.start = new int[nodeCount + 1];
    for (int e = 0; e < u.length; e++) {
      start[u[e] + 1]++;
      start[v[e] + 1]++;
    }
    for (int n = 0; n < nodeCount; n++) {
      start[n + 1] += start[n];
    }
    int[] fill = Arrays.copyOf(start, nodeCount);
    this.neighbour = new int[2 * u.length];
    this.incident = new int[2 * u.length];
    for (int e = 0; e < u.length; e++) {
      int a = fill[u[e]]++;
      neighbour[a] = v[e];
      incident[a] = e;
      int b = fill[v[e]]++;
      neighbour[b] = u[e];
      incident[b] = e;
    }
  }

  /**
   * A graph with the given edges (arrays copied; each pair is stored with its smaller end first).
   *
   * @throws IllegalArgumentException for lengths that differ, an end outside
   *     {@code [0, nodeCount)}, a self-loop, or a weight that is not finite
   */
  public static SignedGraph of(int nodeCount, int[] u, int[] v, double[] weight) {
    if (nodeCount < 0) {
      throw new IllegalArgumentException("nodeCount = " + nodeCount + " is negative");
    }
    if (u.length != v.length || u.length != weight.length) {
      throw new IllegalArgumentException("edge arrays differ in length: " + u.length + ", "
          + v.length + ", " + weight.length);
    }
    int m = u.length;
    int[] cu = new int[m];
    int[] cv = new int[m];
    for (int e = 0; e < m; e++) {
      int a = u[e];
      int b = v[e];
      if (a < 0 || a >= nodeCount || b < 0 || b >= nodeCount) {
        throw new IllegalArgumentException("edge " + e + " = (" + a + ", " + b
            + ") has an end outside [0, " + nodeCount + ")");
      }
      if (a == b) {
        throw new IllegalArgumentException("edge " + e + " is a self-loop at node " + a);
      }
      if (!Double.isFinite(weight[e])) {
        throw new IllegalArgumentException("edge " + e + " has weight " + weight[e]);
      }
      cu[e] = Math.min(a, b);
      cv[e] = Math.max(a, b);
    }
    return new SignedGraph(nodeCount, cu, cv, weight.clone());
  }

  public int nodeCount() {
    return nodeCount;
  }

  public int edgeCount() {
    return u.length;
  }

  /** The smaller end of edge {@code e}. */
  public int edgeU(int e) {
    return u[e];
  }

  /** The larger end of edge {@code e}. */
  public int edgeV(int e) {
    return v[e];
  }

  public double weight(int e) {
    return w[e];
  }

  public int degree(int node) {
    return start[node + 1] - start[node];
  }

  public int adjacencyStart(int node) {
    return start[node];
  }

  public int adjacencyEnd(int node) {
    return start[node + 1];
  }

  /** The neighbour at adjacency position {@code i}. */
  public int adjacentNode(int i) {
    return neighbour[i];
  }

  /** The edge at adjacency position {@code i}. */
  public int adjacentEdge(int i) {
    return incident[i];
  }

  /** A copy of the graph with every weight replaced by {@code weight[e]}. */
  public SignedGraph withWeights(double[] weight) {
    if (weight.length != u.length) {
      throw new IllegalArgumentException(weight.length + " weights for " + u.length + " edges");
    }
    return of(nodeCount, u, v, weight);
  }

  /** Per node pair: sum, count, min and max of the weights of its (parallel) edges. */
  public EdgeStatistics statistics() {
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(u.length);
    for (int e = 0; e < u.length; e++) {
      acc.add(u[e], v[e], w[e]);
    }
    return acc.build();
  }
}
