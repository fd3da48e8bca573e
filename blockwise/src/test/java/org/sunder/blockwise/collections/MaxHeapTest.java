package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.PriorityQueue;
import java.util.Random;
import org.junit.jupiter.api.Test;

class MaxHeapTest {
  private record Entry(double key, long tie, int payload) {}

  /** Reference: the JDK's binary heap with the same order (largest key, then smallest tie). */
  private static PriorityQueue<Entry> reference() {
    return new PriorityQueue<>((a, b) -> a.key != b.key ? Double.compare(b.key, a.key)
        : Long.compare(a.tie, b.tie));
  }

  @Test
  void popsInTheOrderOfTheJdkPriorityQueueUnderRandomPushesAndPops() {
    Random random = new Random(7);
    for (int trial = 0; trial < 30; trial++) {
      MaxHeap heap = new MaxHeap(1 + random.nextInt(8));
      PriorityQueue<Entry> expected = reference();
      int payload = 0;
      for (int step = 0; step < 3000; step++) {
        if (expected.isEmpty() || random.nextInt(3) > 0) {
          // few distinct keys, so that ties decide often; ties unique per entry
          Entry e = new Entry(random.nextInt(20) - 10, random.nextLong(), payload++);
          heap.push(e.key, e.tie, e.payload);
          expected.add(e);
        } else {
          Entry top = expected.poll();
          assertEquals(top.key, heap.topKey());
          assertEquals(top.tie, heap.topTie());
          assertEquals(top.payload, heap.topPayload());
          heap.pop();
        }
      }
      while (!expected.isEmpty()) {
        assertEquals(expected.poll().payload, heap.topPayload());
        heap.pop();
      }
      assertTrue(heap.isEmpty());
    }
  }

  @Test
  void clearEmptiesAndTheHeapIsReusable() {
    MaxHeap heap = new MaxHeap(2);
    for (int i = 0; i < 100; i++) {
      heap.push(i, i, i);
    }
    heap.clear();
    assertTrue(heap.isEmpty());
    heap.push(1.5, 3, 30);
    heap.push(1.5, 2, 20);
    heap.push(-4, 0, 0);
    assertEquals(20, heap.topPayload(), "equal keys: the smaller tie first");
    heap.pop();
    assertEquals(30, heap.topPayload());
    heap.pop();
    assertEquals(0, heap.topPayload());
    heap.pop();
    assertTrue(heap.isEmpty());
  }
}
