package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link PairIndex} against {@link HashMap} (the JDK's, outside the project) under random puts,
 * gets and removes on a small key space (so that probe chains collide, wrap and shift back on
 * removal), with growth from a tiny initial size.
 */
class PairIndexTest {

  @Test
  void behavesAsAHashMapUnderRandomOperations() {
    Random random = new Random(5);
    for (int trial = 0; trial < 20; trial++) {
      PairIndex index = new PairIndex(1 + random.nextInt(8));
      Map<List<Long>, Integer> reference = new HashMap<>();
      int keys = 4 + random.nextInt(300);
      for (int op = 0; op < 5000; op++) {
        long a = random.nextInt(keys) - keys / 4;
        long b = random.nextInt(keys) + (random.nextBoolean() ? 1L << 40 : 0);
        List<Long> key = List.of(a, b);
        int kind = random.nextInt(10);
        if (kind < 5) {
          int value = random.nextInt(1000);
          Integer previous = reference.put(key, value);
          assertEquals(previous == null ? -1 : previous, index.put(a, b, value));
        } else if (kind < 8) {
          assertEquals(reference.getOrDefault(key, -1), index.get(a, b));
        } else {
          Integer removed = reference.remove(key);
          assertEquals(removed == null ? -1 : removed, index.remove(a, b));
        }
        assertEquals(reference.size(), index.size());
      }
      for (Map.Entry<List<Long>, Integer> e : reference.entrySet()) {
        assertEquals(e.getValue(), index.get(e.getKey().get(0), e.getKey().get(1)));
      }
      assertEquals(-1, index.get(1L << 50, 3), "ordered pairs: absent keys are absent");
    }
  }

  @Test
  void aNegativeValueIsRefused() {
    assertThrows(IllegalArgumentException.class, () -> new PairIndex(4).put(1, 2, -1));
  }
}
