package org.sunder.blockwise.grid;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Random;
import org.junit.jupiter.api.Test;

class ShapesTest {

  @Test
  void elementCountIsTheProductOfExtents() {
    Random random = new Random(3);
    for (int trial = 0; trial < 100; trial++) {
      int[] shape = new int[1 + random.nextInt(4)];
      long expected = 1;
      for (int d = 0; d < shape.length; d++) {
        shape[d] = random.nextInt(50);
        expected *= shape[d];
      }
      long[] longShape = java.util.Arrays.stream(shape).asLongStream().toArray();
      assertEquals(expected, Shapes.elementCount(shape));
      assertEquals(expected, Shapes.elementCount(longShape));
      assertEquals(expected, Shapes.intElementCount(shape));
    }
    assertEquals(1, Shapes.elementCount(new int[0]), "an empty product is 1");
  }

  @Test
  void reversedTurnsMemoryOrderIntoSlowestFirstAndBack() {
    // Zarr's .zarray lists a C-order array's shape slowest axis first (Zarr v2 specification),
    // the reverse of memory order x, y, z: memory [64, 56, 20] is Zarr [20, 56, 64].
    assertArrayEquals(new long[] {20, 56, 64}, Shapes.reversed(new long[] {64, 56, 20}));
    assertArrayEquals(new int[] {5, 14, 16}, Shapes.reversed(new int[] {16, 14, 5}));
    assertArrayEquals(new double[] {32, 8, 4}, Shapes.reversed(new double[] {4, 8, 32}));
    Random random = new Random(5);
    for (int trial = 0; trial < 50; trial++) {
      long[] shape = random.longs(1 + random.nextInt(5), 1, 1000).toArray();
      long[] back = Shapes.reversed(shape);
      for (int d = 0; d < shape.length; d++) {
        assertEquals(shape[d], back[shape.length - 1 - d]);
      }
      assertArrayEquals(shape, Shapes.reversed(back), "twice is the identity");
    }
  }

  @Test
  void overflowAndNegativeExtentsAreRefused() {
    assertThrows(ArithmeticException.class,
        () -> Shapes.elementCount(new long[] {1L << 40, 1L << 40}));
    assertThrows(ArithmeticException.class,
        () -> Shapes.intElementCount(new int[] {1 << 16, 1 << 16}));
    assertThrows(IllegalArgumentException.class, () -> Shapes.elementCount(new int[] {4, -1}));
  }
}
