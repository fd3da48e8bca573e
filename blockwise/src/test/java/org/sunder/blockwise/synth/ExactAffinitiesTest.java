package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

class ExactAffinitiesTest {

  @Test
  void handExampleAlongX() {
    // x: 1 1 2 0 0, one row; offset +1 along x
    long[] labels = {1, 1, 2, 0, 0};
    float[] a = ExactAffinities.compute(labels, new long[] {5, 1, 1},
        new int[][] {{1, 0, 0}, {-2, 0, 0}});
    assertArrayEquals(new float[] {1, 0, 0, 0, 0, /* -2: */ 0, 0, 0, 0, 0}, a);
  }

  @Test
  void matchesAVoxelByVoxelDefinitionOnRandomLabels() {
    Random random = new Random(13);
    long[] shape = {7, 5, 4};
    int n = 7 * 5 * 4;
    long[] labels = new long[n];
    for (int i = 0; i < n; i++) {
      labels[i] = random.nextInt(5) == 0 ? 0 : 1 + random.nextInt(3);
    }
    int[][] offsets = {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {-3, 0, 0}, {0, -2, 1}, {2, 2, -1}};
    float[] a = ExactAffinities.compute(labels, shape, offsets);
    int ones = 0;
    for (int k = 0; k < offsets.length; k++) {
      for (int z = 0; z < 4; z++) {
        for (int y = 0; y < 5; y++) {
          for (int x = 0; x < 7; x++) {
            int qx = x + offsets[k][0];
            int qy = y + offsets[k][1];
            int qz = z + offsets[k][2];
            int p = x + 7 * (y + 5 * z);
            boolean inside = qx >= 0 && qy >= 0 && qz >= 0 && qx < 7 && qy < 5 && qz < 4;
            float expected = inside && labels[p] != 0
                && labels[p] == labels[qx + 7 * (qy + 5 * qz)] ? 1 : 0;
            assertEquals(expected, a[p + k * n], "channel " + k + " at " + x + "," + y + "," + z);
            ones += (int) expected;
          }
        }
      }
    }
    assertTrue(ones > 50, "the example has attractive edges: " + ones);
    byte[] bytes = ExactAffinities.toUint8(a);
    for (int i = 0; i < a.length; i++) {
      assertEquals(a[i] == 1 ? 255 : 0, bytes[i] & 0xFF);
    }
  }

  @Test
  void quantizesToBytesByRounding() {
    assertArrayEquals(new byte[] {0, (byte) 128, (byte) 255, 0, (byte) 255, 3},
        ExactAffinities.toUint8(new float[] {0, 0.5f, 1, -0.2f, 1.7f, 0.01f}));
  }

  @Test
  void rejectsBadOffsetsNamingThem() {
    long[] labels = new long[8];
    long[] shape = {2, 2, 2};
    SunderException zero = assertThrows(SunderException.class,
        () -> ExactAffinities.compute(labels, shape, new int[][] {{1, 0, 0}, {0, 0, 0}}));
    assertEquals(ErrorKind.INVALID_CONFIG, zero.kind());
    assertTrue(zero.getMessage().contains("offsets[1] = [0, 0, 0]"), zero.getMessage());
    SunderException wrongLength = assertThrows(SunderException.class,
        () -> ExactAffinities.compute(labels, shape, new int[][] {{1, 0}}));
    assertTrue(wrongLength.getMessage().contains("expected 3 integers"));
  }
}
