package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;

/**
 * {@link PartNodes} against a plain reference: the inside ends collected in a
 * {@code java.util.TreeSet} (ascending, each once), each end's index found by counting the
 * smaller nodes; the predicate is asked once per distinct end.
 */
class PartNodesTest {

  @Test
  void nodesAndEndIndicesMatchASortedSet() {
    Random random = new Random(43);
    for (int trial = 0; trial < 30; trial++) {
      int m = trial == 0 ? 0 : random.nextInt(2000);
      long[] u = new long[m];
      long[] v = new long[m];
      long spread = trial % 3 == 0 ? 50 : trial % 3 == 1 ? 1L << 40 : Long.MAX_VALUE;
      for (int e = 0; e < m; e++) {
        u[e] = random.nextLong() % spread;
        v[e] = random.nextLong() % spread;
      }
      long cut = random.nextLong() % spread;
      int[] asked = new int[1];
      PartNodes part = PartNodes.of(m, e -> u[e], e -> v[e], node -> {
        asked[0]++;
        return node >= cut;
      });
      TreeSet<Long> inside = new TreeSet<>();
      TreeSet<Long> distinct = new TreeSet<>();
      for (int e = 0; e < m; e++) {
        for (long end : new long[] {u[e], v[e]}) {
          distinct.add(end);
          if (end >= cut) {
            inside.add(end);
          }
        }
      }
      long[] expectedNodes = inside.stream().mapToLong(Long::longValue).toArray();
      int[] expectedIu = new int[m];
      int[] expectedIv = new int[m];
      for (int e = 0; e < m; e++) {
        expectedIu[e] = u[e] >= cut ? inside.headSet(u[e]).size() : -1;
        expectedIv[e] = v[e] >= cut ? inside.headSet(v[e]).size() : -1;
      }
      assertArrayEquals(expectedNodes, part.nodes(), "trial " + trial);
      assertArrayEquals(expectedIu, part.iu(), "trial " + trial);
      assertArrayEquals(expectedIv, part.iv(), "trial " + trial);
      assertEquals(distinct.size(), asked[0], "inside asked once per distinct end");
    }
  }
}
