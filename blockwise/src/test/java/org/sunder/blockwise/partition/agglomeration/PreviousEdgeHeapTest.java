package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Comparator;
import java.util.Random;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;

/** {@link PreviousEdgeHeap} against a {@link java.util.TreeSet} with the same order (reference). */
class PreviousEdgeHeapTest {

  @Test
  void popsInTheOrderOfATreeSetUnderRandomChanges() {
    for (long seed = 1; seed <= 20; seed++) {
      Random random = new Random(seed);
      int m = 1 + random.nextInt(300);
      double[] priority = new double[m];
      byte[] tie = new byte[m];
      int[] order = new int[m];
      boolean[] include = new boolean[m];
      for (int e = 0; e < m; e++) {
        randomKeys(random, e, priority, tie, order);
        include[e] = random.nextInt(4) != 0;
      }
      Comparator<Integer> byHeapOrder = Comparator.<Integer>comparingDouble(e -> -priority[e])
          .thenComparingInt(e -> tie[e]).thenComparingInt(e -> order[e])
          .thenComparingInt(e -> e);
      TreeSet<Integer> reference = new TreeSet<>(byHeapOrder);
      PreviousEdgeHeap heap = new PreviousEdgeHeap(priority, tie, order, m);
      heap.build(include);
      for (int e = 0; e < m; e++) {
        if (include[e]) {
          reference.add(e);
        }
      }
      for (int step = 0; step < 5 * m; step++) {
        int e = random.nextInt(m);
        switch (random.nextInt(3)) {
          case 0 -> {
            reference.remove(e);
            randomKeys(random, e, priority, tie, order);
            heap.update(e);
            reference.add(e);
          }
          case 1 -> {
            reference.remove(e);
            heap.remove(e);
          }
          default -> {
            if (!reference.isEmpty()) {
              assertEquals(reference.pollFirst(), heap.pop(), "seed " + seed);
            }
          }
        }
        assertEquals(reference.size(), heap.size(), "seed " + seed);
        assertEquals(reference.contains(e), heap.contains(e), "seed " + seed);
      }
      while (!reference.isEmpty()) {
        assertEquals(reference.pollFirst(), heap.pop(), "seed " + seed);
      }
      assertTrue(heap.size() == 0);
    }
  }

  /** Few distinct values, so that ties on priority, tie and order all occur; orders may be negative. */
  private static void randomKeys(Random random, int e, double[] priority, byte[] tie,
      int[] order) {
    priority[e] = random.nextInt(5) - 2;
    tie[e] = (byte) random.nextInt(2);
    order[e] = random.nextInt(7) - 3;
  }
}
