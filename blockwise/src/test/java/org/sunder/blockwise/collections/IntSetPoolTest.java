package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;

class IntSetPoolTest {

  /** Random operations on many sets against java.util.HashSet, the reference. */
  @Test
  void randomOperationsMatchHashSets() {
    Random random = new Random(29);
    for (int trial = 0; trial < 20; trial++) {
      int sets = 1 + random.nextInt(40);
      // small value ranges give many duplicates and removals of present values
      int range = trial % 2 == 0 ? 1 + random.nextInt(30) : 1 + random.nextInt(100_000);
      IntSetPool pool = new IntSetPool(sets, random.nextInt(64));
      List<Set<Integer>> reference = new ArrayList<>();
      for (int s = 0; s < sets; s++) {
        reference.add(new HashSet<>());
      }
      for (int op = 0; op < 20_000; op++) {
        int s = random.nextInt(sets);
        int value = random.nextInt(range);
        Set<Integer> r = reference.get(s);
        switch (random.nextInt(10)) {
          case 0, 1, 2, 3 -> assertEquals(r.add(value), pool.add(s, value));
          case 4, 5, 6 -> assertEquals(r.remove(value), pool.remove(s, value));
          case 7, 8 -> assertEquals(r.contains(value), pool.contains(s, value));
          default -> {
            if (random.nextInt(50) == 0) {
              r.clear();
              pool.clear(s);
            }
          }
        }
        assertEquals(r.size(), pool.size(s));
      }
      for (int s = 0; s < sets; s++) {
        assertEquals(reference.get(s), members(pool, s), "trial " + trial + " set " + s);
      }
    }
  }

  /**
   * Sets growing and shrinking across the two members kept in the record (and back after a
   * clear), against java.util.HashSet; tags stay put and prefetch changes nothing.
   */
  @Test
  void smallSetsAcrossTheInlineLimitMatchHashSets() {
    Random random = new Random(37);
    int sets = 300;
    IntSetPool pool = new IntSetPool(sets, 0);
    List<Set<Integer>> reference = new ArrayList<>();
    for (int s = 0; s < sets; s++) {
      reference.add(new HashSet<>());
      pool.setTag(s, -s);
    }
    for (int op = 0; op < 200_000; op++) {
      int s = random.nextInt(sets);
      // values 0 .. 5 and one far value: sets of 0 to 7 members, often 2 or 3
      int value = random.nextInt(7) == 0 ? Integer.MAX_VALUE - 1 : random.nextInt(6);
      Set<Integer> r = reference.get(s);
      switch (random.nextInt(12)) {
        case 0, 1, 2, 3 -> assertEquals(r.add(value), pool.add(s, value));
        case 4, 5, 6 -> assertEquals(r.remove(value), pool.remove(s, value));
        case 7, 8 -> assertEquals(r.contains(value), pool.contains(s, value));
        case 9 -> pool.prefetch(s, value);
        case 10 -> assertEquals(r, members(pool, s), "set " + s + " at op " + op);
        default -> {
          if (random.nextInt(10) == 0) {
            r.clear();
            pool.clear(s);
          }
        }
      }
      assertEquals(r.size(), pool.size(s));
    }
    for (int s = 0; s < sets; s++) {
      assertEquals(reference.get(s), members(pool, s), "set " + s);
      assertEquals(-s, pool.tag(s));
    }
  }

  /** Growth to large tables, then removal of everything (backward shift over long runs). */
  @Test
  void growsAndShrinksToEmpty() {
    IntSetPool pool = new IntSetPool(3, 0);
    Random random = new Random(31);
    Set<Integer> reference = new HashSet<>();
    for (int i = 0; i < 50_000; i++) {
      int v = random.nextInt(Integer.MAX_VALUE - 1);
      assertEquals(reference.add(v), pool.add(1, v));
    }
    assertEquals(reference, members(pool, 1));
    assertEquals(0, pool.size(0));
    assertEquals(0, pool.size(2));
    for (int v : reference) {
      assertTrue(pool.remove(1, v));
      assertFalse(pool.contains(1, v));
    }
    assertEquals(0, pool.size(1));
    assertFalse(pool.remove(1, 7));
  }

  /** Freed tables are reused: refilling cleared sets does not grow the pool. */
  @Test
  void clearedTablesAreReused() {
    IntSetPool pool = new IntSetPool(100, 0);
    for (int s = 0; s < 100; s++) {
      for (int v = 0; v < 20; v++) {
        pool.add(s, v * 7 + s);
      }
    }
    long footprint = pool.poolLength();
    for (int round = 0; round < 5; round++) {
      for (int s = 0; s < 100; s++) {
        pool.clear(s);
        assertEquals(0, pool.size(s));
        assertFalse(pool.contains(s, s));
      }
      for (int s = 0; s < 100; s++) {
        for (int v = 0; v < 20; v++) {
          assertTrue(pool.add(s, v * 11 + round));
        }
      }
      assertEquals(footprint, pool.poolLength());
    }
  }

  /** A set outgrowing a page (2^20 slots) gets a page of its own; small sets go on around it. */
  @Test
  void tablesLargerThanAPage() {
    IntSetPool pool = new IntSetPool(3, 0);
    int big = 1_000_000;
    for (int v = 0; v < big; v++) {
      assertTrue(pool.add(1, 3 * v));
      if (v % 1000 == 0) {
        assertTrue(pool.add(0, v));
        assertTrue(pool.add(2, v + 1));
      }
    }
    assertEquals(big, pool.size(1));
    assertTrue(pool.poolLength() >= 2 * big, "table of 2^21 slots at most 3/4 full");
    for (int v = 0; v < big; v += 7) {
      assertTrue(pool.contains(1, 3 * v));
      assertFalse(pool.contains(1, 3 * v + 1));
    }
    for (int v = 0; v < big; v += 1000) {
      assertTrue(pool.contains(0, v));
      assertTrue(pool.contains(2, v + 1));
      assertFalse(pool.contains(2, v));
    }
    for (int v = 0; v < big; v += 2) {
      assertTrue(pool.remove(1, 3 * v));
    }
    assertEquals(big / 2, pool.size(1));
    assertEquals(big / 2, members(pool, 1).size());
  }

  @Test
  void tagsAndBadValues() {
    IntSetPool pool = new IntSetPool(2, 4);
    assertEquals(0, pool.tag(1));
    pool.setTag(1, 42);
    pool.add(1, 0);
    pool.clear(1);
    assertEquals(42, pool.tag(1));
    assertEquals(2, pool.setCount());
    assertTrue(pool.add(0, Integer.MAX_VALUE - 1));
    assertTrue(pool.contains(0, Integer.MAX_VALUE - 1));
    assertThrows(IllegalArgumentException.class, () -> pool.add(0, -1));
    assertThrows(IllegalArgumentException.class, () -> pool.add(0, Integer.MAX_VALUE));
    assertThrows(IllegalArgumentException.class, () -> new IntSetPool(-1, 0));
  }

  private static Set<Integer> members(IntSetPool pool, int set) {
    int[] target = new int[pool.size(set)];
    int n = pool.copyTo(set, target);
    assertEquals(target.length, n);
    Set<Integer> result = new HashSet<>();
    Arrays.stream(target).forEach(result::add);
    assertEquals(n, result.size(), "members are distinct");
    return result;
  }
}
