package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.HashMap;
import java.util.HashSet;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * {@link PairSet} and {@link PairMap} (the partition package's pair maps) against
 * {@link HashSet} and {@link HashMap} on random seeded operations, with many removals so that
 * deletions inside probe chains happen.
 */
class PairMapTest {

  @Test
  void pairPacksUnorderedPairsUniquely() {
    Random random = new Random(13);
    Map<Long, String> seen = new HashMap<>();
    for (int k = 0; k < 20000; k++) {
      int a = random.nextInt(k < 10000 ? 200 : Integer.MAX_VALUE);
      int b = random.nextInt(k < 10000 ? 200 : Integer.MAX_VALUE);
      long packed = PairSet.pair(a, b);
      assertEquals(packed, PairSet.pair(b, a));
      String pair = Math.min(a, b) + "," + Math.max(a, b);
      String before = seen.putIfAbsent(packed, pair);
      assertEquals(before == null ? pair : before, pair, "two pairs share a key");
    }
  }

  @Test
  void pairSetAgreesWithHashSet() {
    Random random = new Random(14);
    PairSet set = new PairSet(2);
    Set<Long> reference = new HashSet<>();
    for (int step = 0; step < 60000; step++) {
      long key = PairSet.pair(random.nextInt(70), random.nextInt(70));
      switch (random.nextInt(3)) {
        case 0 -> assertEquals(reference.add(key), set.add(key), "add at step " + step);
        case 1 -> assertEquals(reference.remove(key), set.remove(key), "remove at step " + step);
        default -> assertEquals(reference.contains(key), set.contains(key), "at step " + step);
      }
      assertEquals(reference.size(), set.size());
    }
  }

  @Test
  void pairMapAgreesWithHashMapAndAnswersMinusOneWhenAbsent() {
    Random random = new Random(15);
    PairMap map = new PairMap(0);
    Map<Long, Integer> reference = new HashMap<>();
    for (int step = 0; step < 60000; step++) {
      long key = PairSet.pair(random.nextInt(80), random.nextInt(80));
      int expected = reference.getOrDefault(key, -1);
      switch (random.nextInt(3)) {
        case 0 -> {
          int value = random.nextInt(1 << 20);
          assertEquals(expected, map.put(key, value), "put at step " + step);
          reference.put(key, value);
        }
        case 1 -> {
          assertEquals(expected, map.remove(key), "remove at step " + step);
          reference.remove(key);
        }
        default -> assertEquals(expected, map.get(key), "get at step " + step);
      }
      assertEquals(reference.size(), map.size());
    }
  }
}
