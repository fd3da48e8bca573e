package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.PriorityQueue;
import java.util.function.LongPredicate;
import org.sunder.blockwise.collections.UnionFind;
import org.sunder.blockwise.partition.agglomeration.Linkage;

/**
 * One part of a hierarchical agglomeration with a linkage criterion ("A Generalized Framework
 * for Agglomerative Clustering of Signed Graphs applied to Instance Segmentation", 2019/2022)
 * over the reduced graph's pair statistics, with or without cannot-link constraints.
 *
 * <p>Pairs travel as four rows of {@link SolveEdges} sharing the pair's key: kinds
 * {@link #SUM}, {@link #COUNT}, {@link #MIN_VALUE}, {@link #MAX_VALUE}. A pair formed by joining
 * two keeps the smaller key, which is the tie rank of the single-level agglomeration.
 *
 * <p>Local rule (<em>dominance</em>): the part runs the agglomeration on its inner pairs, and
 * applies the best pair {@code e} between clusters {@code A} and {@code B} (priority {@code p}:
 * its linkage value, or its magnitude with constraints) only when {@code p} is strictly above a
 * bound on every other pair {@code A} or {@code B} has or can ever get while they are unchanged,
 * pairs leaving the part and held-back pairs included. For linkages whose joined value lies
 * between its parts' values (mean, max, min, abs-max) the bound is the largest other priority;
 * for the sum, the sum of the other pairs' positive values (their magnitudes with constraints).
 * Then nothing can touch {@code A} or {@code B} before {@code e} in the whole-graph run, which
 * takes {@code e} while both are unchanged and does the same: the part's decisions commute with
 * everything else, and the next level continues from the contracted graph. A pair that is not
 * dominant is held back. Constrained pairs are handed up with a fifth row,
 * {@link #CONSTRAINED_PAIR}, and stay constrained. A part without
 * pairs leaving it (the driver's) runs the plain agglomeration, ties as the single-level solve
 * (descending priority, positive first, ascending key). Ties at the bound are held back, so
 * weights with many equal values (exact affinities) settle little below the driver.
 *
 * <p>O(m log m) for the heap plus O(degree) per dominance test; boxes heap entries, so meant for
 * pair counts of a part, not of a volume.
 */
public final class LinkagePartSolver implements PartSolver {
  public static final byte SUM = 3;
  public static final byte COUNT = 4;
  public static final byte MIN_VALUE = 5;
  public static final byte MAX_VALUE = 6;
  /** Present (weight 1) when the pair is constrained: its clusters never join. */
  public static final byte CONSTRAINED_PAIR = 7;
  private static final byte ALIVE = 0;
  private static final byte CONSTRAINED = 1;
  private static final byte HELD = 2;
  private static final byte DEAD = 3;

  private final Linkage linkage;
  private final boolean constraints;
  private final double threshold;

  public LinkagePartSolver(Linkage linkage, boolean constraints, double threshold) {
    if (linkage == Linkage.ABS_MAX && constraints) {
      throw new IllegalArgumentException("abs-max with constraints is the Mutex Watershed;"
          + " use MutexPartSolver");
    }
    this.linkage = linkage;
    this.constraints = constraints;
    this.threshold = constraints ? 0 : threshold;
  }

  @Override
  public String name() {
    return "agglomeration " + linkage.jsonName() + (constraints ? " with constraints" : "");
  }

  /** Appends one pair's statistics as its four rows. */
  public static void addPair(SolveEdges out, long u, long v, double sum, long count,
      double min, double max, long keyU, long keyV) {
    addPair(out, u, v, sum, count, min, max, keyU, keyV, false);
  }

  private static void addPair(SolveEdges out, long u, long v, double sum, long count,
      double min, double max, long keyU, long keyV, boolean constrained) {
    out.add(u, v, sum, keyU, keyV, SUM);
    out.add(u, v, count, keyU, keyV, COUNT);
    out.add(u, v, min, keyU, keyV, MIN_VALUE);
    out.add(u, v, max, keyU, keyV, MAX_VALUE);
    if (constrained) {
      out.add(u, v, 1, keyU, keyV, CONSTRAINED_PAIR);
    }
  }

  @Override
  public PartResult solve(SolveEdges rows, LongPredicate inside) {
    Pairs p = Pairs.of(rows);
    PartNodes part = PartNodes.of(p.size, e -> p.u[e], e -> p.v[e], inside);
    Run run = new Run(p, part.nodes().length, part.iu(), part.iv(), part.whole());
    run.agglomerate();
    return run.result(part.nodes());
  }

  /** Pair statistics grouped from rows. */
  private static final class Pairs {
    int size;
    long[] u;
    long[] v;
    long[] keyU;
    long[] keyV;
    double[] sum;
    double[] count;
    double[] min;
    double[] max;
    boolean[] constrained;

    static Pairs of(SolveEdges rows) {
      int[] order = EdgeSort.byKey(rows);
      Pairs p = new Pairs();
      int cap = rows.size() / 4 + 1;
      p.u = new long[cap];
      p.v = new long[cap];
      p.keyU = new long[cap];
      p.keyV = new long[cap];
      p.sum = new double[cap];
      p.count = new double[cap];
      p.min = new double[cap];
      p.max = new double[cap];
      p.constrained = new boolean[cap];
      int i = 0;
      while (i < order.length) {
        int e = order[i];
        int at = p.size++;
        p.u[at] = rows.u(e);
        p.v[at] = rows.v(e);
        p.keyU[at] = rows.keyU(e);
        p.keyV[at] = rows.keyV(e);
        int seen = 0;
        while (i < order.length && rows.keyU(order[i]) == p.keyU[at]
            && rows.keyV(order[i]) == p.keyV[at]) {
          int r = order[i++];
          double w = rows.weight(r);
          switch (rows.kind(r)) {
            case SUM -> p.sum[at] = w;
            case COUNT -> p.count[at] = w;
            case MIN_VALUE -> p.min[at] = w;
            case MAX_VALUE -> p.max[at] = w;
            case CONSTRAINED_PAIR -> p.constrained[at] = true;
            default -> throw new IllegalArgumentException("row kind " + rows.kind(r)
                + " is not a linkage statistic");
          }
          seen |= 1 << (rows.kind(r) - SUM);
        }
        if ((seen & 15) != 15) {
          throw new IllegalArgumentException("pair (" + p.keyU[at] + ", " + p.keyV[at]
              + ") lacks some of its four statistics");
        }
      }
      return p;
    }
  }

  /** The working state of one part's agglomeration. */
  private final class Run {
    private final Pairs p;
    private final int[] iu;
    private final int[] iv;
    private final boolean whole;
    private final int[] parent;
    private final int[][] lists;
    private final int[] listLength;
    private final byte[] state;
    private final int[] version;
    private final LongIntMap pairOf;
    private final PriorityQueue<Entry> heap;
    private long decided;
    private long heldBack;

    Run(Pairs p, int n, int[] iu, int[] iv, boolean whole) {
      this.p = p;
      this.iu = iu;
      this.iv = iv;
      this.whole = whole;
      parent = new int[n];
      lists = new int[n][];
      listLength = new int[n];
      for (int i = 0; i < n; i++) {
        parent[i] = i;
      }
      state = new byte[p.size];
      version = new int[p.size];
      pairOf = new LongIntMap(p.size);
      heap = new PriorityQueue<>(Math.max(1, p.size), Entry::compareTo);
      for (int e = 0; e < p.size; e++) {
        if (p.constrained[e]) {
          state[e] = CONSTRAINED;
        }
      }
      for (int e = 0; e < p.size; e++) {
        if (iu[e] >= 0 && iv[e] >= 0) {
          long k = key(iu[e], iv[e]);
          int g = pairOf.get(k);
          if (g >= 0) {
            // parallel pairs (two sides' pairs that now join the same two clusters) combine
            combine(g, e);
            continue;
          }
          pairOf.put(k, e);
          if (state[e] == ALIVE) {
            push(e);
          }
        }
        if (iu[e] >= 0) {
          append(iu[e], e);
        }
        if (iv[e] >= 0) {
          append(iv[e], e);
        }
      }
    }

    private long key(int a, int b) {
      return ((long) Math.min(a, b) << 32) | Math.max(a, b);
    }

    private void append(int cluster, int e) {
      if (lists[cluster] == null) {
        lists[cluster] = new int[4];
      } else if (listLength[cluster] == lists[cluster].length) {
        lists[cluster] = Arrays.copyOf(lists[cluster], listLength[cluster] * 2);
      }
      lists[cluster][listLength[cluster]++] = e;
    }

    int find(int x) {
      return UnionFind.root(parent, x);
    }

    double value(int e) {
      return linkage.value(p.sum[e], (long) p.count[e], p.min[e], p.max[e]);
    }

    double priority(int e) {
      double v = value(e);
      return constraints ? Math.abs(v) : v;
    }

    private void push(int e) {
      version[e]++;
      double priority = priority(e);
      if (constraints ? priority > 0 : priority > threshold) {
        heap.add(new Entry(e, version[e], priority, value(e) > 0, p.keyU[e], p.keyV[e]));
      }
    }

    void agglomerate() {
      while (!heap.isEmpty()) {
        Entry entry = heap.poll();
        int e = entry.pair();
        if (entry.version() != version[e] || state[e] != ALIVE) {
          continue;
        }
        int a = find(iu[e]);
        int b = find(iv[e]);
        if (!whole && !(dominates(e, a) && dominates(e, b))) {
          state[e] = HELD;
          heldBack++;
          continue;
        }
        decided++;
        if (constraints && value(e) < 0) {
          state[e] = CONSTRAINED;
        } else {
          merge(e, a, b);
        }
      }
    }

    /** Whether pair {@code e} beats every bound on the other pairs of cluster {@code c}. */
    private boolean dominates(int e, int c) {
      double pe = priority(e);
      double bound = Double.NEGATIVE_INFINITY;
      double positive = 0;
      for (int i = 0; i < listLength[c]; i++) {
        int f = lists[c][i];
        if (f == e || state[f] == DEAD || state[f] == CONSTRAINED) {
          continue;
        }
        double v = value(f);
        if (linkage == Linkage.SUM) {
          positive += constraints ? Math.abs(v) : Math.max(0, v);
        } else {
          bound = Math.max(bound, constraints ? Math.abs(v) : v);
        }
      }
      return linkage == Linkage.SUM ? pe > positive : pe > bound;
    }

    private void merge(int e, int a, int b) {
      state[e] = DEAD;
      int large = listLength[a] >= listLength[b] ? a : b;
      int small = large == a ? b : a;
      parent[small] = large;
      for (int i = 0; i < listLength[small]; i++) {
        int f = lists[small][i];
        if (state[f] == DEAD) {
          continue;
        }
        if (iu[f] < 0 || iv[f] < 0) {
          append(large, f);
          continue;
        }
        int x = find(iu[f]);
        int y = find(iv[f]);
        int other = x == large ? y : x;
        if (other == large) {
          state[f] = DEAD;
          continue;
        }
        long k = key(large, other);
        int g = pairOf.get(k);
        if (g < 0 || state[g] == DEAD) {
          pairOf.put(k, f);
          append(large, f);
          continue;
        }
        combine(g, f);
      }
      lists[small] = null;
      listLength[small] = 0;
    }

    /** Joins pair {@code f} into pair {@code g} (same two clusters); the smaller key stays. */
    private void combine(int g, int f) {
      p.sum[g] += p.sum[f];
      p.count[g] += p.count[f];
      p.min[g] = Math.min(p.min[g], p.min[f]);
      p.max[g] = Math.max(p.max[g], p.max[f]);
      int c = Long.compare(p.keyU[f], p.keyU[g]);
      if (c < 0 || c == 0 && p.keyV[f] < p.keyV[g]) {
        p.keyU[g] = p.keyU[f];
        p.keyV[g] = p.keyV[f];
      }
      boolean constrained = state[f] == CONSTRAINED || state[g] == CONSTRAINED;
      state[f] = DEAD;
      state[g] = constrained ? CONSTRAINED : ALIVE;
      if (!constrained) {
        push(g);
      } else {
        version[g]++;
      }
    }

    PartResult result(long[] nodes) {
      int n = nodes.length;
      long[] rep = new long[n];
      boolean[] seen = new boolean[n];
      long[] ofRoot = new long[n];
      boolean[] open = new boolean[n];
      for (int e = 0; e < p.size; e++) {
        if (state[e] == DEAD) {
          continue;
        }
        boolean boundary = iu[e] < 0 || iv[e] < 0;
        if (boundary || state[e] == HELD || !completeAllowed()) {
          if (iu[e] >= 0) {
            open[find(iu[e])] = true;
          }
          if (iv[e] >= 0) {
            open[find(iv[e])] = true;
          }
        }
      }
      for (int i = 0; i < n; i++) {
        int r = find(i);
        if (!seen[r]) {
          seen[r] = true;
          ofRoot[r] = nodes[i];
        }
        rep[i] = ofRoot[r];
      }
      SolveEdges remaining = new SolveEdges(16);
      for (int e = 0; e < p.size; e++) {
        if (state[e] == DEAD) {
          continue;
        }
        if (iu[e] >= 0 && iv[e] >= 0 && (!open[find(iu[e])] || !open[find(iv[e])])) {
          continue;
        }
        long a = iu[e] >= 0 ? rep[iu[e]] : p.u[e];
        long b = iv[e] >= 0 ? rep[iv[e]] : p.v[e];
        addPair(remaining, a, b, p.sum[e], (long) p.count[e], p.min[e], p.max[e], p.keyU[e],
            p.keyV[e], state[e] == CONSTRAINED);
      }
      return PartResult.of(nodes, rep, remaining, decided, heldBack);
    }

    /**
     * Whether a cluster without pairs leaving it or held back is final: its pairs can then never
     * be taken (constrained, or at most the threshold, which joined pairs of a mean-like linkage
     * cannot exceed, nor sums when the threshold is not positive).
     */
    private boolean completeAllowed() {
      return constraints || linkage != Linkage.SUM || threshold <= 0;
    }
  }

  /**
   * A heap entry: the pair's priority and key when it was pushed (a later change pushes a new
   * entry with a new version). Order: descending priority, positive first, ascending key.
   */
  private record Entry(int pair, int version, double priority, boolean positive, long keyU,
      long keyV) implements Comparable<Entry> {
    @Override
    public int compareTo(Entry o) {
      int c = Double.compare(o.priority, priority);
      if (c != 0) {
        return c;
      }
      if (positive != o.positive) {
        return positive ? -1 : 1;
      }
      c = Long.compare(keyU, o.keyU);
      return c != 0 ? c : Long.compare(keyV, o.keyV);
    }
  }

  /** An open-addressing map from long keys (non-negative) to int values; no removal. */
  private static final class LongIntMap {
    private long[] keys;
    private int[] values;
    private int size;

    LongIntMap(int expected) {
      int capacity = Integer.highestOneBit(Math.max(16, expected * 2 - 1)) << 1;
      keys = new long[capacity];
      Arrays.fill(keys, -1);
      values = new int[capacity];
    }

    private static int slot(long key, int mask) {
      long h = key * 0x9E3779B97F4A7C15L;
      return (int) (h ^ (h >>> 32)) & mask;
    }

    int get(long key) {
      int mask = keys.length - 1;
      for (int i = slot(key, mask); keys[i] != -1; i = (i + 1) & mask) {
        if (keys[i] == key) {
          return values[i];
        }
      }
      return -1;
    }

    void put(long key, int value) {
      int mask = keys.length - 1;
      int i = slot(key, mask);
      while (keys[i] != -1 && keys[i] != key) {
        i = (i + 1) & mask;
      }
      if (keys[i] == -1) {
        size++;
      }
      keys[i] = key;
      values[i] = value;
      if (size * 2 > keys.length) {
        long[] oldKeys = keys;
        int[] oldValues = values;
        keys = new long[oldKeys.length * 2];
        Arrays.fill(keys, -1);
        values = new int[oldKeys.length * 2];
        size = 0;
        for (int j = 0; j < oldKeys.length; j++) {
          if (oldKeys[j] != -1) {
            put(oldKeys[j], oldValues[j]);
          }
        }
      }
    }
  }
}
