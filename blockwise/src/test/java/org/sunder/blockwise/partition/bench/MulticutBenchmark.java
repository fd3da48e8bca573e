package org.sunder.blockwise.partition.bench;

import java.util.Arrays;
import java.util.Locale;
import java.util.Random;
import org.sunder.blockwise.partition.multicut.Multicut;
import org.sunder.blockwise.partition.multicut.MulticutResult;

/**
 * The multicut heuristics on graphs shaped like a fragment graph: nodes on a 3D lattice grouped
 * into objects of 4 × 4 × 4 nodes, each node joined to its six neighbours and to a few random
 * nodes within three steps; a pair inside an object costs {@code +2 + N(0, 1.5)}, a pair across
 * objects {@code −1 + N(0, 1.5)}, so that a good partition is near the objects and the noise
 * leaves the heuristics real work. Prints
 * greedy additive edge contraction and Kernighan–Lin refinement in ns per edge, each also as a
 * ratio to sorting the edge costs once ({@code Arrays.sort}), measured in the same run, so
 * figures from different machines compare. One thread; the best of three repetitions.
 *
 * <p>Arguments (optional): lattice side (default 100, i.e. 10^6 nodes), random extra edges per
 * node (default 2), seed (default 1). Kernighan–Lin refinement, which the default method no
 * longer runs and which takes minutes per repetition at the default size, only with
 * {@code -DkernighanLin=true}.
 */
public final class MulticutBenchmark {
  private MulticutBenchmark() {}

  private static double cost(int i, int j, int side, Random random) {
    boolean together = object(i, side) == object(j, side);
    return (together ? 2 : -1) + 1.5 * random.nextGaussian();
  }

  private static int object(int i, int side) {
    int x = i % side;
    int y = i / side % side;
    int z = i / (side * side);
    return x / 4 + side * (y / 4 + side * (z / 4));
  }

  public static void main(String[] args) {
    int side = args.length > 0 ? Integer.parseInt(args[0]) : 100;
    int extra = args.length > 1 ? Integer.parseInt(args[1]) : 2;
    long seed = args.length > 2 ? Long.parseLong(args[2]) : 1;
    boolean kernighanLin = Boolean.getBoolean("kernighanLin");
    Random random = new Random(seed);
    int n = side * side * side;
    int m = 3 * n + extra * n;
    int[] u = new int[m];
    int[] v = new int[m];
    double[] w = new double[m];
    int e = 0;
    for (int z = 0; z < side; z++) {
      for (int y = 0; y < side; y++) {
        for (int x = 0; x < side; x++) {
          int i = x + side * (y + side * z);
          int[] next = {x + 1 < side ? i + 1 : -1, y + 1 < side ? i + side : -1,
              z + 1 < side ? i + side * side : -1};
          for (int j : next) {
            if (j >= 0) {
              u[e] = i;
              v[e] = j;
              w[e++] = cost(i, j, side, random);
            }
          }
          for (int k = 0; k < extra; k++) {
            int dx = Math.min(side - 1, Math.max(0, x + random.nextInt(7) - 3));
            int dy = Math.min(side - 1, Math.max(0, y + random.nextInt(7) - 3));
            int dz = Math.min(side - 1, Math.max(0, z + random.nextInt(7) - 3));
            int j = dx + side * (dy + side * dz);
            if (j != i) {
              u[e] = i;
              v[e] = j;
              w[e++] = cost(i, j, side, random);
            }
          }
        }
      }
    }
    u = Arrays.copyOf(u, e);
    v = Arrays.copyOf(v, e);
    w = Arrays.copyOf(w, e);
    System.out.printf(Locale.ROOT, "multicut benchmark: %d nodes, %d edges, seed %d%n", n, e,
        seed);
    double sortBest = Double.MAX_VALUE;
    double greedyBest = Double.MAX_VALUE;
    double refineBest = Double.MAX_VALUE;
    MulticutResult greedy = null;
    MulticutResult refined = null;
    for (int rep = 0; rep < 3; rep++) {
      double[] copy = w.clone();
      long t0 = System.nanoTime();
      Arrays.sort(copy);
      long t1 = System.nanoTime();
      greedy = Multicut.greedyAdditive(n, u, v, w);
      long t2 = System.nanoTime();
      refined = kernighanLin ? Multicut.refine(n, u, v, w, greedy.labels()) : null;
      long t3 = System.nanoTime();
      sortBest = Math.min(sortBest, (t1 - t0) / (double) e);
      greedyBest = Math.min(greedyBest, (t2 - t1) / (double) e);
      refineBest = Math.min(refineBest, (t3 - t2) / (double) e);
    }
    System.out.printf(Locale.ROOT, "  sort of the costs (baseline): %.1f ns/edge%n", sortBest);
    System.out.printf(Locale.ROOT, "  greedy additive contraction: %.1f ns/edge (%.2f x the sort),"
        + " %d clusters, objective %.1f%n", greedyBest, greedyBest / sortBest,
        greedy.clusterCount(), greedy.objective());
    if (kernighanLin) {
      System.out.printf(Locale.ROOT, "  Kernighan-Lin refinement:    %.1f ns/edge (%.2f x the"
          + " sort), %d clusters, objective %.1f%n", refineBest, refineBest / sortBest,
          refined.clusterCount(), refined.objective());
    }
  }
}
