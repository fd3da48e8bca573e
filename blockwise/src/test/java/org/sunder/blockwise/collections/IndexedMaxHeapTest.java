package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Comparator;
import java.util.Random;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;

class IndexedMaxHeapTest {
  private record Entry(double key, long tie, int item) {}

  /**
   * Reference: the JDK's red-black tree ordered as the heap (largest key, then smallest tie),
   * under random inserts, re-keys up and down, removals and pops; few distinct keys, so ties
   * decide often (each tie unique, so the order is total).
   */
  @Test
  void popsInTheOrderOfTheJdkTreeUnderRandomChanges() {
    Random random = new Random(11);
    Comparator<Entry> order = Comparator.comparingDouble((Entry e) -> -e.key)
        .thenComparingLong(e -> e.tie).thenComparingInt(e -> e.item);
    for (int trial = 0; trial < 30; trial++) {
      int capacity = 1 + random.nextInt(trial < 10 ? 8 : 300);
      IndexedMaxHeap heap = new IndexedMaxHeap(capacity);
      TreeSet<Entry> expected = new TreeSet<>(order);
      Entry[] current = new Entry[capacity];
      for (int step = 0; step < 4000; step++) {
        int item = random.nextInt(capacity);
        int action = random.nextInt(4);
        if (action <= 1) {
          Entry e = new Entry(random.nextInt(12) - 6, random.nextInt(5) * 100_000L + step, item);
          if (current[item] != null) {
            expected.remove(current[item]);
          }
          expected.add(e);
          current[item] = e;
          heap.set(item, e.key, e.tie);
        } else if (action == 2) {
          if (current[item] != null) {
            expected.remove(current[item]);
            current[item] = null;
          }
          heap.remove(item);
        } else if (!expected.isEmpty()) {
          Entry top = expected.pollFirst();
          current[top.item] = null;
          assertEquals(top.item, heap.pop(), "trial " + trial + " step " + step);
        }
        assertEquals(expected.size(), heap.size());
        assertEquals(current[item] != null, heap.contains(item));
      }
      while (!expected.isEmpty()) {
        assertEquals(expected.pollFirst().item, heap.pop());
      }
      assertTrue(heap.isEmpty());
    }
  }

  @Test
  void anItemIsHeldOnceAndGoneAfterItsPop() {
    IndexedMaxHeap heap = new IndexedMaxHeap(4);
    heap.set(2, 1.0, 0);
    heap.set(2, 3.0, 0);
    heap.set(1, 2.0, 0);
    heap.set(3, 2.0, -1);
    assertEquals(3, heap.size());
    assertEquals(2, heap.pop());
    assertEquals(3, heap.pop(), "equal keys: the smaller tie first");
    assertFalse(heap.contains(2));
    heap.remove(2);
    assertEquals(1, heap.pop());
    assertTrue(heap.isEmpty());
  }
}
