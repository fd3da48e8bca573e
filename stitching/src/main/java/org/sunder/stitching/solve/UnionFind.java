package org.sunder.stitching.solve;

/** A union-find forest kept as a parent array: a node is a root when it is its own parent. */
final class UnionFind {
  private UnionFind() {}

  /** The root of {@code x}, halving the path on the way: amortised near O(α(n)). */
  static int root(int[] parent, int x) {
    while (parent[x] != x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }
}
