package org.sunder.blockwise.partition.agglomeration;

import java.util.Arrays;
import org.sunder.blockwise.partition.Clustering;

/**
 * The merges of an agglomeration in the order they happened, numbered as
 * {@code scipy.cluster.hierarchy.linkage} does: nodes are clusters {@code 0..nodeCount-1}, merge
 * {@code i} joins clusters {@code first[i] < second[i]} into the new cluster {@code nodeCount + i}
 * at linkage value {@code linkage[i]}. Arrays are wrapped.
 */
public record MergeTree(int nodeCount, int[] first, int[] second, double[] linkage) {

  /** A tree of no merges. */
  public static MergeTree empty(int nodeCount) {
    return new MergeTree(nodeCount, new int[0], new int[0], new double[0]);
  }

  public int mergeCount() {
    return first.length;
  }

  /** The clustering after the first {@code merges} merges (any stopping point). O(n + merges). */
  public Clustering cut(int merges) {
    if (merges < 0 || merges > first.length) {
      throw new IllegalArgumentException("merges = " + merges + " outside [0, " + first.length
          + "]");
    }
    int[] parent = new int[nodeCount + merges];
    for (int i = 0; i < parent.length; i++) {
      parent[i] = i;
    }
    for (int i = 0; i < merges; i++) {
      parent[first[i]] = nodeCount + i;
      parent[second[i]] = nodeCount + i;
    }
    int[] idOf = new int[parent.length];
    Arrays.fill(idOf, -1);
    int[] clusterOf = new int[nodeCount];
    int next = 0;
    for (int v = 0; v < nodeCount; v++) {
      int r = v;
      while (parent[r] != r) {
        r = parent[r];
      }
      for (int x = v; parent[x] != x; ) {
        int up = parent[x];
        parent[x] = r;
        x = up;
      }
      if (idOf[r] < 0) {
        idOf[r] = next++;
      }
      clusterOf[v] = idOf[r];
    }
    return new Clustering(clusterOf, next);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof MergeTree t && nodeCount == t.nodeCount && Arrays.equals(first, t.first)
        && Arrays.equals(second, t.second) && Arrays.equals(linkage, t.linkage);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(first) * 31 + Arrays.hashCode(second) + nodeCount;
  }

  @Override
  public String toString() {
    return "MergeTree[" + nodeCount + " nodes, " + first.length + " merges]";
  }
}
