package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

class EdgeStatisticsTest {
  /**
   * {@link EdgeStatistics#mapped} against adding the mapped rows one by one, in row order, to an
   * {@link EdgeStatistics.Accumulator} (which keeps a pair's running sum): the same table bit for
   * bit, on random tables whose maps merge many pairs and collapse some into one id.
   */
  @Test
  void mappedCombinesCoincidingPairsInRowOrder() {
    Random random = new Random(23);
    for (int trial = 0; trial < 200; trial++) {
      int ids = 2 + random.nextInt(60);
      int rows = random.nextInt(300);
      long[] u = new long[rows];
      long[] v = new long[rows];
      double[] sum = new double[rows];
      long[] count = new long[rows];
      double[] min = new double[rows];
      double[] max = new double[rows];
      for (int r = 0; r < rows; r++) {
        u[r] = random.nextInt(ids);
        v[r] = (u[r] + 1 + random.nextInt(ids - 1)) % ids;
        count[r] = 1 + random.nextInt(5);
        min[r] = random.nextGaussian();
        max[r] = min[r] + random.nextDouble();
        sum[r] = random.nextGaussian() * 1e3 + random.nextDouble() * 1e-9;
      }
      EdgeStatistics table = EdgeStatistics.of(u, v, sum, count, min, max);
      int[] newIds = new int[ids];
      int targets = 1 + random.nextInt(ids);
      for (int x = 0; x < ids; x++) {
        newIds[x] = random.nextInt(targets) * (trial % 3 == 0 ? 1_000_003 : 1);
      }
      EdgeStatistics.Accumulator alone = new EdgeStatistics.Accumulator(4);
      for (int r = 0; r < table.size(); r++) {
        int p = newIds[(int) table.u(r)];
        int q = newIds[(int) table.v(r)];
        if (p != q) {
          alone.add(p, q, table.sum(r), table.count(r), table.min(r), table.max(r));
        }
      }
      assertEquals(alone.build(), table.mapped(newIds), "trial " + trial);
    }
    EdgeStatistics one = EdgeStatistics.of(new long[] {0}, new long[] {1}, new double[] {1},
        new long[] {1}, new double[] {1}, new double[] {1});
    assertThrows(IllegalArgumentException.class, () -> one.mapped(new int[] {-1, 2}));
  }

  @Test
  void accumulatorMatchesBruteForceAndIsCanonical() {
    Random random = new Random(13);
    int m = 3000;
    long[] u = new long[m];
    long[] v = new long[m];
    double[] w = new double[m];
    Map<List<Long>, double[]> expected = new HashMap<>();
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(4);
    for (int e = 0; e < m; e++) {
      if (e > 0 && random.nextInt(3) == 0) {  // runs of one pair, in either order
        boolean swap = random.nextBoolean();
        u[e] = swap ? v[e - 1] : u[e - 1];
        v[e] = swap ? u[e - 1] : v[e - 1];
      } else {
        u[e] = random.nextInt(40) + (1L << 40);
        do {
          v[e] = random.nextInt(40) + (1L << 40);
        } while (v[e] == u[e]);
      }
      w[e] = random.nextInt(9) - 4;
      acc.add(u[e], v[e], w[e]);
      double[] s = expected.computeIfAbsent(List.of(Math.min(u[e], v[e]), Math.max(u[e], v[e])),
          key -> new double[] {0, 0, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY});
      s[0] += w[e];
      s[1]++;
      s[2] = Math.min(s[2], w[e]);
      s[3] = Math.max(s[3], w[e]);
    }
    EdgeStatistics stats = acc.build();
    assertEquals(expected.size(), stats.size());
    for (int i = 0; i < stats.size(); i++) {
      assertTrue(stats.u(i) < stats.v(i));
      if (i > 0) {
        assertTrue(stats.u(i - 1) < stats.u(i)
            || (stats.u(i - 1) == stats.u(i) && stats.v(i - 1) < stats.v(i)));
      }
      double[] s = expected.get(List.of(stats.u(i), stats.v(i)));
      assertEquals(s[0], stats.sum(i));
      assertEquals((long) s[1], stats.count(i));
      assertEquals(s[2], stats.min(i));
      assertEquals(s[3], stats.max(i));
      assertEquals(i, stats.indexOf(stats.v(i), stats.u(i)));
    }
    assertEquals(stats, EdgeStatistics.ofEdges(u, v, w));
    assertEquals(m, stats.edgeCount());
  }

  /**
   * Rows of one pair combine in ascending (sum, count, min, max), so the floating-point sums are
   * the same bits whatever the rows' order. Reference for that order: the JDK's stable sort by
   * a comparator of the columns ({@code Double.compare} for the weights, -0.0 below 0.0).
   */
  @Test
  void rowsCombineInTheSameOrderWhateverTheirInputOrder() {
    Random random = new Random(31);
    double[] weights = {-0.0, 0.0, 0.1, -0.7, 1e-17, 3.3, -2.5e8, 0.3};
    for (int trial = 0; trial < 20; trial++) {
      int m = 200 + random.nextInt(300);
      long[] u = new long[m];
      long[] v = new long[m];
      double[] sum = new double[m];
      long[] count = new long[m];
      double[] min = new double[m];
      double[] max = new double[m];
      Integer[] rows = new Integer[m];
      for (int e = 0; e < m; e++) {
        u[e] = random.nextInt(6) - 3L;
        v[e] = random.nextInt(6) - 3L;
        min[e] = weights[random.nextInt(weights.length)];
        max[e] = Math.max(min[e], weights[random.nextInt(weights.length)]);
        count[e] = 1 + random.nextInt(3);
        sum[e] = count[e] == 1 ? min[e] : min[e] + max[e];
        rows[e] = e;
      }
      Comparator<Integer> byColumns = Comparator.<Integer>comparingLong(e -> Math.min(u[e], v[e]))
          .thenComparingLong(e -> Math.max(u[e], v[e])).thenComparingDouble(e -> sum[e])
          .thenComparingLong(e -> count[e]).thenComparingDouble(e -> min[e])
          .thenComparingDouble(e -> max[e]);
      Arrays.sort(rows, byColumns);
      EdgeStatistics.Accumulator reference = new EdgeStatistics.Accumulator(4);
      for (int e : rows) {
        if (u[e] != v[e]) {
          reference.add(u[e], v[e], sum[e], count[e], min[e], max[e]);
        }
      }
      assertEquals(reference.build(), EdgeStatistics.of(u, v, sum, count, min, max),
          "trial " + trial);
    }
  }

  /**
   * Ids near 0, at the top of the 32-bit range (one sort key per pair), across 2^32 and
   * negative (sorted by columns): the accumulator's table equals the rows summed pair by pair
   * in the order added, in canonical order.
   */
  @Test
  void accumulatorBuildsTheCanonicalTableForIdsOfEveryRange() {
    Random random = new Random(31);
    long[] lowest = {0, (1L << 32) - 40, (1L << 32) - 20, -20, Long.MAX_VALUE - 40};
    for (long low : lowest) {
      for (int trial = 0; trial < 20; trial++) {
        EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1);
        Map<List<Long>, double[]> reference = new HashMap<>();
        for (int e = 0; e < 300; e++) {
          long a = low + random.nextInt(40);
          long b = low + random.nextInt(40);
          if (a == b) {
            continue;
          }
          double w = random.nextInt(9) * 0.375 - 1.5 + random.nextDouble();
          acc.add(a, b, w);
          double[] row = reference.computeIfAbsent(List.of(Math.min(a, b), Math.max(a, b)),
              k -> new double[] {0, 0, w, w});
          row[0] += w;
          row[1]++;
          row[2] = Math.min(row[2], w);
          row[3] = Math.max(row[3], w);
        }
        int n = reference.size();
        long[] u = new long[n];
        long[] v = new long[n];
        double[] sum = new double[n];
        long[] count = new long[n];
        double[] min = new double[n];
        double[] max = new double[n];
        int r = 0;
        for (var entry : reference.entrySet()) {
          u[r] = entry.getKey().get(0);
          v[r] = entry.getKey().get(1);
          sum[r] = entry.getValue()[0];
          count[r] = (long) entry.getValue()[1];
          min[r] = entry.getValue()[2];
          max[r++] = entry.getValue()[3];
        }
        EdgeStatistics built = acc.build();
        assertEquals(EdgeStatistics.of(u, v, sum, count, min, max), built,
            "ids from " + low + ", trial " + trial);
        for (int i = 1; i < built.size(); i++) {
          assertTrue(built.u(i - 1) < built.u(i)
              || built.u(i - 1) == built.u(i) && built.v(i - 1) < built.v(i), "row " + i);
        }
      }
    }
  }

  @Test
  void canonicalRowsAreKeptAndRowsOutOfOrderRefused() {
    double[] one = {1};
    double[] two = {1, 1};
    EdgeStatistics rows = EdgeStatistics.ofCanonical(new long[] {1, 1}, new long[] {2, 5}, two,
        new long[] {1, 1}, two, two);
    assertEquals(EdgeStatistics.of(new long[] {1, 1}, new long[] {5, 2}, two,
        new long[] {1, 1}, two, two), rows);
    assertThrows(IllegalArgumentException.class, () -> EdgeStatistics.ofCanonical(
        new long[] {1, 1}, new long[] {5, 2}, two, new long[] {1, 1}, two, two));
    assertThrows(IllegalArgumentException.class, () -> EdgeStatistics.ofCanonical(
        new long[] {1, 1}, new long[] {2, 2}, two, new long[] {1, 1}, two, two));
    assertThrows(IllegalArgumentException.class, () -> EdgeStatistics.ofCanonical(
        new long[] {3}, new long[] {3}, one, new long[] {1}, one, one));
  }

  @Test
  void mergeOfPartsEqualsWholeWhateverTheSplitAndOrder() {
    Random random = new Random(13);
    int m = 2000;
    long[] u = new long[m];
    long[] v = new long[m];
    double[] w = new double[m];
    for (int e = 0; e < m; e++) {
      u[e] = random.nextInt(30);
      v[e] = (u[e] + 1 + random.nextInt(29)) % 30;
      w[e] = random.nextInt(5) * 0.25 - 0.5;
    }
    EdgeStatistics whole = EdgeStatistics.ofEdges(u, v, w);
    List<EdgeStatistics> parts = new ArrayList<>();
    for (int p = 0; p < 4; p++) {
      int from = p * m / 4;
      int to = (p + 1) * m / 4;
      parts.add(EdgeStatistics.ofEdges(slice(u, from, to), slice(v, from, to),
          java.util.Arrays.copyOfRange(w, from, to)));
    }
    assertEquals(whole, EdgeStatistics.mergeAll(parts));
    Collections.reverse(parts);
    assertEquals(whole, EdgeStatistics.mergeAll(parts));
    assertEquals(parts.get(0).merge(parts.get(1)), parts.get(1).merge(parts.get(0)));
  }

  @Test
  void relabelMergesPairsAndDropsInnerOnes() {
    EdgeStatistics s = EdgeStatistics.ofEdges(new long[] {1, 1, 2, 3}, new long[] {2, 3, 3, 4},
        new double[] {0.5, -1, 2, 4});
    EdgeStatistics r = s.relabel(new long[] {2, 3}, new long[] {9, 9});
    assertEquals(2, r.size());
    int i = r.indexOf(1, 9);
    assertEquals(-0.5, r.sum(i));
    assertEquals(2, r.count(i));
    assertEquals(-1, r.min(i));
    assertEquals(0.5, r.max(i));
    assertEquals(4, r.sum(r.indexOf(4, 9)));
  }

  /**
   * Partial statistics of many pairs over a wide id range (negative ids too, counts of 0) against
   * a {@link HashMap} of the JDK: the accumulator's table grows from 4 slots to thousands.
   */
  @Test
  void accumulatorOfPartialStatisticsMatchesAHashMapOverManyPairs() {
    Random random = new Random(29);
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1);
    Map<List<Long>, double[]> expected = new HashMap<>();
    for (int step = 0; step < 60000; step++) {
      long a = random.nextInt(400) - 200L + (random.nextBoolean() ? 0 : 1L << 50);
      long b = random.nextInt(400) - 200L;
      if (a == b) {
        continue;
      }
      double lo = random.nextInt(9) - 4;
      double hi = lo + random.nextInt(3);
      long count = random.nextInt(3);
      double sum = random.nextInt(20) - 10;
      acc.add(a, b, sum, count, lo, hi);
      double[] s = expected.computeIfAbsent(List.of(Math.min(a, b), Math.max(a, b)),
          key -> new double[] {0, 0, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY});
      s[0] += sum;
      s[1] += count;
      s[2] = Math.min(s[2], lo);
      s[3] = Math.max(s[3], hi);
    }
    EdgeStatistics stats = acc.build();
    assertEquals(expected.size(), acc.size());
    assertEquals(expected.size(), stats.size());
    for (int i = 0; i < stats.size(); i++) {
      double[] s = expected.get(List.of(stats.u(i), stats.v(i)));
      assertEquals(s[0], stats.sum(i));
      assertEquals((long) s[1], stats.count(i));
      assertEquals(s[2], stats.min(i));
      assertEquals(s[3], stats.max(i));
    }
    assertThrows(IllegalArgumentException.class, () -> acc.add(1, 2, 0, -1, 0, 0));
    assertThrows(IllegalArgumentException.class, () -> acc.add(3, 3, 1));
  }

  /**
   * A small accumulator drained into a large one at random moments (as the region graph drains
   * each slice's pairs) against every add made in the large one directly; integer statistics, so
   * the sums are exact in any order.
   */
  @Test
  void drainingIntoAnotherAccumulatorEqualsAddingThere() {
    Random random = new Random(31);
    EdgeStatistics.Accumulator direct = new EdgeStatistics.Accumulator(1);
    EdgeStatistics.Accumulator drained = new EdgeStatistics.Accumulator(1);
    EdgeStatistics.Accumulator part = new EdgeStatistics.Accumulator(1);
    int drains = 0;
    for (int step = 0; step < 20000; step++) {
      long a = random.nextInt(300);
      long b = random.nextInt(300) + (random.nextInt(4) == 0 ? 1L << 62 : 0);
      if (a == b) {
        continue;
      }
      double lo = random.nextInt(9) - 4;
      double hi = lo + random.nextInt(3);
      long count = 1 + random.nextInt(3);
      double sum = random.nextInt(20) - 10;
      direct.add(a, b, sum, count, lo, hi);
      part.add(a, b, sum, count, lo, hi);
      if (random.nextInt(500) == 0) {
        part.drainInto(drained);
        assertEquals(0, part.size());
        drains++;
      }
    }
    part.drainInto(drained);
    assertTrue(drains > 20, drains + " drains");
    assertEquals(direct.build(), drained.build());
    assertEquals(EdgeStatistics.empty(), part.build(), "a drained accumulator is empty");
  }

  @Test
  void renumberedEqualsRelabelToPositionsAndIsNullForAnUnlistedId() {
    Random random = new Random(55);
    for (int trial = 0; trial < 20; trial++) {
      java.util.TreeSet<Long> idSet = new java.util.TreeSet<>();
      while (idSet.size() < 30) {
        idSet.add((long) random.nextInt(1 << 20) << 20);
      }
      long[] ids = idSet.stream().mapToLong(Long::longValue).toArray();
      long[] positions = new long[ids.length];
      for (int i = 0; i < ids.length; i++) {
        positions[i] = i;
      }
      int m = 200;
      long[] u = new long[m];
      long[] v = new long[m];
      double[] w = new double[m];
      for (int e = 0; e < m; e++) {
        u[e] = ids[random.nextInt(ids.length)];
        v[e] = ids[random.nextInt(ids.length)];
        w[e] = random.nextGaussian();
      }
      EdgeStatistics s = EdgeStatistics.ofEdges(u, v, w);
      assertEquals(s.relabel(ids, positions), s.renumbered(ids));
      long[] fewer = java.util.Arrays.copyOfRange(ids, 1, ids.length);
      boolean usesFirst = false;
      for (int i = 0; i < s.size(); i++) {
        usesFirst |= s.u(i) == ids[0] || s.v(i) == ids[0];
      }
      assertEquals(usesFirst, s.renumbered(fewer) == null);
    }
  }

  /**
   * Minima and maxima gathered over random affinities and mapped through the logit afterwards
   * equal those gathered over the logits themselves, the logit rising with the affinity; a
   * falling function is refused.
   */
  @Test
  void withMinMaxOfARisingFunctionEqualsTheStatisticsOfItsImages() {
    Random random = new Random(71);
    int m = 3000;
    long[] u = new long[m];
    long[] v = new long[m];
    double[] affinity = new double[m];
    double[] logit = new double[m];
    for (int e = 0; e < m; e++) {
      u[e] = random.nextInt(60);
      v[e] = random.nextInt(60);
      affinity[e] = 0.001 + 0.998 * random.nextDouble();
      logit[e] = Math.log(affinity[e] / (1 - affinity[e]));
    }
    EdgeStatistics ofAffinities = EdgeStatistics.ofEdges(u, v, affinity);
    EdgeStatistics ofLogits = EdgeStatistics.ofEdges(u, v, logit);
    EdgeStatistics mapped = ofAffinities.withMinMax(c -> Math.log(c / (1 - c)));
    assertEquals(ofLogits.size(), mapped.size());
    for (int i = 0; i < mapped.size(); i++) {
      assertEquals(ofLogits.u(i), mapped.u(i));
      assertEquals(ofLogits.v(i), mapped.v(i));
      assertEquals(ofLogits.min(i), mapped.min(i));
      assertEquals(ofLogits.max(i), mapped.max(i));
      assertEquals(ofAffinities.sum(i), mapped.sum(i));
      assertEquals(ofAffinities.count(i), mapped.count(i));
    }
    assertTrue(Arrays.stream(ofAffinities.copyMin()).anyMatch(c -> c < 0.5)
        && Arrays.stream(ofAffinities.copyMax()).anyMatch(c -> c > 0.5));
    assertThrows(IllegalArgumentException.class, () -> ofAffinities.withMinMax(c -> -c));
  }

  private static long[] slice(long[] a, int from, int to) {
    return java.util.Arrays.copyOfRange(a, from, to);
  }
}
