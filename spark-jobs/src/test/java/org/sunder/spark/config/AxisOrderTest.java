package org.sunder.spark.config;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class AxisOrderTest {
  @Test
  void zyxIsTheReverseOfMemoryOrder() {
    assertArrayEquals(new int[] {40, 20, 10}, AxisOrder.ZYX.toMemory(new int[] {10, 20, 40}));
    assertArrayEquals(new long[] {10, 20, 40}, AxisOrder.ZYX.toFile(new long[] {40, 20, 10}));
  }

  @Test
  void otherPermutationsRoundTrip() {
    AxisOrder xzy = new AxisOrder("xzy");
    int[] file = {7, 3, 5};
    int[] memory = xzy.toMemory(file);
    assertArrayEquals(new int[] {7, 5, 3}, memory);
    assertArrayEquals(file, xzy.toFile(memory));
    assertArrayEquals(new int[] {9, 4}, new AxisOrder("yx").toMemory(new int[] {4, 9}));
  }

  @Test
  void rejectsNonPermutations() {
    assertThrows(ConfigException.class, () -> new AxisOrder("zyz"));
    assertThrows(ConfigException.class, () -> new AxisOrder("zx"));
    assertThrows(ConfigException.class, () -> new AxisOrder("tzyx"));
  }
}
