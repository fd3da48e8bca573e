package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;

class FinalIdMapTest {
  private final IdLayout layout = new IdLayout(8);
  private final FinalIdMap map = new FinalIdMap(layout,
      new long[][] {{0, 1, 2}, {0, 2, 3, 1}}, 3);

  @Test
  void mapsProvisionalIdsAndLeavesOthersAlone() {
    long[] labels = {0, layout.provisional(0, 2), layout.provisional(1, 3), 5,
        layout.provisional(1, 1)};
    assertEquals(3, map.applyInPlace(labels));
    assertArrayEquals(new long[] {0, 2, 1, 5, 2}, labels);
    long[] again = labels.clone();
    assertEquals(0, map.applyInPlace(again));
    assertArrayEquals(labels, again);
    assertEquals(5, map.provisionalCount());
  }

  @Test
  void provisionalIdOfAnotherRunIsReported() {
    SunderException e = assertThrows(SunderException.class,
        () -> map.apply(layout.provisional(1, 7)));
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertEquals(true, e.getMessage().contains("block 1, local id 7"), e.getMessage());
    assertThrows(SunderException.class, () -> map.apply(layout.provisional(4, 1)));
  }
}
