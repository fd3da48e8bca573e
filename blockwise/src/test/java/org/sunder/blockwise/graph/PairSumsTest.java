package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.api.Test;

class PairSumsTest {
  /**
   * Runs of one pair, long ones (whose odds products fold before they leave the double range)
   * and pairs that come back after others, against each edge added on its own: under a logit
   * rule the sum of the definition {@code log(c / (1 - c))} of each clamped affinity {@code c},
   * minimum and maximum the rule's weights ({@link WeightRule#weight}); under a centred rule the
   * weights themselves.
   */
  @Test
  void runsSumAsEveryEdgeAddedAlone() {
    Random random = new Random(11);
    Offsets offsets = Offsets.of(new int[] {0, -1, 0});
    AffinityBlock block = AffinityBlock.ofFloats(new float[2], new int[] {1, 2, 1}, new long[3],
        offsets, null);
    for (int trial = 0; trial < 200; trial++) {
      boolean logit = trial % 2 == 0;
      WeightRule rule = logit ? WeightRule.logit(trial % 4 == 0 ? 0.01 : WeightRule.LOGIT_EPSILON)
          : WeightRule.byValue(WeightRule.Transform.CENTERED, null);
      GridGraph graph = GridGraph.of(block, rule, Subsampling.none());
      PairSums sums = new PairSums(graph);
      EdgeStatistics.Accumulator alone = new EdgeStatistics.Accumulator(16);
      int edges = 1 + random.nextInt(2000);
      long a = 1;
      long b = 2;
      for (int e = 0; e < edges; e++) {
        if (random.nextInt(trial % 3 == 0 ? 400 : 5) == 0) {
          a = 1 + random.nextInt(6);
          b = a + 1 + random.nextInt(3);
          if (random.nextBoolean()) {
            long swap = a;
            a = b;
            b = swap;
          }
        }
        float value = switch (random.nextInt(4)) {
          case 0 -> 0f;
          case 1 -> 1f;
          default -> random.nextFloat();
        };
        if (logit) {
          // the affinity goes in; its weight by the rule and its logit by definition come out
          sums.add(a, b, value);
          double weight = rule.weight(value, 0f);
          double c = Math.min(Math.max(value, rule.unbiasedLogitClamp()),
              1 - rule.unbiasedLogitClamp());
          alone.add(a, b, Math.log(c / (1 - c)), 1, weight, weight);
        } else {
          // the graph's weight goes in as it is
          float weight = rule.weight(value, 0f);
          sums.add(a, b, weight);
          alone.add(a, b, weight, 1, weight, weight);
        }
      }
      EdgeStatistics got = sums.build();
      EdgeStatistics want = alone.build();
      assertEquals(want.size(), got.size(), "trial " + trial);
      for (int i = 0; i < want.size(); i++) {
        String where = "trial " + trial + ", pair " + want.u(i) + "-" + want.v(i);
        assertEquals(want.u(i), got.u(i), where);
        assertEquals(want.v(i), got.v(i), where);
        assertEquals(want.count(i), got.count(i), where);
        assertEquals(want.sum(i), got.sum(i), 1e-9 * want.count(i) * 14, where);
        assertEquals(want.min(i), got.min(i), where);
        assertEquals(want.max(i), got.max(i), where);
      }
    }
  }
}
