package org.sunder.blockwise.partition.multicut;

import java.util.function.ToDoubleFunction;

/** Exhaustive search over the partitions of a few nodes, for checks against the optimum. */
public final class SetPartitions {
  private SetPartitions() {}

  /**
   * The least {@code objective} over every partition of {@code n} nodes (labels as restricted
   * growth strings: node 0 in cluster 0, each next node in a used cluster or the next new one);
   * Bell(n) evaluations, so n up to about 10.
   */
  public static double least(int n, ToDoubleFunction<int[]> objective) {
    int[] labels = new int[n];
    int[] max = new int[n];
    double best = Double.POSITIVE_INFINITY;
    while (true) {
      best = Math.min(best, objective.applyAsDouble(labels));
      int i = n - 1;
      while (i > 0 && labels[i] == max[i - 1] + 1) {
        i--;
      }
      if (i <= 0) {
        return best;
      }
      labels[i]++;
      max[i] = Math.max(max[i - 1], labels[i]);
      for (int j = i + 1; j < n; j++) {
        labels[j] = 0;
        max[j] = max[i];
      }
    }
  }
}
