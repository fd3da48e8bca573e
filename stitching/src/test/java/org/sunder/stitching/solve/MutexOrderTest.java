package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link MutexOrder#merged} and {@link MutexPartSolver#gather}, which merge the sub-parts'
 * outputs (each in the Mutex Watershed's order) instead of sorting them, against the JDK's
 * stable sort of boxed indices ({@code java.util.Arrays.sort(T[], Comparator)}, stable by its
 * specification) and against {@link SolveEdges#joinCopies} then that sort.
 */
class MutexOrderTest {

  @Test
  void mergedRunsMatchTheStableSortOfTheWhole() {
    Random random = new Random(53);
    for (int trial = 0; trial < 60; trial++) {
      List<SolveEdges> runs = orderedRuns(random, 1 + random.nextInt(10), trial % 3);
      SolveEdges all = SolveEdges.concatenation(runs);
      assertArrayEquals(EdgeSortTest.reference(all.size(),
          (a, b) -> MutexOrder.compare(all, a, b)), MutexOrder.merged(all, ends(runs)),
          "trial " + trial);
    }
  }

  @Test
  void aRunOutOfOrderIsNotMerged() {
    Random random = new Random(59);
    int refused = 0;
    for (int trial = 0; trial < 40; trial++) {
      List<SolveEdges> runs = orderedRuns(random, 1 + random.nextInt(6), trial % 3);
      int r = random.nextInt(runs.size());
      SolveEdges run = runs.get(r);
      if (run.size() < 2) {
        continue;
      }
      // the run's first and last edges swapped: out of order unless the two are equal
      int[] swap = new int[run.size()];
      for (int i = 0; i < swap.length; i++) {
        swap[i] = i;
      }
      swap[0] = swap.length - 1;
      swap[swap.length - 1] = 0;
      if (MutexOrder.compare(run, 0, swap.length - 1) == 0) {
        continue;
      }
      runs.set(r, reordered(run, swap));
      SolveEdges all = SolveEdges.concatenation(runs);
      assertNull(MutexOrder.merged(all, ends(runs)), "trial " + trial);
      // gathering still joins every copy, in key order
      assertEquals(all.joinCopies(), new MutexPartSolver().gather(runs), "trial " + trial);
      refused++;
    }
    assertTrue(refused > 20, refused + " trials with a run out of order");
  }

  @Test
  void gatherJoinsCopiesAsJoinCopiesDoesInMutexOrder() {
    Random random = new Random(61);
    for (int trial = 0; trial < 60; trial++) {
      List<SolveEdges> runs = orderedRuns(random, 1 + random.nextInt(10), trial % 3);
      SolveEdges joined = SolveEdges.concatenation(runs).joinCopies();
      int[] order = EdgeSortTest.reference(joined.size(),
          (a, b) -> MutexOrder.compare(joined, a, b));
      assertEquals(reordered(joined, order), new MutexPartSolver().gather(runs),
          "trial " + trial);
    }
  }

  /**
   * Runs as sub-parts hand them up: each in the Mutex Watershed's order, a third of the edges
   * with a copy in another run (the same weight and key, other ends). Style 0: few weights
   * (many ties on weight, decided by the key); 1: noisy weights; 2: few edges, some runs empty.
   */
  private static List<SolveEdges> orderedRuns(Random random, int count, int style) {
    List<SolveEdges> runs = new ArrayList<>();
    for (int r = 0; r < count; r++) {
      runs.add(new SolveEdges(4));
    }
    int m = random.nextInt(style == 2 ? 50 : 4000);
    for (int e = 0; e < m; e++) {
      // a key names one edge (its copies share it); few distinct high parts in style 0
      long keyU = ((long) random.nextInt(style == 0 ? 4 : 1 << 20) << 12) + e;
      long keyV = keyU + 1 + random.nextInt(style == 0 ? 3 : 1000);
      byte kind = (byte) random.nextInt(3);
      double w = style == 0 ? (random.nextInt(5) - 2) * 0.5 : random.nextGaussian();
      int r = random.nextInt(count);
      runs.get(r).add(random.nextInt(1000), random.nextInt(1000), w, keyU, keyV, kind);
      if (count > 1 && random.nextInt(3) == 0) {
        int other = (r + 1 + random.nextInt(count - 1)) % count;
        runs.get(other).add(random.nextInt(1000), random.nextInt(1000), w, keyU, keyV, kind);
      }
    }
    List<SolveEdges> ordered = new ArrayList<>();
    for (SolveEdges run : runs) {
      ordered.add(reordered(run, EdgeSortTest.reference(run.size(),
          (a, b) -> MutexOrder.compare(run, a, b))));
    }
    return ordered;
  }

  private static SolveEdges reordered(SolveEdges edges, int[] order) {
    SolveEdges out = new SolveEdges(order.length);
    for (int e : order) {
      out.add(edges, e, edges.u(e), edges.v(e));
    }
    return out;
  }

  private static int[] ends(List<SolveEdges> runs) {
    int[] ends = new int[runs.size()];
    int end = 0;
    for (int r = 0; r < ends.length; r++) {
      end += runs.get(r).size();
      ends[r] = end;
    }
    return ends;
  }
}
