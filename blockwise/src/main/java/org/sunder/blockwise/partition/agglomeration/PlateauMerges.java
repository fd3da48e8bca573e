package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.partition.Clustering;

/**
 * Mean linkage on a grid in two phases, with the labels of {@link AgglomerationState} alone.
 * On realistic predictions about four fifths of the merges happen at the largest weight
 * {@code top} (affinities a network pushed to 1, clamped), and the general state pays a heap
 * and cluster maps for each.
 *
 * <p>Phase 1, the plateau, without queue or maps. A pair of clusters has mean linkage
 * {@code top} exactly when every edge between them weighs {@code top}, and such a pair is
 * merged when the queue reaches its smallest edge id; pairs that combine keep the smaller id,
 * and a pair that once holds a lighter edge keeps it. So the queue's first merges are: for each
 * {@code top} edge in ascending id, join the two clusters of its ends unless a lighter edge
 * joins them, a union–find sweep. Whether a lighter edge joins two clusters is read from the
 * edges of the smaller one's voxels (members in a circular list); a pair found apart is
 * remembered.
 *
 * <p>"Exactly when" needs the mean to round below {@code top} on the {@link Linkage#GRID}
 * whenever one lighter edge is present: it does while the pair has fewer than
 * {@code (top - second) / GRID} edges, {@code second} being the largest lighter weight. Each
 * cluster counts the edges leaving it; while at most one cluster has that many, no pair can
 * (the phase hands over as soon as a second one does), so the sweep decides as the queue would.
 *
 * <p>Phase 2: the clusters become the nodes of a sparse graph, each pair's edges summed in
 * ascending id, pairs numbered by their smallest edge id, which keeps the queue's tie order; the
 * general state finishes on it. Applies where {@code top} lies on the grid (float weights of
 * magnitude at least 1 do) and above the threshold, and the offsets join distinct voxel pairs;
 * otherwise {@link #of} returns null.
 */
final class PlateauMerges {
  private final GridGraph grid;
  private final int n;
  private final int offsets;
  private final int[] delta;
  /** Per edge slot its weight, NaN where absent. */
  private final float[] weight;
  private final float top;
  /** A pair with this many edges or more may average to {@code top} despite a lighter edge. */
  private final long manyEdges;

  private final int[] parent;
  private final int[] size;
  /** Each cluster's voxels as a circular list. */
  private final int[] next;
  /** Per cluster root, the edges with one end in it. */
  private final int[] leaving;
  private int clustersWithManyEdges;
  private final PairSet apart = new PairSet(1 << 16);
  private int merges;
  private boolean handedOver;

  private PlateauMerges(GridGraph grid, float[] weight, float top, float second) {
    this.grid = grid;
    this.n = grid.nodeCount();
    this.offsets = grid.offsetCount();
    this.delta = new int[offsets];
    for (int k = 0; k < offsets; k++) {
      delta[k] = grid.delta(k);
    }
    this.weight = weight;
    this.top = top;
    double gap = (double) top - second;
    this.manyEdges = gap == Double.POSITIVE_INFINITY ? Long.MAX_VALUE
        : (long) Math.floor(gap / Linkage.GRID);
    parent = new int[n];
    size = new int[n];
    next = new int[n];
    leaving = new int[n];
    for (int v = 0; v < n; v++) {
      parent[v] = v;
      size[v] = 1;
      next[v] = v;
    }
    for (int e = 0; e < weight.length; e++) {
      if (weight[e] == weight[e]) {
        int v = e % n;
        leaving[v]++;
        leaving[v + delta[e / n]]++;
      }
    }    for (int v = 0; v < n; v++) {
      clustersWithManyEdges += leaving[v] >= manyEdges ? 1 : 0;
    }
  }

  /**
   * The plateau of mean linkage without constraints on {@code grid} (merging while the best
   * linkage exceeds {@code options.threshold()}), ready to {@link #sweep}; null where the phase
   * does not apply.
   */
  static PlateauMerges of(Agglomeration options, GridGraph grid) {
    int n = grid.nodeCount();
    int offsets = grid.offsetCount();
    if (options.linkage() != Linkage.MEAN || options.constraints() || options.recordsTree()
        || (long) n * offsets > Integer.MAX_VALUE - 8 || !distinctPairs(grid)) {
      return null;
    }
    float[] weight = new float[n * offsets];
    Arrays.fill(weight, Float.NaN);
    grid.forEachEdge((s, t, k, w) -> weight[s + k * n] = w);
    float top = Float.NEGATIVE_INFINITY;
    for (float w : weight) {
      top = Math.max(top, w == w ? w : top);
    }
    float second = Float.NEGATIVE_INFINITY;
    for (float w : weight) {
      if (w < top) {
        second = Math.max(second, w);
      }
    }
    if (!(top > options.threshold()) || Linkage.onGrid(top) != top
        || Linkage.onGrid(second) == top) {
      return null;
    }
    return new PlateauMerges(grid, weight, top, second);
  }

  /** Whether no two offsets join the same voxel pair (equal or opposite index steps). */
  private static boolean distinctPairs(GridGraph grid) {
    for (int k = 0; k < grid.offsetCount(); k++) {
      if (grid.delta(k) == 0) {
        return false;
      }
      for (int j = 0; j < k; j++) {
        if (Math.abs(grid.delta(j)) == Math.abs(grid.delta(k))) {
          return false;
        }
      }
    }
    return true;
  }

  /** Phase 1: the merges at {@code top}, in ascending edge id, until a handover is due. */
  void sweep() {
    if (clustersWithManyEdges > 1) {
      handedOver = true;
      return;
    }
    for (int k = 0; k < offsets; k++) {
      int base = k * n;
      for (int v = 0; v < n; v++) {
        if (weight[base + v] != top) {
          continue;
        }
        int a = find(v);
        int b = find(v + delta[k]);
        if (a == b || apart.contains(PairSet.pair(a, b))) {
          continue;
        }
        int small = size[a] <= size[b] ? a : b;
        int large = small == a ? b : a;
        int between = edgesBetweenIfAllTop(small, large);
        if (between < 0) {
          apart.add(PairSet.pair(a, b));
        } else {
          union(small, large, between);
          merges++;
          if (clustersWithManyEdges > 1) {
            handedOver = true;
            return;
          }
        }
      }
    }
  }

  /**
   * The number of edges between clusters {@code small} and {@code other}, or -1 if one of them
   * is lighter than {@code top}; reads the edges of {@code small}'s voxels.
   */
  private int edgesBetweenIfAllTop(int small, int other) {
    int count = 0;
    int v = small;
    do {
      for (int k = 0; k < offsets; k++) {
        int base = k * n;
        float out = weight[base + v];
        if (out == out && find(v + delta[k]) == other) {
          if (out != top) {
            return -1;
          }
          count++;
        }
        int source = v - delta[k];
        if (source >= 0 && source < n) {
          float in = weight[base + source];
          if (in == in && find(source) == other) {
            if (in != top) {
              return -1;
            }
            count++;
          }
        }
      }
      v = next[v];
    } while (v != small);
    return count;
  }

  private void union(int small, int large, int edgesBetween) {
    boolean wasMany = leaving[small] >= manyEdges;
    boolean largeWasMany = leaving[large] >= manyEdges;
    parent[small] = large;
    size[large] += size[small];
    leaving[large] += leaving[small] - 2 * edgesBetween;
    int after = next[large];
    next[large] = next[small];
    next[small] = after;
    clustersWithManyEdges += (leaving[large] >= manyEdges ? 1 : 0) - (wasMany ? 1 : 0)
        - (largeWasMany ? 1 : 0);
  }

  private int find(int x) {
    while (parent[x] != x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }

  /** The merges {@link #sweep} made. */
  int merges() {
    return merges;
  }

  /** Whether {@link #sweep} stopped before the plateau's end, two clusters having many edges. */
  boolean handedOver() {
    return handedOver;
  }

  /** Phase 2: the general state on the graph of the plateau's clusters. */
  Agglomeration.Result finish(Agglomeration options) {
    int[] node = new int[n];
    Arrays.fill(node, -1);
    int nodes = 0;
    for (int v = 0; v < n; v++) {
      int root = find(v);
      if (node[root] < 0) {
        node[root] = nodes++;
      }
      node[v] = node[root];
    }
    AgglomerationState state = new AgglomerationState(options, nodes, 8 * nodes);
    for (int e = 0; e < weight.length; e++) {
      float w = weight[e];
      if (w == w) {
        int a = node[e % n];
        int b = node[e % n + delta[e / n]];
        if (a != b) {
          state.addEdge(a, b, w, 1, w, w, e);
        }
      }
    }
    int[] clusterOf = state.run().clustering().clusterOf();
    int[] representative = new int[n];
    for (int v = 0; v < n; v++) {
      representative[v] = clusterOf[node[v]];
    }
    return new Agglomeration.Result(Clustering.fromRepresentatives(representative),
        MergeTree.empty(n));
  }
}
