package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;
import org.sunder.blockwise.collections.PairMap;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.partition.Clustering;

/**
 * The implementation {@link AgglomerationState} replaced (one hash map of cluster pairs, an
 * indexed heap), kept unchanged as a reference for {@link AgglomerationReferenceTest}.
 *
 * <p>With {@link Linkage#ABS_MAX} and constraints each aggregated edge also keeps the id of the
 * edge holding its max and of the edge holding its min (the smallest id among equal values);
 * the heap breaks ties by the id on the side the linkage takes, which is where the Mutex
 * Watershed's order puts the pair's first edge.
 */
final class PreviousAgglomerationState {
  private static final byte ALIVE = 0;
  private static final byte CONSTRAINED = 1;
  private static final byte DEAD = 2;

  private final Linkage linkage;
  private final boolean constraints;
  private final double threshold;
  private final int nodeCount;
  private int edgeCount;
  private int[] eu;
  private int[] ev;
  private double[] a;
  private double[] b;
  private byte[] state;
  private int[] maxId;
  private int[] minId;
  private final int[] head;
  private final int[] degree;
  private int[] next;
  private int[] entryEdge;
  private final int[] parent;
  private final PairMap pairs;
  private final boolean recordTree;
  private int[] treeId;
  private int[] first;
  private int[] second;
  private double[] heights;
  private int merges;
  private int[] order;

  PreviousAgglomerationState(Agglomeration options, int nodeCount, int expectedEdges) {
    this.linkage = options.linkage();
    this.constraints = options.constraints();
    this.threshold = options.threshold();
    this.recordTree = options.recordsTree();
    this.nodeCount = nodeCount;
    int m = Math.max(4, expectedEdges);
    eu = new int[m];
    ev = new int[m];
    a = new double[m];
    b = needsSecond() ? new double[m] : null;
    if (linkage == Linkage.ABS_MAX && constraints) {
      maxId = new int[m];
      minId = new int[m];
    }
    state = new byte[m];
    next = new int[2 * m];
    entryEdge = new int[2 * m];
    head = new int[nodeCount];
    Arrays.fill(head, -1);
    degree = new int[nodeCount];
    parent = new int[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      parent[i] = i;
    }
    pairs = new PairMap(expectedEdges);
  }

  private boolean needsSecond() {
    return linkage == Linkage.MEAN || linkage == Linkage.ABS_MAX;
  }

  /**
   * Adds statistics between nodes {@code u != v}; a pair seen before is combined. {@code id}
   * orders ties under ABS_MAX with constraints (ascending; distinct per call).
   */
  void addEdge(int u, int v, double sum, long count, double min, double max, int id) {
    if (u == v) {
      throw new IllegalArgumentException("edge from node " + u + " to itself");
    }
    long key = PairSet.pair(u, v);
    int e = pairs.get(key);
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
    a[e] = first(sum, min, max);
    if (b != null) {
      b[e] = second(count, min);
    }
    if (maxId != null) {
      maxId[e] = id;
      minId[e] = id;
    }
    pairs.put(key, e);
    link(u, e, 2 * e);
    link(v, e, 2 * e + 1);
    degree[u]++;
    degree[v]++;
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

  private void combine(int into, double first, double second, int firstId, int secondId) {
    if (maxId != null) {
      combineIds(into, first, second, firstId, secondId);
    }
    switch (linkage) {
      case SUM -> a[into] += first;
      case MEAN -> {
        a[into] += first;
        b[into] += second;
      }
      case MAX -> a[into] = Math.max(a[into], first);
      case MIN -> a[into] = Math.min(a[into], first);
      case ABS_MAX -> {
        a[into] = Math.max(a[into], first);
        b[into] = Math.min(b[into], second);
      }
    }
  }

  /** Keeps the smallest id among the edges at the max and at the min; before {@link #combine}. */
  private void combineIds(int into, double max, double min, int idOfMax, int idOfMin) {
    if (max > a[into] || (max == a[into] && idOfMax < maxId[into])) {
      maxId[into] = idOfMax;
    }
    if (min < b[into] || (min == b[into] && idOfMin < minId[into])) {
      minId[into] = idOfMin;
    }
  }

  /** The tie-breaking rank of edge {@code e}: its index, or its representative edge's id. */
  private int rank(int e) {
    if (maxId == null) {
      return e;
    }
    return Math.abs(a[e]) >= Math.abs(b[e]) ? maxId[e] : minId[e];
  }

  private double value(int e) {
    return switch (linkage) {
      case SUM -> Linkage.onGrid(a[e]);
      case MAX, MIN -> a[e];
      case MEAN -> Linkage.onGrid(a[e] / b[e]);
      case ABS_MAX -> Math.abs(a[e]) >= Math.abs(b[e]) ? a[e] : b[e];
    };
  }

  private void link(int cluster, int e, int entry) {
    entryEdge[entry] = e;
    next[entry] = head[cluster];
    head[cluster] = entry;
  }

  private void growEdges() {
    int m = eu.length * 2;
    eu = Arrays.copyOf(eu, m);
    ev = Arrays.copyOf(ev, m);
    a = Arrays.copyOf(a, m);
    if (b != null) {
      b = Arrays.copyOf(b, m);
    }
    state = Arrays.copyOf(state, m);
    if (maxId != null) {
      maxId = Arrays.copyOf(maxId, m);
      minId = Arrays.copyOf(minId, m);
    }
    next = Arrays.copyOf(next, 2 * m);
    entryEdge = Arrays.copyOf(entryEdge, 2 * m);
  }

  Agglomeration.Result run() {
    double[] priority = new double[edgeCount];
    byte[] tie = new byte[edgeCount];
    order = new int[edgeCount];
    boolean[] candidate = new boolean[edgeCount];
    for (int e = 0; e < edgeCount; e++) {
      setPriority(e, priority, tie);
      candidate[e] = isCandidate(e, priority);
    }
    PreviousEdgeHeap heap = new PreviousEdgeHeap(priority, tie, order, edgeCount);
    heap.build(candidate);
    candidate = null;
    if (recordTree) {
      treeId = new int[nodeCount];
      for (int i = 0; i < nodeCount; i++) {
        treeId[i] = i;
      }
      first = new int[16];
      second = new int[16];
      heights = new double[16];
    }
    while (heap.size() > 0) {
      int e = heap.pop();
      double value = value(e);
      if (constraints && value < 0) {
        state[e] = CONSTRAINED;
      } else {
        merge(e, value, heap, priority, tie);
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

  private void setPriority(int e, double[] priority, byte[] tie) {
    double value = value(e);
    priority[e] = constraints ? Math.abs(value) : value;
    tie[e] = (byte) (value > 0 ? 0 : 1);
    order[e] = rank(e);
  }

  private boolean isCandidate(int e, double[] priority) {
    if (state[e] != ALIVE) {
      return false;
    }
    return constraints ? priority[e] > 0 : priority[e] > threshold;
  }

  private int find(int x) {
    while (parent[x] != x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }

  private void merge(int e, double value, PreviousEdgeHeap heap, double[] priority, byte[] tie) {
    int u = eu[e];
    int v = ev[e];
    state[e] = DEAD;
    pairs.remove(PairSet.pair(u, v));
    degree[u]--;
    degree[v]--;
    int large = degree[u] >= degree[v] ? u : v;
    int small = large == u ? v : u;
    parent[small] = large;
    if (recordTree) {
      recordMerge(u, v, large, value);
    }
    for (int entry = head[small]; entry >= 0; ) {
      int following = next[entry];
      int f = entryEdge[entry];
      if (state[f] != DEAD) {
        moveEdge(entry, f, small, large, heap, priority, tie);
      }
      entry = following;
    }
    head[small] = -1;
    degree[small] = 0;
  }

  private void moveEdge(int entry, int f, int small, int large, PreviousEdgeHeap heap,
      double[] priority, byte[] tie) {
    int other = eu[f] == small ? ev[f] : eu[f];
    pairs.remove(PairSet.pair(small, other));
    long key = PairSet.pair(large, other);
    int g = pairs.get(key);
    if (g < 0) {
      retarget(f, small, large);
      link(large, f, entry);
      degree[large]++;
      pairs.put(key, f);
      return;
    }
    int keep = Math.min(f, g);
    int drop = Math.max(f, g);
    byte constrained = state[f] == CONSTRAINED || state[g] == CONSTRAINED ? CONSTRAINED : ALIVE;
    combine(keep, a[drop], b == null ? 0 : b[drop], maxId == null ? 0 : maxId[drop],
        minId == null ? 0 : minId[drop]);
    state[drop] = DEAD;
    heap.remove(drop);
    state[keep] = constrained;
    degree[other]--;
    if (keep == f) {
      retarget(f, small, large);
      link(large, f, entry);
    }
    pairs.put(key, keep);
    setPriority(keep, priority, tie);
    if (isCandidate(keep, priority)) {
      heap.update(keep);
    } else {
      heap.remove(keep);
    }
  }

  private void retarget(int f, int from, int to) {
    if (eu[f] == from) {
      eu[f] = to;
    } else {
      ev[f] = to;
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
