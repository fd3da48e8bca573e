package org.sunder.blockwise.collections;

/** A union-find forest kept as a parent array: a node is a root when it is its own parent. */
public final class UnionFind {
  private UnionFind() {}

  /** The root of {@code x}, halving the path on the way: amortised near O(α(n)). */
  public static int root(int[] parent, int x) {
    while (parent[x] != x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }

  /** A forest of {@code n} single nodes. */
  public static int[] singletons(int n) {
    int[] parent = new int[n];
    for (int i = 0; i < n; i++) {
      parent[i] = i;
    }
    return parent;
  }

  /** Joins the trees of {@code a} and {@code b}, the smaller root becoming the root of both. */
  public static void union(int[] parent, int a, int b) {
    int x = root(parent, a);
    int y = root(parent, b);
    parent[Math.max(x, y)] = Math.min(x, y);
  }
}
