package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Comparator;
import java.util.PriorityQueue;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link EdgeQueue} against a {@link PriorityQueue} with the documented order (reference), where
 * {@code 0.0 - p} makes {@code -0.0} and {@code 0.0} one priority as in the queue.
 */
class EdgeQueueTest {
  private record Entry(double value, int rank, int edge) {}

  @Test
  void popsInTheDocumentedOrder() {
    for (long seed = 1; seed <= 24; seed++) {
      Random random = new Random(seed);
      boolean byMagnitude = seed % 2 == 0;
      boolean separateRanks = seed % 3 == 0;
      Comparator<Entry> order = Comparator
          .<Entry>comparingDouble(x -> 0.0 - (byMagnitude ? Math.abs(x.value()) : x.value()))
          .thenComparingInt(x -> x.value() > 0 ? 0 : 1)
          .thenComparingInt(x -> separateRanks ? x.rank() : x.edge())
          .thenComparingInt(Entry::edge);
      PriorityQueue<Entry> reference = new PriorityQueue<>(order);
      EdgeQueue queue = new EdgeQueue(byMagnitude, separateRanks, random.nextInt(50));
      int initial = random.nextInt(300);
      for (int i = 0; i < initial; i++) {
        Entry x = randomEntry(random, separateRanks);
        queue.append(x.value(), x.rank(), x.edge());
        reference.add(x);
      }
      queue.heapify();
      for (int step = 0; step < 2000; step++) {
        assertEquals(reference.size(), queue.size());
        if (random.nextInt(3) == 0 || reference.isEmpty()) {
          Entry x = randomEntry(random, separateRanks);
          queue.push(x.value(), x.rank(), x.edge());
          reference.add(x);
        } else {
          Entry top = reference.poll();
          String at = "seed " + seed + " step " + step;
          assertTrue(top.value() == queue.topValue(), at);  // 0.0 and -0.0 rank equal
          assertEquals(top.edge(), queue.topEdge(), at);
          assertEquals(top.rank(), queue.topRank(), at);
          queue.pop();
        }
      }
    }
  }

  /** Few distinct values, both signs and both zeros, so every tie rule is exercised. */
  private static Entry randomEntry(Random random, boolean separateRanks) {
    double[] levels = {0.0, -0.0, 0.5, -0.5, 1.0, -1.0, 2.5};
    double value = random.nextInt(4) == 0 ? random.nextGaussian()
        : levels[random.nextInt(levels.length)];
    int edge = random.nextInt(60);
    return new Entry(value, separateRanks ? random.nextInt(60) : edge, edge);
  }
}
