package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.function.LongPredicate;

/**
 * One part of a hierarchical Mutex Watershed ("The Mutex Watershed and its Objective: Efficient,
 * Parameter-Free Graph Partitioning", TPAMI 2020) over the reduced graph.
 *
 * <p>The Mutex Watershed takes edges in one fixed global order ({@link MutexOrder}): an
 * attractive edge joins its two clusters unless they are mutually exclusive, a repulsive edge
 * makes them exclusive unless they are joined. A part sees its inner edges and the edges that
 * leave it. Each inner cluster has a <em>frontier</em>: the position in the order of the first
 * edge that could change it without the part knowing, initially the first edge leaving the part
 * from one of its nodes. The part takes its inner edges in order; edge {@code e} at position
 * {@code t} between clusters {@code A} and {@code B} (a cluster is <em>settled</em> at
 * {@code t} when its frontier lies after {@code t}: no edge outside the part and no held-back
 * edge has touched it, so in the whole-graph run it is exactly this cluster with exactly these
 * exclusions; otherwise it is <em>open</em>, and in the whole-graph run it may have grown)
 * <ul>
 *   <li>is settled as nothing to do if {@code A = B} or the two are exclusive (joins and
 *       exclusions made here are made by the whole-graph run too, which only adds to them);
 *   <li>is settled, and applied, if both are settled;
 *   <li>if {@code A} is open and {@code B} settled: a repulsive edge is settled (in the
 *       whole-graph run {@code B} is still apart from whatever {@code A} grew into, so they
 *       become exclusive); an attractive edge is settled as a join when every cluster exclusive
 *       with {@code B} is settled (none of them can have grown into {@code A}'s cluster, so
 *       nothing forbids the join), and the joined cluster is open;
 *   <li>is held back otherwise, and opens both clusters at {@code t}.
 * </ul>
 * A settled operation changes only what no unknown edge before it touched (a settled cluster,
 * or an open one by a settled cluster whose exclusions are all with settled clusters), so it
 * commutes with every held-back or outside edge before it: the whole-graph run equals applying
 * the settled operations first (contracting the part) and then running the rest in the same
 * order. The next level therefore gets the contracted graph: held-back inner edges and leaving
 * edges, ends relabelled to the smallest provisional id of their cluster, inner edges reduced
 * to the first attractive and the first repulsive edge per cluster pair (only those can decide
 * anything). A cluster whose frontier never moved (no edge leaves it, none of its edges was held
 * back) is complete: every edge it has was settled, it can join nothing more, and an exclusion
 * with it constrains nobody else, so it and its edges leave the graph. A part that holds every
 * end settles everything: the Mutex Watershed itself.
 *
 * <p>O(m) per varying key byte for m edges (the radix sorts of {@link EdgeSort} and
 * {@link PartNodes}), union-find and exclusion sets near O(m α(m)) otherwise;
 * about 120 bytes per edge while it runs.
 */
public final class MutexPartSolver implements PartSolver {

  @Override
  public String name() {
    return "mutex-watershed";
  }

  @Override
  public PartResult solve(SolveEdges edges, LongPredicate inside) {
    int m = edges.size();
    PartNodes part = PartNodes.of(m, edges::u, edges::v, inside);
    long[] nodes = part.nodes();
    int n = nodes.length;
    int[] iu = part.iu();
    int[] iv = part.iv();
    int[] order = MutexOrder.sorted(edges);
    int[] frontier = new int[n];
    Arrays.fill(frontier, Integer.MAX_VALUE);
    for (int t = 0; t < m; t++) {
      int e = order[t];
      if (iu[e] < 0 || iv[e] < 0) {
        int node = iu[e] >= 0 ? iu[e] : iv[e];
        frontier[node] = Math.min(frontier[node], t);
      }
    }
    Clusters clusters = new Clusters(n, frontier);
    long decided = 0;
    long heldBack = 0;
    for (int t = 0; t < m; t++) {
      int e = order[t];
      if (iu[e] < 0 || iv[e] < 0) {
        continue;
      }
      int a = clusters.find(iu[e]);
      int b = clusters.find(iv[e]);
      boolean openA = clusters.frontier[a] < t;
      boolean openB = clusters.frontier[b] < t;
      boolean attractive = edges.weight(e) > 0;
      if (a == b || clusters.exclusive(a, b)) {
        decided++;
      } else if (!openA && !openB) {
        decided++;
        if (attractive) {
          clusters.join(a, b);
        } else {
          clusters.exclude(a, b);
        }
      } else if (openA && openB
          || attractive && !clusters.partnersSettled(openA ? b : a, t)) {
        heldBack++;
        clusters.frontier[a] = Math.min(clusters.frontier[a], t);
        clusters.frontier[b] = Math.min(clusters.frontier[b], t);
      } else {
        decided++;
        if (attractive) {
          clusters.join(a, b);
        } else {
          clusters.exclude(a, b);
        }
      }
    }
    long[] rep = representatives(nodes, clusters);
    boolean[] complete = new boolean[n];
    for (int i = 0; i < n; i++) {
      complete[i] = clusters.frontier[clusters.find(i)] == Integer.MAX_VALUE;
    }
    return result(edges, order, nodes, iu, iv, rep, complete, decided, heldBack);
  }

  /** Per node, the smallest provisional id of its cluster ({@code nodes} is ascending). */
  private static long[] representatives(long[] nodes, Clusters clusters) {
    int n = nodes.length;
    long[] ofRoot = new long[n];
    boolean[] seen = new boolean[n];
    long[] rep = new long[n];
    for (int i = 0; i < n; i++) {
      int r = clusters.find(i);
      if (!seen[r]) {
        seen[r] = true;
        ofRoot[r] = nodes[i];
      }
      rep[i] = ofRoot[r];
    }
    return rep;
  }

  private static PartResult result(SolveEdges edges, int[] order, long[] nodes, int[] iu,
      int[] iv, long[] rep, boolean[] complete, long decided, long heldBack) {
    SolveEdges remaining = new SolveEdges((int) Math.min(edges.size(), heldBack * 2 + 16));
    LongPairSet firstAttractive = new LongPairSet(16);
    LongPairSet firstRepulsive = new LongPairSet(16);
    for (int t = 0; t < order.length; t++) {
      int e = order[t];
      long a = iu[e] >= 0 ? rep[iu[e]] : edges.u(e);
      long b = iv[e] >= 0 ? rep[iv[e]] : edges.v(e);
      if (iu[e] >= 0 && iv[e] >= 0) {
        if (a == b || complete[iu[e]] || complete[iv[e]]) {
          continue;
        }
        long lo = Math.min(a, b);
        long hi = Math.max(a, b);
        LongPairSet first = edges.weight(e) > 0 ? firstAttractive : firstRepulsive;
        if (!first.add(lo, hi)) {
          continue;
        }
      }
      remaining.add(edges, e, a, b);
    }
    return PartResult.of(nodes, rep, remaining, decided, heldBack);
  }

  /** Union-find with exclusion sets and a frontier per root. */
  private static final class Clusters {
    private final int[] parent;
    private final int[] listLength;
    private final int[] head;
    private int[] entryNode;
    private int[] entryNext;
    private int entries;
    private final LongPairSet exclusions;
    final int[] frontier;

    Clusters(int n, int[] frontier) {
      parent = new int[n];
      for (int i = 0; i < n; i++) {
        parent[i] = i;
      }
      listLength = new int[n];
      head = new int[n];
      Arrays.fill(head, -1);
      entryNode = new int[16];
      entryNext = new int[16];
      exclusions = new LongPairSet(16);
      this.frontier = frontier;
    }

    int find(int x) {
      return UnionFind.root(parent, x);
    }

    boolean exclusive(int a, int b) {
      return exclusions.contains(Math.min(a, b), Math.max(a, b));
    }

    void exclude(int a, int b) {
      if (exclusions.add(Math.min(a, b), Math.max(a, b))) {
        append(a, b);
        append(b, a);
      }
    }

    private void append(int owner, int partner) {
      if (entries == entryNode.length) {
        entryNode = Arrays.copyOf(entryNode, entries * 2);
        entryNext = Arrays.copyOf(entryNext, entries * 2);
      }
      entryNode[entries] = partner;
      entryNext[entries] = head[owner];
      head[owner] = entries++;
      listLength[owner]++;
    }

    /** Whether every cluster exclusive with root {@code r} is settled at position {@code t}. */
    boolean partnersSettled(int r, int t) {
      for (int entry = head[r]; entry >= 0; entry = entryNext[entry]) {
        if (frontier[find(entryNode[entry])] < t) {
          return false;
        }
      }
      return true;
    }

    /** Joins roots {@code a} and {@code b}; the shorter exclusion list moves. */
    void join(int a, int b) {
      int big = listLength[a] >= listLength[b] ? a : b;
      int small = big == a ? b : a;
      parent[small] = big;
      frontier[big] = Math.min(frontier[big], frontier[small]);
      for (int entry = head[small]; entry >= 0; entry = entryNext[entry]) {
        int partner = find(entryNode[entry]);
        if (exclusions.add(Math.min(big, partner), Math.max(big, partner))) {
          append(big, partner);
        }
      }
      head[small] = -1;
      listLength[small] = 0;
    }
  }
}
