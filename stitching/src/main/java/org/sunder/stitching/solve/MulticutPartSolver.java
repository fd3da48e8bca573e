package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.function.LongPredicate;
import org.sunder.blockwise.collections.RadixSort;
import org.sunder.blockwise.collections.UnionFind;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.multicut.Multicut;

/**
 * One part of a multicut solved by domain decomposition ("Solving large multicut problems for
 * connectomics via domain decomposition", 2017): the part solves the multicut of its own
 * sub-graph (the pairs with both ends inside it), contracts the inner pairs its solution leaves
 * uncut, and hands up as candidates every pair it cut and every pair leaving it, with summed
 * costs between the contracted nodes. The driver's part, which holds every node, solves what is
 * left whole, as the single-level multicut ({@code MulticutSolver}) does.
 *
 * <p>Rows: a pair travels as one {@link #COST} row whose weight is its summed weights, the sum
 * linkage value the single-level multicut takes as its cost; the multicut objective is additive,
 * so contracting nodes sums the costs of the pairs that become parallel and the contracted
 * problem has the objective of the original one on every partition that keeps the contracted
 * nodes together. A pair whose two pieces continue one fragment across a face (at least
 * {@link GlobalSolve#MIN_CONTINUED_PAIRS} continued voxel pairs) has a {@link #JOINED} row too:
 * its ends are joined before the multicut, as the single-level solve joins them first; a joined
 * pair leaving a part is joined at the level where both its ends meet.
 *
 * <p>A group of joined nodes with any pair leaving the part is <em>open</em>. It and every
 * group with an inner cost pair to an open group are held back, as a block holds back what
 * leans on its halo: each takes part in the part's multicut, so the other nodes decide with its
 * pairs in view, but is never contracted: it stays a node of its own and all its pairs go up.
 * The rest of its cluster is contracted piece by piece, each piece connected by the cluster's
 * inner pairs (two pieces that touch only through a held-back group may end in different
 * segments). An open group's joins would lean on pairs the part cannot see (a joined pair
 * leaving makes it only a piece of a node of the whole problem; a cost pair leaving lets the
 * whole problem's contraction reach it from outside first), and its neighbours' first
 * contraction in the whole problem may be with the open group's cluster grown from outside,
 * whose summed costs the part cannot know. On the tissue presets (the whole default, 768
 * blocks, 2–3 levels, seeds 1–3; {@code MulticutLevelsBenchmark}) holding back the neighbours
 * took the difference from the single level from 0.014–0.022 bits of variation of information
 * to 0.0000–0.0084, for 1.3–1.6 times the driver's share after 3 levels (9–19 % of the reduced
 * graph's pairs, against 6–14 %). Contracting open groups anyway measured 11 % off the
 * single-level objective on undegraded synthetic tissue for joined pieces; for cost pairs, on
 * the presets, 0.15–0.22 bits on dense neurites and bodies; leaving them out of the part's
 * multicut as well 0.039–0.078 bits. Giving back the whole cluster of an open group measured
 * 0.006–0.009 bits, but left the driver four times the pairs (27 % of the reduced graph after 3
 * levels): an object that crosses parts would reach the driver as all its nodes; holding back
 * only the neighbours joined by an attractive pair, 0.036 bits on dense neurites. Only the sum
 * linkage (the multicut's default) has this additive form; other linkages stay on the driver.
 *
 * <p>Pairs leaving the part are handed up one row per pair, never combined, so the copies the
 * parts at both ends hand up agree (see {@link SolveEdges#joinCopies}); cut inner pairs between
 * the same two contracted nodes are combined into one row that keeps the smallest key. With one
 * part holding everything the result is the single-level multicut's, partition for partition:
 * the same nodes in the same order, the same joined groups (smallest node as representative),
 * the same costs summed in the same order ({@link EdgeStatistics#of}).
 *
 * <p>O(m log m) for the part's m rows plus the multicut's cost (greedy additive edge
 * contraction, and Kernighan–Lin refinement when the run asks for it, as the single-level solve
 * does). Deterministic: rows are read in key order.
 */
public final class MulticutPartSolver implements PartSolver {
  /** A pair's cost: its summed weights (positive joins, negative cuts). */
  public static final byte COST = 8;
  /** Present (weight: continued voxel pairs) when the pair's ends are joined first. */
  public static final byte JOINED = 9;

  private final boolean kernighanLin;

  /** @param kernighanLin whether each part's multicut is refined by Kernighan–Lin */
  public MulticutPartSolver(boolean kernighanLin) {
    this.kernighanLin = kernighanLin;
  }

  @Override
  public String name() {
    return "multicut on " + Linkage.SUM.jsonName() + " weights by domain decomposition";
  }

  /** Appends one pair's cost row. */
  public static void addPair(SolveEdges out, long u, long v, double cost) {
    out.add(u, v, cost, u, v, COST);
  }

  /** Appends the row that joins a pair's ends before the multicut. */
  public static void addJoined(SolveEdges out, long u, long v, long continuedPairs) {
    out.add(u, v, continuedPairs, u, v, JOINED);
  }

  @Override
  public PartResult solve(SolveEdges rows, LongPredicate inside) {
    int m = rows.size();
    int[] order = EdgeSort.byKey(rows);
    for (int e = 0; e < m; e++) {
      byte kind = rows.kind(e);
      if (kind != COST && kind != JOINED) {
        throw new IllegalArgumentException("row kind " + kind + " of pair (" + rows.keyU(e)
            + ", " + rows.keyV(e) + ") is not a multicut row");
      }
    }
    PartNodes part = PartNodes.of(m, e -> rows.u(order[e]), e -> rows.v(order[e]), inside);
    long[] nodes = part.nodes();
    int[] iu = part.iu();
    int[] iv = part.iv();
    int n = nodes.length;
    int[] group = joinedGroups(rows, order, iu, iv, n);
    int[] cluster = multicut(rows, order, iu, iv, group, openGroups(iu, iv, group));
    long[] rep = new long[n];
    int[] smallest = new int[2 * n];
    Arrays.fill(smallest, -1);
    for (int i = 0; i < n; i++) {
      if (smallest[cluster[i]] < 0) {
        smallest[cluster[i]] = i;
      }
      rep[i] = nodes[smallest[cluster[i]]];
    }
    SolveEdges remaining = new SolveEdges(16);
    long decided = 0;
    long heldBack = 0;
    int[] cut = new int[m];
    int cuts = 0;
    boolean whole = part.whole();
    for (int k = 0; k < m; k++) {
      int e = order[k];
      boolean innerU = iu[k] >= 0;
      boolean innerV = iv[k] >= 0;
      if (innerU && innerV) {
        if (rows.kind(e) != COST) {
          continue;
        }
        if (cluster[iu[k]] == cluster[iv[k]]) {
          decided++;
        } else {
          heldBack++;
          cut[cuts++] = k;
        }
      } else if (!whole) {
        remaining.add(rows, e, innerU ? rep[iu[k]] : rows.u(e), innerV ? rep[iv[k]] : rows.v(e));
      }
    }
    if (!whole) {
      addCombined(rows, order, Arrays.copyOf(cut, cuts), iu, iv, rep, remaining);
    }
    return PartResult.of(nodes, rep, remaining, decided, heldBack);
  }

  /**
   * Per node, the smallest node joined to it through {@link #JOINED} rows with both ends inside
   * the part. O(m α(n)).
   */
  private static int[] joinedGroups(SolveEdges rows, int[] order, int[] iu, int[] iv, int n) {
    int[] parent = UnionFind.singletons(n);
    for (int k = 0; k < order.length; k++) {
      if (rows.kind(order[k]) == JOINED && iu[k] >= 0 && iv[k] >= 0) {
        UnionFind.union(parent, iu[k], iv[k]);
      }
    }
    for (int i = 0; i < n; i++) {
      parent[i] = UnionFind.root(parent, i);
    }
    return parent;
  }

  /**
   * Per group node, whether its group has a pair (joined or cost) leaving the part: then its
   * joins lean on pairs this part cannot see, and it and its neighbours are held back. O(m).
   */
  private static boolean[] openGroups(int[] iu, int[] iv, int[] group) {
    boolean[] open = new boolean[group.length];
    for (int k = 0; k < iu.length; k++) {
      if ((iu[k] < 0) != (iv[k] < 0)) {
        open[group[iu[k] >= 0 ? iu[k] : iv[k]]] = true;
      }
    }
    return open;
  }

  /**
   * The multicut of the part's inner pairs, their ends moved to their joined group's node; each
   * held-back group (an {@code open} one, or one with an inner pair to an open one) then leaves
   * its cluster and stays one of its own (all its pairs handed up), and the rest of the cluster
   * contracts by the pieces its inner pairs connect: per node, its cluster (0..2n-1).
   * O(m log m) plus the multicut.
   */
  private int[] multicut(SolveEdges rows, int[] order, int[] iu, int[] iv, int[] group,
      boolean[] open) {
    int inner = 0;
    for (int k = 0; k < order.length; k++) {
      if (rows.kind(order[k]) == COST && iu[k] >= 0 && iv[k] >= 0) {
        inner++;
      }
    }
    long[] a = new long[inner];
    long[] b = new long[inner];
    double[] w = new double[inner];
    inner = 0;
    for (int k = 0; k < order.length; k++) {
      if (rows.kind(order[k]) == COST && iu[k] >= 0 && iv[k] >= 0) {
        a[inner] = group[iu[k]];
        b[inner] = group[iv[k]];
        w[inner++] = rows.weight(order[k]);
      }
    }
    boolean[] heldBack = open.clone();
    for (int e = 0; e < a.length; e++) {
      if (open[(int) a[e]] || open[(int) b[e]]) {
        heldBack[(int) a[e]] = true;
        heldBack[(int) b[e]] = true;
      }
    }
    EdgeStatistics costs = EdgeStatistics.ofEdges(a, b, w);
    int[] labels = Multicut.ofLinkage(group.length, costs, Linkage.SUM, 0, kernighanLin).labels();
    // the rest of a cluster contracts by its connected pieces: without its held-back groups a
    // cluster may fall apart, and a piece joined only through a held-back group must not be
    // contracted with another it would be cut from if that group went elsewhere
    int n = group.length;
    int[] piece = UnionFind.singletons(n);
    for (int e = 0; e < a.length; e++) {
      int ga = (int) a[e];
      int gb = (int) b[e];
      if (!heldBack[ga] && !heldBack[gb] && labels[ga] == labels[gb]) {
        UnionFind.union(piece, ga, gb);
      }
    }
    int[] cluster = new int[n];
    for (int i = 0; i < n; i++) {
      cluster[i] = heldBack[group[i]] ? n + group[i] : UnionFind.root(piece, group[i]);
    }
    return cluster;
  }

  /**
   * Hands up the cut inner pairs {@code cut} (positions in key order), one row per pair of
   * contracted nodes: costs summed in ascending order, the smallest key kept. O(c log c).
   */
  private static void addCombined(SolveEdges rows, int[] order, int[] cut, int[] iu, int[] iv,
      long[] rep, SolveEdges out) {
    long[] a = new long[cut.length];
    long[] b = new long[cut.length];
    for (int i = 0; i < cut.length; i++) {
      long x = rep[iu[cut[i]]];
      long y = rep[iv[cut[i]]];
      a[i] = Math.min(x, y);
      b[i] = Math.max(x, y);
    }
    int[] byPair = RadixSort.order(cut.length, x -> RadixSort.signedKey(a[x]),
        x -> RadixSort.signedKey(b[x]),
        x -> RadixSort.doubleKey(rows.weight(order[cut[x]])));
    int i = 0;
    while (i < byPair.length) {
      int first = byPair[i];
      double cost = 0;
      int smallestKey = order[cut[first]];
      int j = i;
      while (j < byPair.length && a[byPair[j]] == a[first] && b[byPair[j]] == b[first]) {
        int e = order[cut[byPair[j]]];
        cost += rows.weight(e);
        if (rows.compareKeys(e, smallestKey) < 0) {
          smallestKey = e;
        }
        j++;
      }
      out.add(a[first], b[first], cost, rows.keyU(smallestKey), rows.keyV(smallestKey), COST);
      i = j;
    }
  }
}
