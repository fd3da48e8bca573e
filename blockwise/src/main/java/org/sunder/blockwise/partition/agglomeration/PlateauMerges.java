package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.partition.Clustering;

/**
 * Mean linkage on a grid in two phases, with the labels of {@link AgglomerationState} alone
 * (pairs' sums are added in another order, so a mean that falls within its last bits of a
 * midpoint of the grid could round the other way). On realistic predictions about four
 * fifths of the merges happen at the largest weight {@code top} (affinities a network pushed
 * to 1, clamped), and the general state pays a heap and cluster maps for each.
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
 * <p>Phase 2: the clusters become the nodes of a sparse graph, each pair's edges summed, pairs
 * numbered by their smallest edge id, which keeps the queue's tie order; the general state
 * finishes on it. Applies where {@code top} lies on the grid (float weights of
 * magnitude at least 1 do) and above the threshold, and the offsets join distinct voxel pairs;
 * otherwise {@link #of} returns null.
 */
final class PlateauMerges {
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

  private PlateauMerges(GridGraph grid, int[] delta, float[] weight, float top, float second) {
    this.n = grid.nodeCount();
    this.offsets = grid.offsetCount();
    this.delta = delta;
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
    for (int k = 0; k < offsets; k++) {
      for (int v = 0, e = k * n; v < n; v++, e++) {
        if (weight[e] == weight[e]) {
          leaving[v]++;
          leaving[v + delta[k]]++;
        }
      }
    }
    for (int v = 0; v < n; v++) {
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
    int[] delta = AgglomerationState.distinctDeltas(grid);
    if (options.linkage() != Linkage.MEAN || options.constraints() || options.recordsTree()
        || (long) n * offsets > Integer.MAX_VALUE - 8 || delta == null) {
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
    return new PlateauMerges(grid, delta, weight, top, second);
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

  /**
   * Phase 2: the general state on the graph of the plateau's clusters, numbered by first voxel.
   * Pairs are aggregated cluster by cluster (each from its smaller-numbered side) and indexed in
   * ascending order of their smallest edge id: a first pass marks those ids in a bit set, the
   * second puts each pair at the count of marks before its own.
   */
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
    PairAggregator pairs = new PairAggregator(node, nodes);
    long[] firstEdges = new long[(weight.length + 63) >>> 6];
    int pairCount = pairs.forEachPair((a, b, sum, count, first) ->
        firstEdges[first >>> 6] |= 1L << first);
    int[] marksBefore = new int[firstEdges.length];
    for (int i = 1; i < firstEdges.length; i++) {
      marksBefore[i] = marksBefore[i - 1] + Long.bitCount(firstEdges[i - 1]);
    }
    AgglomerationState state = AgglomerationState.ofPairs(options, nodes, pairCount);
    pairs.forEachPair((a, b, sum, count, first) -> state.putPair(marksBefore[first >>> 6]
        + Long.bitCount(firstEdges[first >>> 6] & ((1L << first) - 1)), a, b, sum, count));
    int[] clusterOf = state.run().clustering().clusterOf();
    int[] representative = new int[n];
    for (int v = 0; v < n; v++) {
      representative[v] = clusterOf[node[v]];
    }
    return new Agglomeration.Result(Clustering.fromRepresentatives(representative),
        MergeTree.empty(n));
  }

  /** Receives one pair of clusters {@code a < b}: its edges' sum and count, its smallest id. */
  @FunctionalInterface
  private interface PairVisitor {
    void visit(int a, int b, double sum, int count, int firstEdge);
  }

  /**
   * The edges between clusters summed per pair, one cluster's pairs at a time, its voxels in
   * ascending order (so the edge slots they read share cache lines).
   */
  private final class PairAggregator {
    private final int[] node;
    private final int nodes;
    /** The voxels of cluster {@code a} are {@code members[start[a]..start[a + 1])}, ascending. */
    private final int[] start;
    private final int[] members;
    /** Per neighbour cluster its slot in the arrays below while the current cluster is open. */
    private final int[] slotOf;
    private int[] neighbour = new int[64];
    private double[] sum = new double[64];
    private int[] count = new int[64];
    private int[] first = new int[64];
    private int open;

    PairAggregator(int[] node, int nodes) {
      this.node = node;
      this.nodes = nodes;
      start = new int[nodes + 1];
      for (int a : node) {
        start[a + 1]++;
      }
      for (int a = 0; a < nodes; a++) {
        start[a + 1] += start[a];
      }
      members = new int[n];
      int[] filled = Arrays.copyOf(start, nodes);
      for (int v = 0; v < n; v++) {
        members[filled[node[v]]++] = v;
      }
      this.slotOf = new int[nodes];
      Arrays.fill(slotOf, -1);
    }

    /** Visits every pair of clusters joined by an edge; returns their number. */
    int forEachPair(PairVisitor visitor) {
      int pairs = 0;
      for (int a = 0; a < nodes; a++) {
        for (int m = start[a]; m < start[a + 1]; m++) {
          int v = members[m];
          for (int k = 0; k < offsets; k++) {
            int base = k * n;
            add(a, v + delta[k], base + v);
            int source = v - delta[k];
            if (source >= 0 && source < n) {
              add(a, source, base + source);
            }
          }
        }
        for (int i = 0; i < open; i++) {
          visitor.visit(a, neighbour[i], sum[i], count[i], first[i]);
          slotOf[neighbour[i]] = -1;
        }
        pairs += open;
        open = 0;
      }
      return pairs;
    }

    /** Adds edge slot {@code e} to the pair of cluster {@code a} and voxel {@code other}. */
    private void add(int a, int other, int e) {
      float w = weight[e];
      if (w != w) {
        return;
      }
      int b = node[other];
      if (b <= a) {
        return;
      }
      int i = slotOf[b];
      if (i < 0) {
        if (open == neighbour.length) {
          grow();
        }
        i = open++;
        slotOf[b] = i;
        neighbour[i] = b;
        sum[i] = 0;
        count[i] = 0;
        first[i] = e;
      }
      sum[i] += w;
      count[i]++;
      first[i] = Math.min(first[i], e);
    }

    private void grow() {
      int capacity = 2 * neighbour.length;
      neighbour = Arrays.copyOf(neighbour, capacity);
      sum = Arrays.copyOf(sum, capacity);
      count = Arrays.copyOf(count, capacity);
      first = Arrays.copyOf(first, capacity);
    }
  }
}
