package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

class IntIntHashMapTest {

  /** Reference: java.util.HashMap under the same random puts, overwrites and removals. */
  @Test
  void randomOperationsMatchTheJdkMap() {
    Random random = new Random(17);
    for (int trial = 0; trial < 20; trial++) {
      IntIntHashMap map = new IntIntHashMap(random.nextInt(5));
      Map<Integer, Integer> reference = new HashMap<>();
      int range = trial % 2 == 0 ? 50 : Integer.MAX_VALUE - 1;
      for (int step = 0; step < 3000; step++) {
        int key = trial % 4 == 1 && step % 7 == 0 ? 0 : random.nextInt(range);
        if (random.nextInt(3) == 0) {
          map.remove(key);
          reference.remove(key);
        } else {
          int value = random.nextInt();
          map.put(key, value);
          reference.put(key, value);
        }
        int probe = random.nextInt(range);
        assertEquals(reference.getOrDefault(probe, -7), map.get(probe, -7));
      }
      assertEquals(reference.size(), map.size());
      Map<Integer, Integer> listed = new HashMap<>();
      for (int slot = 0; slot < map.capacity(); slot++) {
        if (map.keyAt(slot) >= 0) {
          listed.put(map.keyAt(slot), map.valueAt(slot));
        }
      }
      assertEquals(reference, listed, "trial " + trial);
    }
  }

  @Test
  void refusesKeysOutsideItsRange() {
    IntIntHashMap map = new IntIntHashMap(4);
    assertThrows(IllegalArgumentException.class, () -> map.put(-1, 0));
    assertThrows(IllegalArgumentException.class, () -> map.put(Integer.MAX_VALUE, 0));
    assertEquals(0, map.size());
  }
}
