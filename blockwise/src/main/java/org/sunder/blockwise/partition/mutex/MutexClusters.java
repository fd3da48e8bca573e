package org.sunder.blockwise.partition.mutex;

import org.sunder.blockwise.collections.IntSetPool;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;

/**
 * The state of the Mutex Watershed ("The Mutex Watershed and its Objective: Efficient,
 * Parameter-Free Graph Partitioning", TPAMI 2020): union-find over nodes (path halving) plus
 * mutual-exclusion constraints between clusters.
 *
 * <p>Each root owns the exact set of the roots it is constrained against ({@link IntSetPool}),
 * kept symmetric, so a check, and a repulsive edge's test for a constraint already there, is
 * one lookup in the smaller of the two sets. On a union the root with the smaller set is
 * absorbed: its partners are walked, each renamed to the new root in its own set, and added to
 * the new root's set: {@code O(min(|A|, |B|))} expected per union, smaller into larger. A first
 * pass only reads the partners' records and home slots, so their cache misses overlap instead
 * of coming one after another. Duplicates vanish on the way, so the sets hold only live
 * constraints. Union by set size (ties by cluster size) keeps the walk small; path halving
 * alone then keeps a find {@code O(log n)} amortized. The size of a cluster sits in its root's
 * set record (the pool's tag), one cache line per root visited, beside up to two partners.
 * Memory: 20 bytes per node plus the pool's tables (none for a root with at most two partners;
 * up to about 22 bytes per live constraint). Not thread-safe.
 */
final class MutexClusters {
  private final int[] parent;
  /** Per root: its partner roots; the tag holds the cluster size. */
  private final IntSetPool partners;
  /** Sum of what {@link IntSetPool#prefetch} returned; read by nothing. */
  private int prefetched;
  /** Scratch for the members of an absorbed set. */
  private int[] moved = new int[16];
  /** 1 for an open node; null unless merges are held back. */
  private byte[] open;
  /** Union-find of the merges made by edges between two nodes that are not open. */
  private int[] pieceParent;

  MutexClusters(int nodeCount) {
    parent = new int[nodeCount];
    partners = new IntSetPool(nodeCount, 4 * nodeCount);
    for (int i = 0; i < nodeCount; i++) {
      parent[i] = i;
      partners.setTag(i, 1);
    }
  }

  /**
   * Holds back, from {@link #pieceRoots()}, every merge made by an edge with an open end
   * ({@code open[node] != 0}), so that open nodes stay single and the pieces are the clusters'
   * merge forests cut at the open nodes (see {@link SettledPartition}). Call before the first
   * edge; {@code openNodes} is not copied.
   */
  void holdBack(byte[] openNodes) {
    open = openNodes;
    pieceParent = new int[parent.length];
    for (int i = 0; i < pieceParent.length; i++) {
      pieceParent[i] = i;
    }
  }

  int find(int x) {
    int[] p = parent;
    while (p[x] != x) {
      int up = p[p[x]];
      p[x] = up;
      x = up;
    }
    return x;
  }

  /** Processes an attractive edge: joins the clusters unless they are constrained apart. */
  void attract(int u, int v) {
    int ru = find(u);
    int rv = find(v);
    if (ru != rv && !constrained(ru, rv)) {
      union(ru, rv);
      if (open != null && open[u] == 0 && open[v] == 0) {
        pieceParent[findPiece(u)] = findPiece(v);
      }
    }
  }

  /** Processes a repulsive edge: constrains the clusters apart unless they are one already. */
  void repel(int u, int v) {
    int ru = find(u);
    int rv = find(v);
    if (ru == rv) {
      return;
    }
    // the smaller set first: a constraint already there is found there
    IntSetPool sets = partners;
    int small = sets.size(ru) <= sets.size(rv) ? ru : rv;
    int large = small == ru ? rv : ru;
    if (sets.add(small, large)) {
      sets.add(large, small);
    }
  }

  private boolean constrained(int ru, int rv) {
    int cu = partners.size(ru);
    int cv = partners.size(rv);
    if (cu == 0 || cv == 0) {
      return false;
    }
    return cu <= cv ? partners.contains(ru, rv) : partners.contains(rv, ru);
  }

  /** Joins two unconstrained roots; the root with fewer partners is absorbed. */
  private void union(int ru, int rv) {
    IntSetPool sets = partners;
    int cu = sets.size(ru);
    int cv = sets.size(rv);
    int winner = cu > cv || (cu == cv && sets.tag(ru) >= sets.tag(rv)) ? ru : rv;
    int loser = winner == ru ? rv : ru;
    parent[loser] = winner;
    sets.setTag(winner, sets.tag(winner) + sets.tag(loser));
    int count = sets.size(loser);
    if (count == 0) {
      return;
    }
    if (moved.length < count) {
      moved = new int[Math.max(count, 2 * moved.length)];
    }
    int[] m = moved;
    sets.copyTo(loser, m);
    sets.clear(loser);
    if (count > 1) {
      // the partners' records and tables fetched together, not one miss after another
      int ignored = 0;
      for (int i = 0; i < count; i++) {
        ignored += sets.prefetch(m[i], loser);
      }
      prefetched += ignored;
    }
    for (int i = 0; i < count; i++) {
      int x = m[i];
      sets.remove(x, loser);
      if (sets.add(x, winner)) {
        sets.add(winner, x);
      }
    }
  }

  /**
   * The final segmentation: clusters numbered from 1 in order of first node, 0 where
   * {@code mask} is 0. Uses the cluster sizes as scratch, so call it once, last.
   */
  Segmentation segmentation(byte[] maskOrNull) {
    IntSetPool labelOfRoot = partners;
    for (int i = 0; i < parent.length; i++) {
      labelOfRoot.setTag(i, 0);
    }
    int[] labels = new int[parent.length];
    int next = 0;
    for (int i = 0; i < labels.length; i++) {
      if (maskOrNull != null && maskOrNull[i] == 0) {
        continue;
      }
      int r = find(i);
      if (labelOfRoot.tag(r) == 0) {
        labelOfRoot.setTag(r, ++next);
      }
      labels[i] = labelOfRoot.tag(r);
    }
    return new Segmentation(labels, next);
  }

  private int findPiece(int x) {
    int[] p = pieceParent;
    while (p[x] != x) {
      int up = p[p[x]];
      p[x] = up;
      x = up;
    }
    return x;
  }

  /** Piece root of every node; needs {@link #holdBack}. */
  int[] pieceRoots() {
    int[] r = new int[pieceParent.length];
    for (int i = 0; i < r.length; i++) {
      r[i] = findPiece(i);
    }
    return r;
  }

  /** Root of every node, written into a fresh array. */
  int[] roots() {
    int[] r = new int[parent.length];
    for (int i = 0; i < r.length; i++) {
      r[i] = find(i);
    }
    return r;
  }
}
