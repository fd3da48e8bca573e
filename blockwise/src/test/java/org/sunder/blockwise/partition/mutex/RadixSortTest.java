package org.sunder.blockwise.partition.mutex;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.api.Test;

class RadixSortTest {

  @Test
  void keyedSortIsStable() {
    Random random = new Random(13);
    int n = 5000;
    long[] keys = new long[n];
    int[] values = new int[n];
    for (int i = 0; i < n; i++) {
      keys[i] = random.nextInt(50) * 0x0101_0000_0000_0001L;
      values[i] = i;
    }
    long[] original = keys.clone();
    RadixSort.sortByKeyUnsigned(keys, values);
    for (int i = 1; i < n; i++) {
      int c = Long.compareUnsigned(keys[i - 1], keys[i]);
      assertEquals(true, c < 0 || (c == 0 && values[i - 1] < values[i]));
      assertEquals(original[values[i]], keys[i]);
    }
  }
}
