package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import it.unimi.dsi.fastutil.ints.IntArrays;
import it.unimi.dsi.fastutil.ints.IntComparator;
import java.util.Arrays;
import java.util.Comparator;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The one index sort of the project is fastutil's {@code IntArrays.mergeSort(int[],
 * IntComparator)} ({@link EdgeStatistics} and the metrics' rankings use it). Their outputs are
 * byte-identical only while it is stable, so this checks it against {@link Arrays#sort(Object[],
 * Comparator)}, which the JDK documents as stable, on inputs with many ties.
 */
class StableIndexSortTest {

  @Test
  void equalsTheJdkStableSortOnRandomKeysWithTies() {
    Random random = new Random(13);
    for (int round = 0; round < 200; round++) {
      int n = random.nextInt(round < 100 ? 40 : 5000);
      long[] key = new long[n];
      int range = 1 + random.nextInt(n + 1);
      for (int i = 0; i < n; i++) {
        key[i] = random.nextInt(range) - range / 2;
      }
      int[] order = identity(n);
      IntComparator byKey = (x, y) -> Long.compare(key[x], key[y]);
      IntArrays.mergeSort(order, byKey);

      Integer[] expected = new Integer[n];
      for (int i = 0; i < n; i++) {
        expected[i] = i;
      }
      Arrays.sort(expected, (x, y) -> Long.compare(key[x], key[y]));
      assertArrayEquals(Arrays.stream(expected).mapToInt(Integer::intValue).toArray(), order,
          "round " + round + ", n " + n + ", key range " + range);
    }
  }

  @Test
  void sortsAPermutationNotOnlyTheIdentity() {
    Random random = new Random(14);
    int n = 3000;
    double[] key = new double[n];
    for (int i = 0; i < n; i++) {
      key[i] = random.nextInt(50) * 0.5;
    }
    int[] order = identity(n);
    IntArrays.shuffle(order, new Random(15));
    Integer[] expected = Arrays.stream(order).boxed().toArray(Integer[]::new);
    Arrays.sort(expected, Comparator.comparingDouble(i -> key[i]));
    IntArrays.mergeSort(order, (x, y) -> Double.compare(key[x], key[y]));
    assertArrayEquals(Arrays.stream(expected).mapToInt(Integer::intValue).toArray(), order);
  }

  private static int[] identity(int n) {
    int[] order = new int[n];
    for (int i = 0; i < n; i++) {
      order[i] = i;
    }
    return order;
  }
}
