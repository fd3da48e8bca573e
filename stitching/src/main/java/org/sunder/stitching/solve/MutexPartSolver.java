package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.List;
import java.util.function.LongPredicate;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.collections.UnionFind;

/**
 * One part of a hierarchical Mutex Watershed ("The Mutex Watershed and its Objective: Efficient,
 * Parameter-Free Graph Partitioning", TPAMI 2020) over the reduced graph.
 *
 * <p>The Mutex Watershed takes edges in one fixed global order ({@link MutexOrder}): an
 * attractive edge joins its two clusters unless they are mutually exclusive, a repulsive edge
 * makes them exclusive unless they are joined. A part sees its inner edges and the edges that
 * leave it; the others, and the inner edges it holds back, are <em>unknown</em> to it. Each
 * inner cluster has two positions in the order: its <em>frontier</em>, the first unknown edge
 * that touched it, and its <em>member frontier</em>, the first unknown attractive one (initially
 * the first edges leaving the part from one of its nodes). At position {@code t} a cluster is
 * <em>settled</em> when its frontier lies after {@code t} (in the whole-graph run it is exactly
 * this cluster with exactly these exclusions), <em>member-exact</em> when its member frontier
 * does (in the whole-graph run it has exactly these members, though an edge leaving the part
 * may have made it exclusive with a cluster the part does not know), and <em>open</em> otherwise
 * (in the whole-graph run it may have grown). The part takes its inner
 * edges in order; edge {@code e} at position {@code t} between clusters {@code A} and {@code B}
 * <ul>
 *   <li>is settled as nothing to do if {@code A = B} or the two are exclusive (joins and
 *       exclusions made here are made by the whole-graph run too, which only adds to them);
 *   <li>if repulsive, is settled when {@code A} or {@code B} is member-exact (in the whole-graph
 *       run the member-exact one is still apart from whatever the other grew into, so they
 *       become exclusive), and held back when both are open;
 *   <li>if attractive, is settled as a join when both are member-exact (neither has grown, and
 *       an exclusion between them would have come from an inner repulsive edge, which a
 *       member-exact cluster cannot have held back), or when {@code A} is open and {@code B}
 *       settled with every cluster exclusive with {@code B} member-exact (none of them can have
 *       grown into {@code A}'s cluster, so nothing forbids the join; the joined cluster is
 *       open); it is held back otherwise;
 *   <li>held back, moves both clusters' frontiers to {@code t}, and their member frontiers too
 *       when attractive.
 * </ul>
 * A settled operation changes only what no unknown edge before it could change (the members of
 * a member-exact cluster, the exclusions of a settled one), so it commutes with every unknown
 * edge before it: the whole-graph run equals applying the settled operations first
 * (contracting the part) and then running the rest in the same order. The next level therefore gets the contracted graph: held-back inner edges and leaving
 * edges, ends relabelled to the smallest provisional id of their cluster, inner edges reduced
 * to the first attractive and the first repulsive edge per cluster pair (only those can decide
 * anything). A cluster whose frontier never moved (no edge leaves it, none of its edges was held
 * back) is complete: every edge it has was settled, it can join nothing more, and an exclusion
 * with it constrains nobody else, so it and its edges leave the graph. A part that holds every
 * end settles everything: the Mutex Watershed itself.
 *
 * <p>O(m) per varying key byte for m edges (the radix sorts of {@link EdgeSort} and
 * {@link PartNodes}; input already in the order, as {@link #gather} gives it above level 1, is
 * not sorted again), union-find and exclusion sets near O(m α(m)) otherwise; about 120 bytes per
 * edge while it runs.
 */
public final class MutexPartSolver implements PartSolver {

  @Override
  public String name() {
    return "mutex-watershed";
  }

  /**
   * Merges the outputs in the order each is in, the Mutex Watershed's ({@link #solve} hands up
   * edges in the order it takes them): no sort here, and {@link #solve} finds its input in
   * order. O(m log k) for m edges from k parts.
   */
  @Override
  public SolveEdges gather(List<SolveEdges> outputs) {
    SolveEdges all = SolveEdges.concatenation(outputs);
    int[] runEnds = new int[outputs.size()];
    int end = 0;
    for (int r = 0; r < runEnds.length; r++) {
      end += outputs.get(r).size();
      runEnds[r] = end;
    }
    int[] merged = MutexOrder.merged(all, runEnds);
    return merged != null ? all.joinCopies(merged) : all.joinCopies();
  }

  @Override
  public PartResult solve(SolveEdges edges, LongPredicate inside) {
    int m = edges.size();
    PartNodes part = PartNodes.of(m, edges::u, edges::v, inside);
    long[] nodes = part.nodes();
    int n = nodes.length;
    int[] order = MutexOrder.sorted(edges);
    // the ends and signs in the order's positions, gathered once: the passes below read them in
    // order instead of at random
    int[] endU = part.iu();
    int[] endV = part.iv();
    int[] iu = new int[m];
    int[] iv = new int[m];
    boolean[] attractiveAt = new boolean[m];
    for (int t = 0; t < m; t++) {
      int e = order[t];
      iu[t] = endU[e];
      iv[t] = endV[e];
      attractiveAt[t] = edges.weight(e) > 0;
    }
    int innerRepulsive = 0;
    for (int t = 0; t < m; t++) {
      if (iu[t] >= 0 && iv[t] >= 0 && !attractiveAt[t]) {
        innerRepulsive++;
      }
    }
    Clusters clusters = new Clusters(n, innerRepulsive);
    for (int t = 0; t < m; t++) {
      if (iu[t] < 0 || iv[t] < 0) {
        clusters.unknownAt(iu[t] >= 0 ? iu[t] : iv[t], t, attractiveAt[t]);
      }
    }
    long decided = 0;
    long heldBack = 0;
    for (int t = 0; t < m; t++) {
      if (iu[t] < 0 || iv[t] < 0) {
        continue;
      }
      int a = clusters.find(iu[t]);
      int b = clusters.find(iv[t]);
      boolean openA = clusters.memberFrontier(a) < t;
      boolean openB = clusters.memberFrontier(b) < t;
      boolean attractive = attractiveAt[t];
      if (a == b || clusters.exclusive(a, b)) {
        decided++;
      } else if (!attractive) {
        if (openA && openB) {
          heldBack++;
          clusters.unknownAt(a, t, false);
          clusters.unknownAt(b, t, false);
        } else {
          decided++;
          clusters.exclude(a, b);
        }
      } else if (!openA && !openB) {
        decided++;
        clusters.join(a, b);
      } else if (openA && openB || !clusters.settled(openA ? b : a, t)) {
        heldBack++;
        clusters.unknownAt(a, t, true);
        clusters.unknownAt(b, t, true);
      } else {
        decided++;
        clusters.join(a, b);
      }
    }
    int[] repAt = representatives(clusters, n);
    boolean[] complete = new boolean[n];
    for (int i = 0; i < n; i++) {
      complete[i] = clusters.frontier(clusters.find(i)) == Integer.MAX_VALUE;
    }
    return result(edges, order, nodes, iu, iv, attractiveAt, repAt, complete, decided,
        heldBack);
  }

  /**
   * Per node, the index of its cluster's representative, the cluster's first node: the smallest
   * provisional id of the cluster, as {@code nodes} is ascending. O(n α(n)).
   */
  private static int[] representatives(Clusters clusters, int n) {
    int[] firstOfRoot = new int[n];
    Arrays.fill(firstOfRoot, -1);
    int[] repAt = new int[n];
    for (int i = 0; i < n; i++) {
      int r = clusters.find(i);
      if (firstOfRoot[r] < 0) {
        firstOfRoot[r] = i;
      }
      repAt[i] = firstOfRoot[r];
    }
    return repAt;
  }

  /**
   * The edges handed up: leaving edges with their inside end relabelled, and per pair of
   * clusters that are neither the same nor complete its first attractive and first repulsive
   * inner edge ({@link FirstOfPair}). O(m + n).
   *
   * @param iu per position {@code t} of the order, the index of edge {@code order[t]}'s first
   *     end in {@code nodes}, -1 when outside ({@code iv}: its second end)
   * @param attractiveAt per position, whether its edge is attractive
   */
  private static PartResult result(SolveEdges edges, int[] order, long[] nodes, int[] iu,
      int[] iv, boolean[] attractiveAt, int[] repAt, boolean[] complete, long decided,
      long heldBack) {
    int m = order.length;
    int[] candidateAt = new int[m];
    int[] clusterU = new int[m];
    int[] clusterV = new int[m];
    boolean[] attractive = new boolean[m];
    int k = 0;
    for (int t = 0; t < m; t++) {
      int at = iu[t];
      int bt = iv[t];
      if (at >= 0 && bt >= 0 && repAt[at] != repAt[bt] && !complete[at] && !complete[bt]) {
        candidateAt[k] = t;
        clusterU[k] = repAt[at];
        clusterV[k] = repAt[bt];
        attractive[k++] = attractiveAt[t];
      }
    }
    boolean[] first = FirstOfPair.firsts(clusterU, clusterV, attractive, k, nodes.length);
    int[] kept = new int[m];
    long[] keptU = new long[m];
    long[] keptV = new long[m];
    int count = 0;
    int c = 0;
    for (int t = 0; t < m; t++) {
      int at = iu[t];
      int bt = iv[t];
      if (at >= 0 && bt >= 0 && !(c < k && candidateAt[c] == t && first[c++])) {
        continue;
      }
      int e = order[t];
      kept[count] = e;
      keptU[count] = at >= 0 ? nodes[repAt[at]] : edges.u(e);
      keptV[count++] = bt >= 0 ? nodes[repAt[bt]] : edges.v(e);
    }
    SolveEdges remaining = SolveEdges.gathered(edges, kept, count, keptU, keptV);
    long[] rep = new long[nodes.length];
    for (int i = 0; i < rep.length; i++) {
      rep[i] = nodes[repAt[i]];
    }
    return PartResult.of(nodes, rep, remaining, decided, heldBack);
  }

  /**
   * Union-find with exclusion sets and two frontiers per root. A node's parent, frontiers, list
   * length and list head lie side by side in one record: the sweep reads them together for
   * nodes in no useful order, and in a part above level 1 (millions of nodes) each array of its
   * own cost a cache miss of its own.
   */
  private static final class Clusters {
    private static final int PARENT = 0;
    private static final int FRONTIER = 1;
    private static final int MEMBER_FRONTIER = 2;
    private static final int LENGTH = 3;
    private static final int HEAD = 4;
    private static final int FIELDS = 5;
    private final int[] record;
    private int[] entryNode;
    private int[] entryNext;
    private int entries;
    /** Pairs of roots made exclusive ({@link PairSet#pair}); a join leaves stale pairs. */
    private final PairSet exclusions;

    /**
     * {@code n} singletons, none open. The exclusion set starts at a quarter of the
     * {@code repulsive} inner edges and grows: on the benchmark's graphs 20 to 50 % of them make
     * an exclusion, and zeroing a table for all of them took 7 % of a part's solve.
     */
    Clusters(int n, int repulsive) {
      record = new int[Math.multiplyExact(n, FIELDS)];
      for (int i = 0; i < n; i++) {
        record[i * FIELDS + PARENT] = i;
        record[i * FIELDS + FRONTIER] = Integer.MAX_VALUE;
        record[i * FIELDS + MEMBER_FRONTIER] = Integer.MAX_VALUE;
        record[i * FIELDS + HEAD] = -1;
      }
      entryNode = new int[16];
      entryNext = new int[16];
      exclusions = new PairSet(repulsive / 4);
    }

    /** The root of {@code x}, halving the path on the way ({@link UnionFind#root}). */
    int find(int x) {
      int[] r = record;
      while (r[x * FIELDS + PARENT] != x) {
        int grandparent = r[r[x * FIELDS + PARENT] * FIELDS + PARENT];
        r[x * FIELDS + PARENT] = grandparent;
        x = grandparent;
      }
      return x;
    }

    /** Root {@code r}'s frontier: the first position an edge unknown to the part touched it. */
    int frontier(int r) {
      return record[r * FIELDS + FRONTIER];
    }

    /**
     * Root {@code r}'s member frontier: the first position an attractive edge unknown to the
     * part touched it (before it, its members are those of the whole-graph run).
     */
    int memberFrontier(int r) {
      return record[r * FIELDS + MEMBER_FRONTIER];
    }

    /**
     * Records an edge unknown to the part (leaving it, or held back) touching root {@code r} at
     * position {@code t}: it moves the frontier, and the member frontier if it is attractive.
     */
    void unknownAt(int r, int t, boolean attractive) {
      int at = r * FIELDS;
      record[at + FRONTIER] = Math.min(record[at + FRONTIER], t);
      if (attractive) {
        record[at + MEMBER_FRONTIER] = Math.min(record[at + MEMBER_FRONTIER], t);
      }
    }

    /**
     * Whether root {@code r} is settled at position {@code t} (no unknown edge touched it
     * before) and every cluster exclusive with it keeps its members there.
     */
    boolean settled(int r, int t) {
      if (frontier(r) < t) {
        return false;
      }
      for (int entry = record[r * FIELDS + HEAD]; entry >= 0; entry = entryNext[entry]) {
        if (memberFrontier(find(entryNode[entry])) < t) {
          return false;
        }
      }
      return true;
    }

    /**
     * Whether roots {@code a} and {@code b} are exclusive. A root without exclusions is in no
     * pair of the set: on the benchmark's graphs that answers two in five calls without a
     * lookup in the set's table.
     */
    boolean exclusive(int a, int b) {
      return record[a * FIELDS + LENGTH] > 0 && record[b * FIELDS + LENGTH] > 0
          && exclusions.contains(PairSet.pair(a, b));
    }

    void exclude(int a, int b) {
      if (exclusions.add(PairSet.pair(a, b))) {
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
      entryNext[entries] = record[owner * FIELDS + HEAD];
      record[owner * FIELDS + HEAD] = entries++;
      record[owner * FIELDS + LENGTH]++;
    }

    /** Joins roots {@code a} and {@code b}; the shorter exclusion list moves. */
    void join(int a, int b) {
      int big = record[a * FIELDS + LENGTH] >= record[b * FIELDS + LENGTH] ? a : b;
      int small = big == a ? b : a;
      record[small * FIELDS + PARENT] = big;
      record[big * FIELDS + FRONTIER] = Math.min(frontier(big), frontier(small));
      record[big * FIELDS + MEMBER_FRONTIER] =
          Math.min(memberFrontier(big), memberFrontier(small));
      for (int entry = record[small * FIELDS + HEAD]; entry >= 0; entry = entryNext[entry]) {
        int partner = find(entryNode[entry]);
        if (exclusions.add(PairSet.pair(big, partner))) {
          append(big, partner);
        }
      }
      record[small * FIELDS + HEAD] = -1;
      record[small * FIELDS + LENGTH] = 0;
    }
  }
}
