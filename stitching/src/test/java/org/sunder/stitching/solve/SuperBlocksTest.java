package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.ObjectInputStream;
import java.io.ObjectOutputStream;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;

/**
 * {@link SuperBlocks#partOfNode}, whose per-level tables are made on first use, against the
 * definition worked out here apart: a block at grid position {@code g} lies in the super-block
 * at {@code g / factor^level} per axis, numbered with axis 0 fastest over
 * {@code ceil(shape / factor^level)} super-blocks per axis.
 */
class SuperBlocksTest {
  private static int reference(long[] position, long[] gridShape, int factor, int level) {
    long span = (long) Math.pow(factor, level);
    long index = 0;
    long stride = 1;
    for (int d = 0; d < gridShape.length; d++) {
      index += position[d] / span * stride;
      stride *= (gridShape[d] + span - 1) / span;
    }
    return (int) index;
  }

  private static BlockGrid randomGrid(Random random) {
    long[] volume = new long[3];
    int[] block = {4, 4, 2};
    for (int d = 0; d < 3; d++) {
      volume[d] = block[d] * (1 + random.nextInt(9)) - random.nextInt(block[d]);
    }
    return BlockGrid.of(volume, block, block, new int[] {1, 1, 1});
  }

  @Test
  void partOfNodeMatchesTheDefinitionAtEveryLevelInAnyOrder() {
    Random random = new Random(61);
    for (int trial = 0; trial < 20; trial++) {
      BlockGrid grid = randomGrid(random);
      IdLayout layout = IdLayout.forGrid(grid);
      int factor = 2 + random.nextInt(2);
      SuperBlocks superBlocks = new SuperBlocks(grid, layout, factor);
      for (int query = 0; query < 400; query++) {
        int level = random.nextInt(6);
        int b = random.nextInt(grid.blockCount());
        long node = layout.provisional(b, 1 + random.nextInt(30));
        int expected = reference(grid.gridPosition(b), grid.gridShape(), factor, level);
        assertEquals(expected, superBlocks.partOfNode(node, level),
            "trial " + trial + ", block " + b + ", level " + level);
        assertEquals(expected, superBlocks.partOfBlock(b, level));
      }
    }
  }

  @Test
  void aDeserializedCopyAnswersTheSame() throws IOException, ClassNotFoundException {
    Random random = new Random(67);
    BlockGrid grid = randomGrid(random);
    IdLayout layout = IdLayout.forGrid(grid);
    SuperBlocks superBlocks = new SuperBlocks(grid, layout, 2);
    superBlocks.partOfNode(layout.provisional(0, 1), 2);
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    try (ObjectOutputStream out = new ObjectOutputStream(bytes)) {
      out.writeObject(superBlocks);
    }
    SuperBlocks copy;
    try (ObjectInputStream in =
        new ObjectInputStream(new ByteArrayInputStream(bytes.toByteArray()))) {
      copy = (SuperBlocks) in.readObject();
    }
    for (int level = 0; level < 4; level++) {
      int[] expected = superBlocks.partsOfBlocks(level);
      int[] actual = new int[grid.blockCount()];
      for (int b = 0; b < actual.length; b++) {
        actual[b] = copy.partOfNode(layout.provisional(b, 1), level);
      }
      assertArrayEquals(expected, actual, "level " + level);
    }
  }

  @Test
  void aNegativeLevelIsRefused() {
    BlockGrid grid = randomGrid(new Random(71));
    SuperBlocks superBlocks = new SuperBlocks(grid, IdLayout.forGrid(grid), 2);
    assertThrows(IllegalArgumentException.class, () -> superBlocks.partOfNode(0, -1));
  }
}
