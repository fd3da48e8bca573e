package org.sunder.blockwise.graph;

import org.sunder.blockwise.collections.IntIntHashMap;
import org.sunder.blockwise.collections.IntList;


/**
 * An undirected graph whose nodes can be contracted, for greedy merging. Edge ids are the
 * indices of the input edge arrays, so callers keep per-edge statistics in their own arrays and
 * combine them in {@link EdgeMerge}; parallel input edges are merged on construction, self
 * loops are dropped. Contraction moves the smaller adjacency into the larger one when the caller
 * keeps the node of larger {@link #degree}; total work {@code O(m log n)} over all merges.
 */
public final class ContractionGraph {
  /** Combines the statistics of edge {@code from} into edge {@code into}. */
  public interface EdgeMerge {
    void merge(int into, int from);
  }

  private final IntIntHashMap[] adjacency;
  private final int[] endA;
  private final int[] endB;
  private final boolean[] alive;
  /** Sum of what {@link IntIntHashMap#prefetch} returned; read by nothing. */
  private int prefetched;

  private ContractionGraph(IntIntHashMap[] adjacency, int[] endA, int[] endB, boolean[] alive) {
    this.adjacency = adjacency;
    this.endA = endA;
    this.endB = endB;
    this.alive = alive;
  }

  public static ContractionGraph build(int nodeCount, int[] u, int[] v, EdgeMerge merge) {
    int m = u.length;
    int[] degree = new int[nodeCount];
    for (int e = 0; e < m; e++) {
      checkNode(u[e], nodeCount, e);
      checkNode(v[e], nodeCount, e);
      if (u[e] != v[e]) {
        degree[u[e]]++;
        degree[v[e]]++;
      }
    }
    IntIntHashMap[] adjacency = new IntIntHashMap[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      adjacency[i] = new IntIntHashMap(degree[i]);
    }
    int[] endA = new int[m];
    int[] endB = new int[m];
    boolean[] alive = new boolean[m];
    for (int e = 0; e < m; e++) {
      int a = Math.min(u[e], v[e]);
      int b = Math.max(u[e], v[e]);
      endA[e] = a;
      endB[e] = b;
      if (a == b) {
        continue;
      }
      int existing = adjacency[a].get(b, -1);
      if (existing >= 0) {
        merge.merge(existing, e);
      } else {
        alive[e] = true;
        adjacency[a].put(b, e);
        adjacency[b].put(a, e);
      }
    }
    return new ContractionGraph(adjacency, endA, endB, alive);
  }

  private static void checkNode(int node, int nodeCount, int edge) {
    if (node < 0 || node >= nodeCount) {
      throw new IllegalArgumentException("edge " + edge + " has node " + node
          + ", outside 0.." + (nodeCount - 1));
    }
  }

  public boolean alive(int edge) {
    return alive[edge];
  }

  public int endA(int edge) {
    return endA[edge];
  }

  public int endB(int edge) {
    return endB[edge];
  }

  public int degree(int node) {
    return adjacency[node].size();
  }

  /** The neighbours of {@code node} as a map neighbour → edge (read only). */
  public IntIntHashMap neighbours(int node) {
    return adjacency[node];
  }

  /** The edge between {@code a} and {@code b}, or −1. */
  int edge(int a, int b) {
    return adjacency[a].get(b, -1);
  }

  /**
   * Merges node {@code from} into node {@code into}; {@code from} is left without edges. Every
   * edge of {@code into} that gained statistics or a new endpoint is appended to
   * {@code touched}.
   */
  public void contract(int into, int from, EdgeMerge merge, IntList touched) {
    IntIntHashMap gone = adjacency[from];
    IntIntHashMap kept = adjacency[into];
    // the neighbours' maps fetched together, not one miss after another in the pass below
    int ignored = 0;
    for (int slot = 0; slot < gone.capacity(); slot++) {
      int c = gone.keyAt(slot);
      if (c >= 0) {
        ignored += adjacency[c].prefetch(from);
      }
    }
    prefetched += ignored;
    for (int slot = 0; slot < gone.capacity(); slot++) {
      int c = gone.keyAt(slot);
      if (c < 0) {
        continue;
      }
      int e = gone.valueAt(slot);
      IntIntHashMap around = adjacency[c];
      around.remove(from);
      if (c == into) {
        alive[e] = false;
        continue;
      }
      int existing = kept.get(c, -1);
      if (existing >= 0) {
        merge.merge(existing, e);
        alive[e] = false;
        touched.add(existing);
      } else {
        endA[e] = Math.min(into, c);
        endB[e] = Math.max(into, c);
        kept.put(c, e);
        around.put(into, e);
        touched.add(e);
      }
    }
    kept.remove(from);
    adjacency[from] = new IntIntHashMap(0);
  }
}
