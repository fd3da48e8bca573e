package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayDeque;
import java.util.Random;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.partition.PartitionFixtures;

class LevelQueueTest {

  /**
   * Random pushes (with and without the level given) and pops, in bursts of up to 2000 so that
   * levels fill and empty many times, against a reference of one JDK {@link ArrayDeque} per
   * priority: voxels leave by ascending priority, equal priorities first in, first out.
   */
  @Test
  void popsLikeOneFifoPerPriorityUnderRandomInterleavings() {
    Random random = new Random(41);
    for (int trial = 0; trial < 6; trial++) {
      int n = 40_000;
      int levels = 1 + random.nextInt(trial % 2 == 0 ? 4 : 300);
      float[] priority = new float[n];
      for (int i = 0; i < n; i++) {
        priority[i] = random.nextInt(levels) / 8f;
      }
      LevelQueue queue = LevelQueue.forPriorities(priority, 4096);
      TreeMap<Float, ArrayDeque<Integer>> reference = new TreeMap<>();
      int[] order = PartitionFixtures.permutation(random, n);
      int pushed = 0;
      int popped = 0;
      while (popped < n) {
        int burst = random.nextInt(2000);
        for (int k = 0; k < burst && pushed < n; k++) {
          int voxel = order[pushed++];
          if (random.nextBoolean()) {
            queue.push(voxel);
          } else {
            queue.push(voxel, queue.level(voxel));
          }
          reference.computeIfAbsent(priority[voxel], p -> new ArrayDeque<>()).add(voxel);
        }
        int drain = pushed == n ? n : random.nextInt(2000);
        for (int k = 0; k < drain && popped < pushed; k++) {
          var lowest = reference.firstEntry();
          int expected = lowest.getValue().poll();
          if (lowest.getValue().isEmpty()) {
            reference.remove(lowest.getKey());
          }
          assertEquals(expected, queue.pop(), "trial " + trial + ", pop " + popped);
          popped++;
        }
      }
      assertTrue(queue.isEmpty());
    }
  }
}
