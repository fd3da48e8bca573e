package org.sunder.blockwise.partition;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.SignedGraph;

/** Seeded random inputs shared by the partition tests. */
public final class PartitionFixtures {
  public static final Offsets OFFSETS = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0},
      new int[] {0, 0, -1}, new int[] {-3, 0, 0}, new int[] {0, 3, 0}, new int[] {2, -2, -1});

  private PartitionFixtures() {}

  /** A random graph: a spanning path (connected) plus random extra edges, distinct weights. */
  public static SignedGraph randomGraph(Random random, int nodes, int extraEdges, double repulsiveShare) {
    List<int[]> pairs = new ArrayList<>();
    Set<Long> seen = new HashSet<>();
    int[] order = permutation(random, nodes);
    for (int i = 1; i < nodes; i++) {
      addPair(pairs, seen, order[i - 1], order[i]);
    }
    int limit = Math.min(nodes - 1 + extraEdges, nodes * (nodes - 1) / 2);
    while (pairs.size() < limit) {
      addPair(pairs, seen, random.nextInt(nodes), random.nextInt(nodes));
    }
    int m = pairs.size();
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    for (int e = 0; e < m; e++) {
      u[e] = pairs.get(e)[0];
      v[e] = pairs.get(e)[1];
      double magnitude = 0.01 + random.nextDouble();
      w[e] = random.nextDouble() < repulsiveShare ? -magnitude : magnitude;
    }
    return SignedGraph.of(nodes, u, v, w);
  }

  private static void addPair(List<int[]> pairs, Set<Long> seen, int a, int b) {
    if (a == b) {
      return;
    }
    long key = (long) Math.min(a, b) << 32 | Math.max(a, b);
    if (seen.add(key)) {
      pairs.add(new int[] {a, b});
    }
  }

  public static int[] permutation(Random random, int n) {
    int[] p = new int[n];
    for (int i = 0; i < n; i++) {
      p[i] = i;
    }
    for (int i = n - 1; i > 0; i--) {
      int j = random.nextInt(i + 1);
      int t = p[i];
      p[i] = p[j];
      p[j] = t;
    }
    return p;
  }

  /** The same graph with its edges listed in a shuffled order and ends swapped at random. */
  public static SignedGraph shuffled(SignedGraph g, Random random) {
    int m = g.edgeCount();
    int[] p = permutation(random, m);
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    for (int i = 0; i < m; i++) {
      boolean swap = random.nextBoolean();
      u[i] = swap ? g.edgeV(p[i]) : g.edgeU(p[i]);
      v[i] = swap ? g.edgeU(p[i]) : g.edgeV(p[i]);
      w[i] = g.weight(p[i]);
    }
    return SignedGraph.of(g.nodeCount(), u, v, w);
  }

  /** Random float affinities on a box, optionally with a random mask. */
  public static AffinityBlock randomBlock(Random random, int[] shape, boolean masked) {
    int n = shape[0] * shape[1] * shape[2];
    float[] a = new float[n * OFFSETS.count()];
    for (int i = 0; i < a.length; i++) {
      a[i] = random.nextFloat();
    }
    byte[] mask = null;
    if (masked) {
      mask = new byte[n];
      for (int i = 0; i < n; i++) {
        mask[i] = (byte) (random.nextInt(6) == 0 ? 0 : 1);
      }
    }
    return AffinityBlock.ofFloats(a, shape, new long[] {5, 6, 7}, OFFSETS, mask);
  }

  /** True when every voxel has a label in 1..count (0 only where masked) and all are used. */
  public static boolean isValid(Segmentation s, byte[] mask) {
    boolean[] used = new boolean[s.segmentCount() + 1];
    int expectNext = 1;
    for (int i = 0; i < s.labels().length; i++) {
      int l = s.labels()[i];
      boolean inside = mask == null || mask[i] != 0;
      if (inside != (l != 0) || l > s.segmentCount()) {
        return false;
      }
      if (l != 0 && !used[l]) {
        if (l != expectNext++) {
          return false;
        }
        used[l] = true;
      }
    }
    return expectNext == s.segmentCount() + 1;
  }
}
