package org.sunder.blockwise.partition.mutex;

import java.util.Arrays;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;

/**
 * The state of the Mutex Watershed ("The Mutex Watershed and its Objective: Efficient,
 * Parameter-Free Graph Partitioning", TPAMI 2020): union-find over nodes (path halving, union by
 * size) plus mutual-exclusion constraints between clusters.
 *
 * <p>Each cluster owns a list of constraint entries (a node inside each constrained partner
 * cluster) and a set holds every constrained pair of list owners, so a check is one hash lookup.
 * On a union the shorter list is walked and moved into the longer one, adding its pairs under
 * the longer list's owner (smaller into larger: every entry moves {@code O(log m)} times). The
 * pairs of the absorbed owner stay in the set: that owner is never asked about again, and
 * leaving them costs less than deleting them.
 *
 * <p>Edges come in weight order, so roots are visited at random: what a root needs (size, list
 * owner, list length, list head) sits in one 16-byte record, one cache line per root visited.
 * Not thread-safe.
 */
final class MutexClusters {
  private static final int SIZE = 0;
  private static final int OWNER = 1;
  private static final int LENGTH = 2;
  private static final int HEAD = 3;
  private final int[] parent;
  /** Per root {@code r}: {@code record[4 r + SIZE | OWNER | LENGTH | HEAD]}. */
  private final int[] record;
  private int[] entryNode;
  private int[] entryNext;
  private int entries;
  private final PairSet pairs;
  /**
   * The pair last found in or added to {@link #pairs} (pairs are never removed): consecutive
   * edges of one offset in a tie often join the same two clusters, and this spares their lookup.
   */
  private long lastPair = -1;
  /** 1 for an open node; null unless merges are held back. */
  private byte[] open;
  /** Union-find of the merges made by edges between two nodes that are not open. */
  private int[] pieceParent;

  MutexClusters(int nodeCount) {
    parent = new int[nodeCount];
    record = new int[4 * nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      parent[i] = i;
      record[4 * i + SIZE] = 1;
      record[4 * i + OWNER] = i;
      record[4 * i + HEAD] = -1;
    }
    int guess = Math.max(16, nodeCount / 4);
    entryNode = new int[guess];
    entryNext = new int[guess];
    pairs = new PairSet(guess / 2);
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
    long pair = PairSet.pair(record[4 * ru + OWNER], record[4 * rv + OWNER]);
    if (pair != lastPair && pairs.add(pair)) {
      append(ru, rv);
      append(rv, ru);
    }
    lastPair = pair;
  }

  private boolean constrained(int ru, int rv) {
    int[] r = record;
    if (r[4 * ru + LENGTH] == 0 || r[4 * rv + LENGTH] == 0) {
      return false;
    }
    long pair = PairSet.pair(r[4 * ru + OWNER], r[4 * rv + OWNER]);
    if (pair == lastPair) {
      return true;
    }
    if (pairs.contains(pair)) {
      lastPair = pair;
      return true;
    }
    return false;
  }

  private void union(int ru, int rv) {
    int[] r = record;
    int winner = r[4 * ru + SIZE] >= r[4 * rv + SIZE] ? ru : rv;
    int loser = winner == ru ? rv : ru;
    parent[loser] = winner;
    r[4 * winner + SIZE] += r[4 * loser + SIZE];
    int large = r[4 * ru + LENGTH] >= r[4 * rv + LENGTH] ? ru : rv;
    int small = large == ru ? rv : ru;
    int owner = r[4 * large + OWNER];
    int head = r[4 * large + HEAD];
    int length = r[4 * large + LENGTH];
    for (int e = r[4 * small + HEAD]; e >= 0; ) {
      int following = entryNext[e];
      int partner = r[4 * find(entryNode[e]) + OWNER];
      if (pairs.add(PairSet.pair(owner, partner))) {
        entryNext[e] = head;
        head = e;
        length++;
      }
      e = following;
    }
    r[4 * winner + OWNER] = owner;
    r[4 * winner + HEAD] = head;
    r[4 * winner + LENGTH] = length;
  }

  /** Adds a constraint entry for {@code node} to the list of root {@code root}. */
  private void append(int root, int node) {
    if (entries == entryNode.length) {
      int capacity = entries + (entries >> 1) + 16;
      entryNode = Arrays.copyOf(entryNode, capacity);
      entryNext = Arrays.copyOf(entryNext, capacity);
    }
    entryNode[entries] = node;
    entryNext[entries] = record[4 * root + HEAD];
    record[4 * root + HEAD] = entries;
    record[4 * root + LENGTH]++;
    entries++;
  }

  /**
   * The final segmentation: clusters numbered from 1 in order of first node, 0 where
   * {@code mask} is 0. Uses the root records as scratch, so call it once, last.
   */
  Segmentation segmentation(byte[] maskOrNull) {
    int[] labelOfRoot = record;
    Arrays.fill(labelOfRoot, 0);
    int[] labels = new int[parent.length];
    int next = 0;
    for (int i = 0; i < labels.length; i++) {
      if (maskOrNull != null && maskOrNull[i] == 0) {
        continue;
      }
      int r = find(i);
      if (labelOfRoot[r] == 0) {
        labelOfRoot[r] = ++next;
      }
      labels[i] = labelOfRoot[r];
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
