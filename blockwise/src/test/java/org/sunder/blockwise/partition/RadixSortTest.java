package org.sunder.blockwise.partition;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

class RadixSortTest {

  @Test
  void inPlaceSortEqualsUnsignedOrder() {
    Random random = new Random(13);
    for (int trial = 0; trial < 20; trial++) {
      int n = random.nextInt(20000);
      long[] a = new long[n];
      long narrow = trial % 3 == 0 ? 0xFFFFL : -1L;
      for (int i = 0; i < n; i++) {
        a[i] = random.nextLong() & narrow;
        if (trial % 4 == 1) {
          a[i] |= 0x7F00_0000_0000_0000L;
        }
      }
      long[] expected = a.clone();
      for (int i = 0; i < n; i++) {
        expected[i] ^= Long.MIN_VALUE;
      }
      Arrays.sort(expected);
      for (int i = 0; i < n; i++) {
        expected[i] ^= Long.MIN_VALUE;
      }
      RadixSort.sortUnsigned(a, 0, n);
      assertArrayEquals(expected, a);
    }
  }

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
