package org.sunder.blockwise.partition;

import java.util.Arrays;

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
 * leaving them costs less than deleting them. Not thread-safe.
 */
final class MutexClusters {
  private final int[] parent;
  private final int[] size;
  private final int[] owner;
  private final int[] head;
  private final int[] listSize;
  private int[] entryNode;
  private int[] entryNext;
  private int entries;
  private final PairSet pairs;

  MutexClusters(int nodeCount) {
    parent = new int[nodeCount];
    size = new int[nodeCount];
    owner = new int[nodeCount];
    head = new int[nodeCount];
    listSize = new int[nodeCount];
    for (int i = 0; i < nodeCount; i++) {
      parent[i] = i;
      owner[i] = i;
    }
    Arrays.fill(size, 1);
    Arrays.fill(head, -1);
    int guess = Math.max(16, nodeCount / 4);
    entryNode = new int[guess];
    entryNext = new int[guess];
    pairs = new PairSet(guess / 2);
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
    }
  }

  /** Processes a repulsive edge: constrains the clusters apart unless they are one already. */
  void repel(int u, int v) {
    int ru = find(u);
    int rv = find(v);
    if (ru == rv) {
      return;
    }
    int a = owner[ru];
    int b = owner[rv];
    if (pairs.add(PairSet.pair(a, b))) {
      append(a, rv);
      append(b, ru);
    }
  }

  private boolean constrained(int ru, int rv) {
    int a = owner[ru];
    int b = owner[rv];
    return listSize[a] != 0 && listSize[b] != 0 && pairs.contains(PairSet.pair(a, b));
  }

  private void union(int ru, int rv) {
    int winner = size[ru] >= size[rv] ? ru : rv;
    int loser = winner == ru ? rv : ru;
    parent[loser] = winner;
    size[winner] += size[loser];
    int a = owner[ru];
    int b = owner[rv];
    int large = listSize[a] >= listSize[b] ? a : b;
    int small = large == a ? b : a;
    owner[winner] = large;
    for (int e = head[small]; e >= 0; ) {
      int following = entryNext[e];
      int partner = owner[find(entryNode[e])];
      if (pairs.add(PairSet.pair(large, partner))) {
        entryNext[e] = head[large];
        head[large] = e;
        listSize[large]++;
      }
      e = following;
    }
    head[small] = -1;
    listSize[small] = 0;
  }

  private void append(int list, int node) {
    if (entries == entryNode.length) {
      int capacity = entries + (entries >> 1) + 16;
      entryNode = Arrays.copyOf(entryNode, capacity);
      entryNext = Arrays.copyOf(entryNext, capacity);
    }
    entryNode[entries] = node;
    entryNext[entries] = head[list];
    head[list] = entries;
    listSize[list]++;
    entries++;
  }

  /**
   * The final segmentation: clusters numbered from 1 in order of first node, 0 where
   * {@code mask} is 0. Uses the constraint arrays as scratch, so call it once, last.
   */
  Segmentation segmentation(byte[] maskOrNull) {
    int[] labelOfRoot = head;
    java.util.Arrays.fill(labelOfRoot, 0);
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

  /** Root of every node, written into a fresh array. */
  int[] roots() {
    int[] r = new int[parent.length];
    for (int i = 0; i < r.length; i++) {
      r[i] = find(i);
    }
    return r;
  }
}
