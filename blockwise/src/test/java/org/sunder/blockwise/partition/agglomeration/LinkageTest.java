package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** Sum and mean values on the grid: the same whatever order a blockwise run adds weights in. */
class LinkageTest {

  /**
   * Random pair sums of logits (|w| up to 13.8, the logit of a 10^-6 clamp) added in two
   * shuffled orders and in random groups, as blocks and seams add them: the raw sums differ in
   * their last bits on many pairs, the values on the grid on none of 2 000.
   */
  @Test
  void sumsInAnotherOrderGiveTheSameValue() {
    Random random = new Random(3);
    int rawDiffer = 0;
    for (int pair = 0; pair < 2000; pair++) {
      int count = 1 + random.nextInt(400);
      List<Double> weights = new ArrayList<>();
      for (int i = 0; i < count; i++) {
        weights.add((random.nextDouble() * 2 - 1) * 13.8);
      }
      double inOrder = 0;
      for (double w : weights) {
        inOrder += w;
      }
      Collections.shuffle(weights, random);
      double grouped = 0;
      double group = 0;
      for (double w : weights) {
        group += w;
        if (random.nextInt(7) == 0) {
          grouped += group;
          group = 0;
        }
      }
      grouped += group;
      rawDiffer += inOrder != grouped ? 1 : 0;
      for (Linkage linkage : new Linkage[] {Linkage.SUM, Linkage.MEAN}) {
        assertEquals(linkage.value(inOrder, count, 0, 0), linkage.value(grouped, count, 0, 0),
            "pair " + pair + " " + linkage);
      }
    }
    assertTrue(rawDiffer > 500, "raw sums that differ: " + rawDiffer);
  }

  /**
   * Values on the grid below 2^28 add exactly (associativity holds), and the grid moves a value
   * by at most half its spacing.
   */
  @Test
  void valuesOnTheGridAddExactlyInAnyOrder() {
    Random random = new Random(5);
    for (int trial = 0; trial < 500; trial++) {
      double[] v = new double[3];
      for (int i = 0; i < 3; i++) {
        double x = (random.nextDouble() * 2 - 1) * Math.scalb(1.0, random.nextInt(28));
        v[i] = Linkage.onGrid(x);
        assertTrue(Math.abs(v[i] - x) <= Linkage.GRID / 2, x + " -> " + v[i]);
      }
      assertEquals((v[0] + v[1]) + v[2], v[0] + (v[1] + v[2]), "trial " + trial);
      assertEquals(v[0] + v[1] + v[2], Linkage.onGrid(v[0] + v[1] + v[2]), "trial " + trial);
    }
  }
}
