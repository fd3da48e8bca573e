package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;
import org.sunder.blockwise.collections.PairMap;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.partition.Clustering;

/**
 * The working arrays of one {@link Agglomeration} run; see there for the contract.
 *
 * <p>Edges: one aggregated edge per adjacent cluster pair, its statistics in primitive arrays
 * indexed by edge id. On a grid the id is the grid edge id (voxel {@code + k * n}), whose ends
 * follow from the id, so no endpoint arrays exist; elsewhere ids are dense and the ends are
 * stored. Ends are never rewritten: the clusters of an edge are the union-find roots of its
 * ends. Adjacency: a {@link ClusterAdjacency} from neighbour cluster to edge. Contraction moves
 * the adjacency of the cluster with fewer neighbours into the other; per moved neighbour one
 * look-up in the survivor's map and one in-place rename in the neighbour's map, and where both
 * clusters had an edge to it the two combine into the one of smaller id. Candidates wait in an
 * {@link EdgeQueue} with lazy deletion: a changed edge gets a new entry; an entry whose edge is
 * no longer alive or whose value or rank differs is skipped when it reaches the top. So the
 * merges happen in exactly the order of the indexed heap this replaced.
 *
 * <p>With {@link Linkage#ABS_MAX} and constraints each aggregated edge also keeps the id of the
 * edge holding its max and of the edge holding its min (the smallest id among equal values);
 * the queue breaks ties by the id on the side the linkage takes, which is where the Mutex
 * Watershed's order puts the pair's first edge.
 */
final class AgglomerationState {
  private final Linkage linkage;
  private final boolean constraints;
  private final double threshold;
  private final int nodeCount;
  private final boolean recordTree;
  private final boolean mutexOrder;

  // edges: sparse input (dense ids, stored ends) or grid (grid edge ids, ends from the id)
  private int edgeCount;
  private int[] eu;
  private int[] ev;
  private int[] gridDelta;
  private PairMap pairs;

  /** Per edge {@code stride} statistics (first, then second if any); NaN once the edge died. */
  private double[] stat;
  private final int stride;
  /** Only with constraints: whether a live edge became a cannot-link constraint. */
  private boolean[] constrained;
  private int[] maxId;
  private int[] minId;

  private final int[] parent;
  private ClusterAdjacency adjacency;
  /** Sum of what the merges' read-ahead passes read; read by nothing. */
  private int readAhead;
  private EdgeQueue queue;

  private int[] treeId;
  private int[] first;
  private int[] second;
  private double[] heights;
  private int merges;

  private AgglomerationState(Agglomeration options, int nodeCount) {
    this.linkage = options.linkage();
    this.constraints = options.constraints();
    this.threshold = options.threshold();
    this.recordTree = options.recordsTree();
    this.mutexOrder = linkage == Linkage.ABS_MAX && constraints;
    this.nodeCount = nodeCount;
    this.stride = linkage == Linkage.MEAN || linkage == Linkage.ABS_MAX ? 2 : 1;
    parent = new int[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      parent[i] = i;
    }
  }

  /** A state for a sparse input, filled by {@link #addEdge}. */
  AgglomerationState(Agglomeration options, int nodeCount, int expectedEdges) {
    this(options, nodeCount);
    int m = Math.max(4, expectedEdges);
    eu = new int[m];
    ev = new int[m];
    allocateStatistics(m);
    pairs = new PairMap(expectedEdges);
  }

  /**
   * A state holding every present edge of {@code grid} under its grid edge id, or null when an
   * offset's index step is 0, two offsets can join the same voxel pair (equal or opposite index
   * steps) or the arrays would overflow an {@code int} index; then the caller adds the edges one
   * by one.
   */
  static AgglomerationState ofGrid(Agglomeration options, GridGraph grid) {
    int n = grid.nodeCount();
    int offsets = grid.offsetCount();
    int[] delta = distinctDeltas(grid);
    if (4L * n * offsets > Integer.MAX_VALUE - 8 || delta == null) {
      return null;
    }
    AgglomerationState s = new AgglomerationState(options, n);
    s.gridDelta = delta;
    int slots = n * offsets;
    s.edgeCount = slots;
    s.allocateStatistics(slots);
    s.adjacency = new ClusterAdjacency(n, Math.max(1, 2 * offsets));
    s.queue = new EdgeQueue(s.constraints, s.mutexOrder, slots / 2);
    grid.forEachEdge((source, target, k, w) -> s.addGridEdge(source, target, source + k * n, w));
    return s;
  }

  /**
   * The index steps of {@code grid}'s offsets, or null when one is 0 or two can join the same
   * voxel pair (equal or opposite steps).
   */
  static int[] distinctDeltas(GridGraph grid) {
    int[] delta = new int[grid.offsetCount()];
    for (int k = 0; k < delta.length; k++) {
      delta[k] = grid.delta(k);
      if (delta[k] == 0) {
        return null;
      }
      for (int j = 0; j < k; j++) {
        if (Math.abs(delta[j]) == Math.abs(delta[k])) {
          return null;
        }
      }
    }
    return delta;
  }

  /**
   * A state for {@code pairCount} pairs aggregated by the caller (sum or mean linkage), each
   * given once by {@link #putPair} at its index; indices order ties.
   */
  static AgglomerationState ofPairs(Agglomeration options, int nodeCount, int pairCount) {
    if (options.linkage() != Linkage.SUM && options.linkage() != Linkage.MEAN) {
      throw new IllegalArgumentException("pairs by sum and count need sum or mean linkage, not "
          + options.linkage());
    }
    AgglomerationState s = new AgglomerationState(options, nodeCount);
    s.eu = new int[pairCount];
    s.ev = new int[pairCount];
    s.allocateStatistics(pairCount);
    s.edgeCount = pairCount;
    return s;
  }

  /**
   * Pair {@code e} of an {@link #ofPairs} state: nodes {@code u != v}, the sum and count of the
   * edges between them.
   */
  void putPair(int e, int u, int v, double sum, long count) {
    eu[e] = u;
    ev[e] = v;
    stat[stride * e] = sum;
    if (stride == 2) {
      stat[2 * e + 1] = count;
    }
  }

  private void allocateStatistics(int m) {
    stat = new double[Math.multiplyExact(stride, m)];
    if (constraints) {
      constrained = new boolean[m];
    }
    if (mutexOrder) {
      maxId = new int[m];
      minId = new int[m];
    }
  }

  private void addGridEdge(int source, int target, int e, double w) {
    stat[stride * e] = w;
    if (stride == 2) {
      stat[2 * e + 1] = linkage == Linkage.MEAN ? 1 : w;
    }
    if (maxId != null) {
      maxId[e] = e;
      minId[e] = e;
    }
    adjacency.addNew(source, target, e);
    adjacency.addNew(target, source, e);
    offer(e);
  }

  /**
   * Adds statistics between nodes {@code u != v} of a sparse input; a pair seen before is
   * combined. {@code id} orders ties under ABS_MAX with constraints (ascending; distinct per
   * call).
   */
  void addEdge(int u, int v, double sum, long count, double min, double max, int id) {
    if (u == v) {
      throw new IllegalArgumentException("edge from node " + u + " to itself");
    }
    int e = pairs.putIfAbsent(PairSet.pair(u, v), edgeCount);
    if (e >= 0) {
      combine(e, first(sum, min, max), second(count, min), id, id);
      return;
    }
    if (edgeCount == eu.length) {
      growEdges();
    }
    e = edgeCount++;
    eu[e] = u;
    ev[e] = v;
    stat[stride * e] = first(sum, min, max);
    if (stride == 2) {
      stat[2 * e + 1] = second(count, min);
    }
    if (maxId != null) {
      maxId[e] = id;
      minId[e] = id;
    }
  }

  private double first(double sum, double min, double max) {
    return switch (linkage) {
      case SUM, MEAN -> sum;
      case MAX, ABS_MAX -> max;
      case MIN -> min;
    };
  }

  private double second(long count, double min) {
    return linkage == Linkage.MEAN ? count : min;
  }

  private void growEdges() {
    int m = eu.length * 2;
    eu = Arrays.copyOf(eu, m);
    ev = Arrays.copyOf(ev, m);
    stat = Arrays.copyOf(stat, stride * m);
    if (constrained != null) {
      constrained = Arrays.copyOf(constrained, m);
    }
    if (maxId != null) {
      maxId = Arrays.copyOf(maxId, m);
      minId = Arrays.copyOf(minId, m);
    }
  }

  /** Builds adjacency and queue of a sparse input once every edge is added. */
  private void finishSparse() {
    pairs = null;
    int[] degree = new int[nodeCount];
    for (int e = 0; e < edgeCount; e++) {
      degree[eu[e]]++;
      degree[ev[e]]++;
    }
    int largest = 0;
    for (int d : degree) {
      largest = Math.max(largest, d);
    }
    // nodes above the packed capacity start in their own table
    adjacency = new ClusterAdjacency(nodeCount, Math.max(1, Math.min(largest, 8)));
    for (int c = 0; c < nodeCount; c++) {
      adjacency.reserve(c, degree[c]);
    }
    queue = new EdgeQueue(constraints, mutexOrder, edgeCount);
    for (int e = 0; e < edgeCount; e++) {
      adjacency.addNew(eu[e], ev[e], e);
      adjacency.addNew(ev[e], eu[e], e);
      offer(e);
    }
  }

  /** Appends edge {@code e} to the (not yet ordered) queue if it is a candidate. */
  private void offer(int e) {
    double value = value(e);
    if (isCandidate(e, value)) {
      queue.append(value, rank(e), e);
    }
  }

  private void combine(int into, double first, double second, int firstId, int secondId) {
    int i = stride * into;
    if (maxId != null) {
      combineIds(into, first, second, firstId, secondId);
    }
    switch (linkage) {
      case SUM -> stat[i] += first;
      case MEAN -> {
        stat[i] += first;
        stat[i + 1] += second;
      }
      case MAX -> stat[i] = Math.max(stat[i], first);
      case MIN -> stat[i] = Math.min(stat[i], first);
      case ABS_MAX -> {
        stat[i] = Math.max(stat[i], first);
        stat[i + 1] = Math.min(stat[i + 1], second);
      }
    }
  }

  /** Combines edge {@code drop}'s statistics into edge {@code keep}'s and kills {@code drop}. */
  private void combineEdges(int keep, int drop) {
    int d = stride * drop;
    combine(keep, stat[d], stride == 2 ? stat[d + 1] : 0, maxId == null ? 0 : maxId[drop],
        minId == null ? 0 : minId[drop]);
    kill(drop);
  }

  /** Marks {@code e} dead: NaN statistics, which no queue entry matches. */
  private void kill(int e) {
    stat[stride * e] = Double.NaN;
    if (stride == 2) {
      stat[stride * e + 1] = Double.NaN;
    }
  }

  /** Keeps the smallest id among the edges at the max and at the min; before {@link #combine}. */
  private void combineIds(int into, double max, double min, int idOfMax, int idOfMin) {
    double a = stat[2 * into];
    double b = stat[2 * into + 1];
    if (max > a || (max == a && idOfMax < maxId[into])) {
      maxId[into] = idOfMax;
    }
    if (min < b || (min == b && idOfMin < minId[into])) {
      minId[into] = idOfMin;
    }
  }

  /** The tie-breaking rank of edge {@code e}: its id, or its representative edge's id. */
  private int rank(int e) {
    if (maxId == null) {
      return e;
    }
    return Math.abs(stat[2 * e]) >= Math.abs(stat[2 * e + 1]) ? maxId[e] : minId[e];
  }

  /** The linkage value of edge {@code e}; NaN once it died. */
  private double value(int e) {
    int i = stride * e;
    return switch (linkage) {
      case SUM -> Linkage.onGrid(stat[i]);
      case MAX, MIN -> stat[i];
      case MEAN -> Linkage.onGrid(stat[i] / stat[i + 1]);
      case ABS_MAX -> {
        double a = stat[i];
        double b = stat[i + 1];
        yield a != a ? a : Math.abs(a) >= Math.abs(b) ? a : b;
      }
    };
  }

  /** Whether live edge {@code e} of linkage {@code value} waits in the queue. */
  private boolean isCandidate(int e, double value) {
    if (constraints) {
      return !constrained[e] && Math.abs(value) > 0;
    }
    return value > threshold;
  }

  private int endU(int e) {
    return gridDelta == null ? eu[e] : e % nodeCount;
  }

  private int endV(int e) {
    return gridDelta == null ? ev[e] : e % nodeCount + gridDelta[e / nodeCount];
  }

  Agglomeration.Result run() {
    if (gridDelta == null) {
      finishSparse();
    }
    queue.heapify();
    if (recordTree) {
      treeId = new int[nodeCount];
      for (int i = 0; i < nodeCount; i++) {
        treeId[i] = i;
      }
      first = new int[16];
      second = new int[16];
      heights = new double[16];
    }
    while (queue.size() > 0) {
      double value = queue.topValue();
      int e = queue.topEdge();
      int entryRank = queue.topRank();
      queue.pop();
      if (value(e) != value || (mutexOrder && rank(e) != entryRank)
          || (constraints && constrained[e])) {
        continue;  // stale: the edge died, changed (a newer entry exists) or became a constraint
      }
      if (constraints && value < 0) {
        constrained[e] = true;
      } else {
        merge(e, value);
      }
    }
    int[] roots = new int[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      roots[i] = find(i);
    }
    MergeTree tree = recordTree
        ? new MergeTree(nodeCount, Arrays.copyOf(first, merges), Arrays.copyOf(second, merges),
            Arrays.copyOf(heights, merges))
        : MergeTree.empty(nodeCount);
    return new Agglomeration.Result(Clustering.fromRepresentatives(roots), tree);
  }

  private int find(int x) {
    while (parent[x] != x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }

  private void merge(int e, double value) {
    int u = find(endU(e));
    int v = find(endV(e));
    kill(e);
    adjacency.remove(u, v);
    adjacency.remove(v, u);
    int large = adjacency.size(u) >= adjacency.size(v) ? u : v;
    int small = large == u ? v : u;
    parent[small] = large;
    if (recordTree) {
      recordMerge(u, v, large, value);
    }
    int slots = adjacency.slotCount(small);
    if (adjacency.size(small) > 1) {
      // each neighbour's map and the moved edge's statistics read once, their misses together
      int ignored = 0;
      for (int slot = 0; slot < slots; slot++) {
        int other = adjacency.neighbourAt(small, slot);
        if (other != ClusterAdjacency.ABSENT) {
          ignored += adjacency.readAhead(other, small)
              + (int) stat[stride * adjacency.edgeAt(small, slot)];
        }
      }
      readAhead += ignored;
    }
    for (int slot = 0; slot < slots; slot++) {
      int other = adjacency.neighbourAt(small, slot);
      if (other != ClusterAdjacency.ABSENT) {
        moveEdge(adjacency.edgeAt(small, slot), other, small, large);
      }
    }
    adjacency.clear(small);
  }

  /** Moves edge {@code f} (small, other) to large, combining it with a (large, other) edge. */
  private void moveEdge(int f, int other, int small, int large) {
    int g = adjacency.putIfAbsent(large, other, f);
    if (g < 0) {
      adjacency.rename(other, small, large, f);
      return;
    }
    int keep = Math.min(f, g);
    int drop = Math.max(f, g);
    double oldValue = value(keep);
    boolean queued = isCandidate(keep, oldValue);
    int oldRank = queued ? rank(keep) : 0;
    if (constraints && constrained[drop]) {
      constrained[keep] = true;
    }
    combineEdges(keep, drop);
    if (keep != g) {
      adjacency.put(large, other, keep);
    }
    adjacency.rename(other, small, large, keep);
    double value = value(keep);
    if (isCandidate(keep, value)) {
      int rank = rank(keep);
      if (!queued || value != oldValue || rank != oldRank) {
        queue.push(value, rank, keep);
      }
    }
  }

  private void recordMerge(int u, int v, int large, double value) {
    if (merges == first.length) {
      first = Arrays.copyOf(first, merges * 2);
      second = Arrays.copyOf(second, merges * 2);
      heights = Arrays.copyOf(heights, merges * 2);
    }
    first[merges] = Math.min(treeId[u], treeId[v]);
    second[merges] = Math.max(treeId[u], treeId[v]);
    heights[merges] = value;
    treeId[large] = nodeCount + merges;
    merges++;
  }
}
