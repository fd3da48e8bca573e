package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

class SubsamplingRowDecisionsTest {

  /** The row decisions agree with the per-edge decision on random rows, 2D and 3D. */
  @Test
  void rowDecisionsMatchThePerEdgeDecision() {
    Random random = new Random(41);
    double[] fractions = {1e-9, 0.1, 0.4, 0.5, 0.9, 1 - 1e-12};
    for (int trial = 0; trial < 60; trial++) {
      double fraction = fractions[trial % fractions.length];
      Subsampling sub = Subsampling.hash(fraction, random.nextLong());
      int k = random.nextInt(20);
      int dimension = 2 + random.nextInt(2);
      long x0 = random.nextInt(2_000_000) - 1_000_000L;
      int length = 1 + random.nextInt(200);
      Subsampling.RowDecisions rows = sub.rowDecisions(k, x0, length);
      int kept = 0;
      for (int row = 0; row < 20; row++) {
        long[] global = new long[dimension];
        for (int d = 1; d < dimension; d++) {
          global[d] = random.nextInt(2_000_000) - 1_000_000L;
        }
        for (int i = 0; i < length; i++) {
          long[] voxel = global.clone();
          voxel[0] = x0 + i;
          boolean expected = sub.keepsLongRange(voxel, k);
          assertEquals(expected, rows.keeps(i, global), sub + " k " + k + " voxel " + i);
          kept += expected ? 1 : 0;
        }
      }
      if (fraction == 0.5) {
        // a fair coin per edge: within 5 standard deviations of half (binomial distribution)
        int edges = 20 * length;
        assertTrue(Math.abs(kept - edges / 2.0) <= 5 * Math.sqrt(edges) / 2 + 1,
            "kept " + kept + " of " + edges);
      }
    }
  }

  @Test
  void noRowDecisionsWhenEverythingOrALatticeIsKept() {
    assertNull(Subsampling.none().rowDecisions(0, 0, 8));
    assertNull(Subsampling.hash(1, 3).rowDecisions(0, 0, 8));
    assertNull(Subsampling.stride(2, 2, 2).rowDecisions(0, 0, 8));
  }
}
