package org.sunder.blockwise.grid;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigInteger;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

class IdLayoutTest {

  @Test
  void localBitsFitTheLargestCore() {
    BlockGrid grid = BlockGrid.of(new long[] {100, 70, 50}, new int[] {16, 16, 8},
        new int[] {32, 32, 16}, new int[] {4, 4, 2});
    IdLayout layout = IdLayout.forGrid(grid);
    // 32 * 32 * 16 = 16384 = 2^14 voxels need 15 bits.
    assertEquals(15, layout.localBits());
    assertEquals(48, layout.blockBits());
  }

  @Test
  void provisionalIdsRoundTripAndStayAboveTwoToThe63() {
    IdLayout layout = new IdLayout(20);
    Random random = new Random(13);
    BigInteger twoTo63 = BigInteger.ONE.shiftLeft(63);
    for (int i = 0; i < 10_000; i++) {
      int block = random.nextInt(Integer.MAX_VALUE);
      long local = 1 + random.nextInt((1 << 20) - 1);
      long id = layout.provisional(block, local);
      assertEquals(block, layout.blockOf(id));
      assertEquals(local, layout.localOf(id));
      assertTrue(IdLayout.isProvisional(id));
      assertFalse(IdLayout.isFinal(id));
      // As an unsigned 64-bit value (uint64 in the dataset) the id is >= 2^63.
      assertTrue(new BigInteger(Long.toUnsignedString(id)).compareTo(twoTo63) >= 0);
    }
    assertTrue(IdLayout.isFinal(1));
    assertTrue(IdLayout.isFinal(IdLayout.maxFinalId()));
    assertFalse(IdLayout.isProvisional(0));
    assertFalse(IdLayout.isFinal(0));
  }

  @Test
  void distinctSegmentsGetDistinctIds() {
    IdLayout layout = new IdLayout(3);
    java.util.Set<Long> ids = new java.util.HashSet<>();
    for (int block = 0; block < 50; block++) {
      for (long local = 1; local <= layout.maxLocalId(); local++) {
        assertTrue(ids.add(layout.provisional(block, local)));
      }
    }
  }

  @Test
  void outOfRangeLocalIdsAreRejected() {
    IdLayout layout = new IdLayout(4);
    assertThrows(SunderException.class, () -> layout.provisional(0, 16));
    assertThrows(SunderException.class, () -> layout.provisional(0, 0));
    assertThrows(SunderException.class, () -> new IdLayout(0));
  }

  @Test
  void tooManyBlocksForTheBitsIsAConfigError() {
    // 2^21 voxel cores need 22 local bits; 2^31 - 1 blocks need 31 bits: 53 <= 63 fits.
    BlockGrid fits = BlockGrid.of(new long[] {1L << 20, 1L << 20, 1L << 11},
        new int[] {128, 128, 128}, new int[] {128, 128, 128}, new int[] {0, 0, 0});
    assertEquals(22, IdLayout.forGrid(fits).localBits());
    // 2^40 voxel cores need 41 local bits; 2^23 blocks need 23 bits: 64 > 63.
    BlockGrid huge = BlockGrid.of(new long[] {1L << 22, 1L << 21, 1L << 20},
        new int[] {1 << 14, 1 << 13, 1 << 13}, new int[] {1 << 14, 1 << 13, 1 << 13},
        new int[] {0, 0, 0});
    SunderException e = assertThrows(SunderException.class, () -> IdLayout.forGrid(huge));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("63"), e.getMessage());
  }
}
