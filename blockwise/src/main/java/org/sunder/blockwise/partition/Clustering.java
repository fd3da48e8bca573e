package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * A partition of graph nodes {@code 0..n-1}: {@code clusterOf[node]} in
 * {@code 0..clusterCount-1}, numbered in order of each cluster's smallest node. Wrapped array.
 */
public record Clustering(int[] clusterOf, int clusterCount) {

  /** Renumbers any node-to-representative map (values in {@code [0, n)}) canonically. O(n). */
  public static Clustering fromRepresentatives(int[] representative) {
    int n = representative.length;
    int[] idOf = new int[n];
    Arrays.fill(idOf, -1);
    int[] clusterOf = new int[n];
    int next = 0;
    for (int i = 0; i < n; i++) {
      int r = representative[i];
      if (idOf[r] < 0) {
        idOf[r] = next++;
      }
      clusterOf[i] = idOf[r];
    }
    return new Clustering(clusterOf, next);
  }

  public int nodeCount() {
    return clusterOf.length;
  }

  /** Whether nodes {@code a} and {@code b} are in one cluster. */
  public boolean together(int a, int b) {
    return clusterOf[a] == clusterOf[b];
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Clustering c && clusterCount == c.clusterCount
        && Arrays.equals(clusterOf, c.clusterOf);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(clusterOf);
  }

  @Override
  public String toString() {
    return "Clustering[" + clusterOf.length + " nodes, " + clusterCount + " clusters]";
  }
}
