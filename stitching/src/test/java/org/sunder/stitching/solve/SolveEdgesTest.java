package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/**
 * The bulk paths of {@link SolveEdges} against one edge at a time: {@link SolveEdges#addAll}
 * and {@link SolveEdges#gathered} against {@code add} per edge, {@link SolveEdges#wrap} against
 * building the same list, and
 * {@link SolveEdges#joinCopies} against a sorted map of keys built here.
 */
class SolveEdgesTest {
  private static SolveEdges random(Random random, int m, int keys) {
    SolveEdges edges = new SolveEdges(random.nextInt(8));
    for (int e = 0; e < m; e++) {
      long ku = random.nextInt(keys);
      edges.add(random.nextInt(100), random.nextInt(100), random.nextGaussian(), ku,
          ku + random.nextInt(3), (byte) random.nextInt(3));
    }
    return edges;
  }

  @Test
  void addAllAppendsWhatAddingEachEdgeAppends() {
    Random random = new Random(81);
    for (int trial = 0; trial < 30; trial++) {
      List<SolveEdges> parts = new ArrayList<>();
      for (int p = random.nextInt(6); p > 0; p--) {
        parts.add(random(random, random.nextInt(200), 1000));
      }
      SolveEdges bulk = new SolveEdges(random.nextInt(4));
      SolveEdges each = new SolveEdges(4);
      for (SolveEdges part : parts) {
        bulk.addAll(part);
        for (int e = 0; e < part.size(); e++) {
          each.add(part.u(e), part.v(e), part.weight(e), part.keyU(e), part.keyV(e),
              part.kind(e));
        }
      }
      assertEquals(each, bulk, "trial " + trial);
      bulk.add(1, 2, 0.5, 3, 4, SolveEdges.MAX);
      each.add(1, 2, 0.5, 3, 4, SolveEdges.MAX);
      assertEquals(each, bulk, "an edge added after addAll, trial " + trial);
    }
  }

  @Test
  void wrapHoldsTheGivenColumnsAndRefusesUnequalLengths() {
    SolveEdges wrapped = SolveEdges.wrap(new long[] {1, 2}, new long[] {3, 4},
        new double[] {0.5, -1}, new long[] {5, 6}, new long[] {7, 8}, new byte[] {0, 1});
    SolveEdges built = new SolveEdges(2);
    built.add(1, 3, 0.5, 5, 7, SolveEdges.MAX);
    built.add(2, 4, -1, 6, 8, SolveEdges.MIN);
    assertEquals(built, wrapped);
    wrapped.add(9, 9, 1, 9, 9, SolveEdges.MAX);
    assertEquals(3, wrapped.size());
    assertThrows(IllegalArgumentException.class, () -> SolveEdges.wrap(new long[2],
        new long[2], new double[2], new long[2], new long[1], new byte[2]));
    SolveEdges first = SolveEdges.wrap(new long[] {1, 2}, new long[] {3, 4},
        new double[] {0.5, -1}, new long[] {5, 6}, new long[] {7, 8}, new byte[] {0, 1}, 1);
    SolveEdges one = new SolveEdges(1);
    one.add(1, 3, 0.5, 5, 7, SolveEdges.MAX);
    assertEquals(one, first);
    assertThrows(IllegalArgumentException.class, () -> SolveEdges.wrap(new long[2],
        new long[2], new double[2], new long[2], new long[2], new byte[2], 3));
  }

  @Test
  void joinCopiesInAGivenOrderRefusesAnOrderOfAnotherLength() {
    SolveEdges edges = random(new Random(89), 5, 10);
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> edges.joinCopies(new int[] {0, 1, 2}));
    assertEquals("an order of 3 indices for 5 edges", e.getMessage());
  }

  @Test
  void gatheredMatchesAddingTheChosenEdgesWithNewEnds() {
    Random random = new Random(87);
    for (int trial = 0; trial < 30; trial++) {
      SolveEdges source = random(random, 1 + random.nextInt(500), 100);
      int length = random.nextInt(400);
      int count = length == 0 ? 0 : random.nextInt(length + 1);
      int[] indices = new int[length];
      long[] u = new long[length];
      long[] v = new long[length];
      SolveEdges expected = new SolveEdges(count);
      for (int i = 0; i < length; i++) {
        indices[i] = random.nextInt(source.size());
        u[i] = random.nextLong();
        v[i] = random.nextLong();
        if (i < count) {
          expected.add(source, indices[i], u[i], v[i]);
        }
      }
      SolveEdges gathered = SolveEdges.gathered(source, indices, count, u, v);
      assertEquals(expected, gathered, "trial " + trial);
      gathered.add(1, 2, 0.5, 3, 4, SolveEdges.MAX);
      expected.add(1, 2, 0.5, 3, 4, SolveEdges.MAX);
      assertEquals(expected, gathered, "an edge added after, trial " + trial);
    }
    assertThrows(IllegalArgumentException.class,
        () -> SolveEdges.gathered(new SolveEdges(1), new int[1], 2, new long[2], new long[2]));
  }

  @Test
  void joinCopiesMatchesASortedMapOfKeys() {
    Random random = new Random(83);
    for (int trial = 0; trial < 30; trial++) {
      SolveEdges edges = random(random, random.nextInt(2000), 1 + random.nextInt(300));
      // key (keyU, keyV, kind) to {u, v, first index}: smallest ends, first copy's weight
      TreeMap<List<Long>, long[]> byKey = new TreeMap<>((x, y) -> {
        for (int i = 0; i < 3; i++) {
          int c = Long.compare(x.get(i), y.get(i));
          if (c != 0) {
            return c;
          }
        }
        return 0;
      });
      for (int e = 0; e < edges.size(); e++) {
        int at = e;
        long[] joined = byKey.computeIfAbsent(
            List.of(edges.keyU(e), edges.keyV(e), (long) edges.kind(e)),
            k -> new long[] {Long.MAX_VALUE, Long.MAX_VALUE, at});
        joined[0] = Math.min(joined[0], edges.u(e));
        joined[1] = Math.min(joined[1], edges.v(e));
      }
      SolveEdges expected = new SolveEdges(byKey.size());
      for (var entry : byKey.entrySet()) {
        long[] joined = entry.getValue();
        expected.add(edges, (int) joined[2], joined[0], joined[1]);
      }
      assertEquals(expected, edges.joinCopies(), "trial " + trial);
    }
  }
}
