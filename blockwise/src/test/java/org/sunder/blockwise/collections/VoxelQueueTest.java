package org.sunder.blockwise.collections;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Comparator;
import java.util.PriorityQueue;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link VoxelQueue} against {@link PriorityQueue} with the order it promises spelled out as a
 * {@link Comparator}: by priority (as {@link Float#compare}, with −0 and 0 equal), then by voxel
 * index, or for the flood queue by arrival. Random seeded pushes and pops, with many ties.
 */
class VoxelQueueTest {

  private record Entry(float priority, int voxel, int arrival) {}

  private static final Comparator<Entry> BY_PRIORITY =
      Comparator.comparingDouble(e -> e.priority() + 0f);

  @Test
  void popsByPriorityThenVoxelIndex() {
    Random random = new Random(13);
    VoxelQueue queue = new VoxelQueue(1);
    PriorityQueue<Entry> reference =
        new PriorityQueue<>(BY_PRIORITY.thenComparingInt(Entry::voxel));
    for (int step = 0; step < 40000; step++) {
      if (reference.isEmpty() || random.nextInt(5) < 3) {
        float priority = priority(random);
        int voxel = random.nextInt(step < 20000 ? 50 : Integer.MAX_VALUE);
        queue.push(priority, voxel);
        reference.add(new Entry(priority, voxel, step));
      } else {
        Entry expected = reference.poll();
        assertEquals(expected.priority() + 0f, queue.topPriority(), "at step " + step);
        assertEquals(expected.voxel(), queue.pop(), "at step " + step);
      }
      assertEquals(reference.isEmpty(), queue.isEmpty());
    }
  }

  @Test
  void floodQueuePopsByPriorityThenArrival() {
    Random random = new Random(14);
    int n = 5000;
    float[] priority = new float[n];
    for (int i = 0; i < n; i++) {
      priority[i] = priority(random);
    }
    FloodQueue queue = VoxelQueue.inArrivalOrder(priority, 4);
    PriorityQueue<Entry> reference =
        new PriorityQueue<>(BY_PRIORITY.thenComparingInt(Entry::arrival));
    int arrival = 0;
    for (int step = 0; step < 30000; step++) {
      if (reference.isEmpty() || random.nextBoolean()) {
        int voxel = random.nextInt(n);
        queue.push(voxel);
        reference.add(new Entry(priority[voxel], voxel, arrival++));
      } else {
        assertEquals(reference.poll().voxel(), queue.pop(), "at step " + step);
      }
    }
    while (!reference.isEmpty()) {
      assertFalse(queue.isEmpty());
      assertEquals(reference.poll().voxel(), queue.pop());
    }
    assertTrue(queue.isEmpty());
  }

  @Test
  void keysRoundTripTheirPriorityAndOrderLikeFloats() {
    Random random = new Random(15);
    float[] special = {0f, -0f, Float.MIN_VALUE, -Float.MIN_VALUE, Float.MAX_VALUE,
        -Float.MAX_VALUE, Float.POSITIVE_INFINITY, Float.NEGATIVE_INFINITY, 1f, -1f};
    for (int k = 0; k < 20000; k++) {
      float a = k < special.length ? special[k] : Float.intBitsToFloat(random.nextInt());
      float b = special[random.nextInt(special.length)];
      if (Float.isNaN(a)) {
        continue;
      }
      assertEquals(a + 0f, VoxelQueue.priority(VoxelQueue.key(a, random.nextInt())));
      int tie = random.nextInt();
      assertEquals(Integer.signum(Float.compare(a + 0f, b + 0f)),
          Long.signum(Long.compare(VoxelQueue.key(a, tie), VoxelQueue.key(b, tie))),
          a + " against " + b);
    }
  }

  /** Priorities with many ties and both signs of zero. */
  private static float priority(Random random) {
    return switch (random.nextInt(4)) {
      case 0 -> random.nextInt(8) * 0.25f;
      case 1 -> random.nextBoolean() ? 0f : -0f;
      case 2 -> -random.nextInt(8);
      default -> random.nextFloat();
    };
  }
}
