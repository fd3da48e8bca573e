package org.sunder.blockwise.partition;

import java.util.Arrays;
import java.util.Random;

/** A random signed graph without parallel edges: each pair joined with a probability. */
public record RandomSignedGraph(int nodeCount, int[] u, int[] v, double[] w) {

  public static RandomSignedGraph of(Random random, int nodeCount, double density, double bias) {
    int[] u = new int[nodeCount * (nodeCount - 1) / 2];
    int[] v = new int[u.length];
    double[] w = new double[u.length];
    int m = 0;
    for (int a = 0; a < nodeCount; a++) {
      for (int b = a + 1; b < nodeCount; b++) {
        if (random.nextDouble() < density) {
          boolean flip = random.nextBoolean();
          u[m] = flip ? b : a;
          v[m] = flip ? a : b;
          w[m++] = random.nextGaussian() + bias;
        }
      }
    }
    return new RandomSignedGraph(nodeCount, Arrays.copyOf(u, m), Arrays.copyOf(v, m),
        Arrays.copyOf(w, m));
  }

  /** A sparse graph: a random spanning path plus {@code extra} random edges per node. */
  public static RandomSignedGraph sparse(Random random, int nodeCount, int extra, double bias) {
    int m = Math.min(nodeCount - 1 + nodeCount * extra, nodeCount * (nodeCount - 1) / 2);
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    int e = 0;
    for (int i = 1; i < nodeCount; i++) {
      u[e] = i - 1;
      v[e] = i;
      w[e++] = random.nextGaussian() + bias;
    }
    java.util.HashSet<Long> used = new java.util.HashSet<>();
    for (int i = 1; i < nodeCount; i++) {
      used.add((long) (i - 1) << 32 | i);
    }
    while (e < m) {
      int a = random.nextInt(nodeCount);
      int b = random.nextInt(nodeCount);
      if (a == b || !used.add((long) Math.min(a, b) << 32 | Math.max(a, b))) {
        continue;
      }
      u[e] = a;
      v[e] = b;
      w[e++] = random.nextGaussian() + bias;
    }
    return new RandomSignedGraph(nodeCount, u, v, w);
  }

  /** The same edges in a random order. */
  public RandomSignedGraph shuffled(Random random) {
    int m = u.length;
    int[] order = new int[m];
    for (int i = 0; i < m; i++) {
      order[i] = i;
    }
    for (int i = m - 1; i > 0; i--) {
      int j = random.nextInt(i + 1);
      int t = order[i];
      order[i] = order[j];
      order[j] = t;
    }
    int[] su = new int[m];
    int[] sv = new int[m];
    double[] sw = new double[m];
    for (int i = 0; i < m; i++) {
      su[i] = v[order[i]];
      sv[i] = u[order[i]];
      sw[i] = w[order[i]];
    }
    return new RandomSignedGraph(nodeCount, su, sv, sw);
  }
}
