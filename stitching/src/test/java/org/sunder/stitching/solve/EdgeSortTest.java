package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Comparator;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The radix sorts of {@link EdgeSort} against the JDK's stable sort of boxed indices
 * ({@code java.util.Arrays.sort(T[], Comparator)}, stable by its specification) with the
 * comparators they replace: the same order, ties in index order.
 */
class EdgeSortTest {
  /** Weights with many equal magnitudes of both signs, zeros of both signs and extremes. */
  private static final double[] WEIGHTS = {1, -1, 0.5, -0.5, 0.25, 0.0, -0.0, 1e-300, -1e-300,
      SolveEdges.APART, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, Double.NaN,
      Double.MAX_VALUE, -Double.MIN_VALUE};

  @Test
  void byKeyMatchesTheStableSortByCompareKeys() {
    Random random = new Random(31);
    for (int trial = 0; trial < 40; trial++) {
      SolveEdges edges = randomEdges(random, trial == 0 ? 0 : random.nextInt(3000), trial % 4);
      assertArrayEquals(reference(edges.size(), edges::compareKeys), EdgeSort.byKey(edges),
          "trial " + trial);
    }
  }

  @Test
  void byMutexOrderMatchesTheStableSortByMutexOrderCompare() {
    Random random = new Random(37);
    for (int trial = 0; trial < 40; trial++) {
      SolveEdges edges = randomEdges(random, trial == 0 ? 0 : random.nextInt(3000), trial % 4);
      assertArrayEquals(reference(edges.size(), (a, b) -> MutexOrder.compare(edges, a, b)),
          MutexOrder.sorted(edges), "trial " + trial);
    }
  }

  @Test
  void byValueMatchesTheStableSortOfLongs() {
    Random random = new Random(41);
    for (int trial = 0; trial < 20; trial++) {
      long[] values = new long[random.nextInt(3000)];
      for (int i = 0; i < values.length; i++) {
        values[i] = trial % 2 == 0 ? random.nextLong() : random.nextInt(20) - 10;
      }
      assertArrayEquals(reference(values.length, (a, b) -> Long.compare(values[a], values[b])),
          EdgeSort.byValue(values), "trial " + trial);
    }
  }

  @Test
  void joinCopiesKeepsOneEdgePerKeyInKeyOrder() {
    // the user of byKey: the smallest end of each key's copies, keys ascending
    SolveEdges edges = new SolveEdges(4);
    edges.add(9, 7, 0.5, 3, 4, SolveEdges.MIN);
    edges.add(5, 8, 0.5, 3, 4, SolveEdges.MAX);
    edges.add(6, 2, 0.5, 3, 4, SolveEdges.MIN);
    edges.add(1, 1, -2, -5, 4, SolveEdges.MIN);
    SolveEdges joined = edges.joinCopies();
    SolveEdges expected = new SolveEdges(3);
    expected.add(1, 1, -2, -5, 4, SolveEdges.MIN);
    expected.add(5, 8, 0.5, 3, 4, SolveEdges.MAX);
    expected.add(6, 2, 0.5, 3, 4, SolveEdges.MIN);
    assertEquals(expected, joined);
  }

  /**
   * Style 0: few distinct keys and weights (many full ties); 1: wide signed keys; 2: keys of
   * provisional-id size with kinds of both signs; 3: noisy weights, distinct keys.
   */
  private static SolveEdges randomEdges(Random random, int m, int style) {
    SolveEdges edges = new SolveEdges(m);
    for (int e = 0; e < m; e++) {
      long keyU;
      long keyV;
      byte kind;
      double w;
      switch (style) {
        case 0 -> {
          keyU = random.nextInt(4);
          keyV = random.nextInt(4);
          kind = (byte) random.nextInt(3);
          w = WEIGHTS[random.nextInt(4)];
        }
        case 1 -> {
          keyU = random.nextBoolean() ? random.nextLong() : random.nextInt(5) - 2;
          keyV = random.nextLong();
          kind = (byte) random.nextInt(3);
          w = WEIGHTS[random.nextInt(WEIGHTS.length)];
        }
        case 2 -> {
          keyU = ((long) random.nextInt(50) << 20) + random.nextInt(3);
          keyV = keyU + random.nextInt(3);
          kind = (byte) (random.nextInt(7) - 3);
          w = WEIGHTS[random.nextInt(WEIGHTS.length)];
        }
        default -> {
          keyU = random.nextInt(1 << 30);
          keyV = keyU + 1 + random.nextInt(1000);
          kind = random.nextBoolean() ? SolveEdges.MAX : SolveEdges.MIN;
          w = random.nextGaussian();
        }
      }
      edges.add(random.nextInt(100), random.nextInt(100), w, keyU, keyV, kind);
    }
    return edges;
  }

  static int[] reference(int n, EdgeComparator comparator) {
    Integer[] order = new Integer[n];
    for (int i = 0; i < n; i++) {
      order[i] = i;
    }
    Comparator<Integer> boxed = comparator::compare;
    Arrays.sort(order, boxed);
    return Arrays.stream(order).mapToInt(Integer::intValue).toArray();
  }

  interface EdgeComparator {
    int compare(int a, int b);
  }
}
