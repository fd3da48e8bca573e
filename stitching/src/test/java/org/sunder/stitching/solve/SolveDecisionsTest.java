package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.task.SeamEdges;

class SolveDecisionsTest {
  private static final IdLayout LAYOUT = new IdLayout(20);

  @Test
  void theLeastSupportedJoinAndCutComeFirst() {
    // block 0 local 1, 2; block 1 local 1, 2. Final ids: 0:1 and 1:1 joined (id 1), others apart
    FinalIdMap map = new FinalIdMap(LAYOUT, new long[][] {{0, 1, 2}, {0, 1, 3}}, 3);
    long a1 = LAYOUT.provisional(0, 1);
    long a2 = LAYOUT.provisional(0, 2);
    long b1 = LAYOUT.provisional(1, 1);
    long b2 = LAYOUT.provisional(1, 2);
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(4);
    acc.add(a1, b1, 20 * 0.1, 20, 0.1, 0.1);    // join with mean 0.1: weak
    acc.add(a2, b2, 10 * -2.0, 10, -2, -2);     // cut with mean -2: strong
    acc.add(a2, b1, 8 * 0.5, 8, 0.5, 0.5);      // cut against attraction: margin -0.5
    acc.add(a1, b2, 2 * 3.0, 2, 3, 3);          // grazing: below 4 edges, left out
    List<SolveDecision> d = SolveDecisions.leastCertain(
        List.of(new SeamEdges(7, acc.build())), map::apply, 5, 4);
    assertEquals(3, d.size());
    assertEquals(false, d.get(0).joined());
    assertEquals(-0.5, d.get(0).margin(), 1e-12);
    assertEquals(true, d.get(1).joined());
    assertEquals(0.1, d.get(1).margin(), 1e-12);
    assertEquals(7, d.get(1).face());
    assertEquals(1, d.get(1).finalA());
    assertEquals(2.0, d.get(2).margin(), 1e-12);
  }

  @Test
  void randomSeamsKeepAtMostPerKindSortedAndTellJoinsByFinalIds() {
    Random random = new Random(13);
    int blocks = 6;
    int locals = 30;
    long[][] ids = new long[blocks][locals + 1];
    for (int b = 0; b < blocks; b++) {
      for (int k = 1; k <= locals; k++) {
        ids[b][k] = 1 + random.nextInt(40);
      }
    }
    FinalIdMap map = new FinalIdMap(LAYOUT, ids, 40);
    List<SeamEdges> seams = new ArrayList<>();
    for (int f = 0; f < 5; f++) {
      EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(64);
      for (int e = 0; e < 60; e++) {
        long u = LAYOUT.provisional(f, 1 + random.nextInt(locals));
        long v = LAYOUT.provisional(f + 1, 1 + random.nextInt(locals));
        double w = random.nextGaussian();
        acc.add(u, v, w, 1 + random.nextInt(9), w, w);
      }
      seams.add(new SeamEdges(f, acc.build()));
    }
    List<SolveDecision> d = SolveDecisions.leastCertain(seams, map::apply, 6, 3);
    List<SolveDecision> all = SolveDecisions.leastCertain(seams, map::apply, Integer.MAX_VALUE, 3);
    for (boolean joined : new boolean[] {true, false}) {
      List<SolveDecision> kind = all.stream().filter(x -> x.joined() == joined).toList();
      assertEquals(kind.subList(0, Math.min(6, kind.size())),
          d.stream().filter(x -> x.joined() == joined).toList());
    }
    assertTrue(d.stream().filter(SolveDecision::joined).count() <= 6);
    assertTrue(d.stream().filter(x -> !x.joined()).count() <= 6);
    assertEquals(d.size(), d.stream().map(x -> List.of(Math.min(x.finalA(), x.finalB()),
        Math.max(x.finalA(), x.finalB()))).distinct().count(), "one decision per final pair");
    for (int i = 0; i < d.size(); i++) {
      SolveDecision x = d.get(i);
      assertEquals(x.joined(), map.apply(x.provisionalA()) == map.apply(x.provisionalB()));
      assertTrue(x.voxelEdges() >= 3);
      if (i > 0) {
        assertTrue(d.get(i - 1).margin() <= x.margin());
      }
    }
  }
}
