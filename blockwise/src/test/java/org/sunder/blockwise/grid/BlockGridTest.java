package org.sunder.blockwise.grid;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;

class BlockGridTest {

  private static final long[] VOLUME = {37, 22, 13};
  private static final int[] CHUNK = {8, 5, 4};
  private static final int[] BLOCK = {16, 10, 8};
  private static final int[] HALO = {3, 2, 1};

  private final BlockGrid grid = BlockGrid.of(VOLUME, CHUNK, BLOCK, HALO);

  @Test
  void gridShapeCountsCutOffBorderBlocks() {
    assertArrayEquals(new long[] {3, 3, 2}, grid.gridShape());
    assertEquals(18, grid.blockCount());
    Block last = grid.block(17);
    assertArrayEquals(new long[] {2, 2, 1}, last.gridPosition());
    assertArrayEquals(new long[] {32, 20, 8}, last.coreMin());
    assertArrayEquals(new long[] {36, 21, 12}, last.coreMax());
    assertArrayEquals(new int[] {5, 2, 5}, last.coreShape());
    assertArrayEquals(new long[] {29, 18, 7}, last.extendedMin());
    assertArrayEquals(new long[] {36, 21, 12}, last.extendedMax());
  }

  @Test
  void everyVoxelIsInExactlyOneCoreAndInsideItsExtendedBox() {
    int[] owner = new int[(int) (VOLUME[0] * VOLUME[1] * VOLUME[2])];
    for (Block block : grid.blocks()) {
      long[] min = block.coreMin();
      long[] max = block.coreMax();
      long[] emin = block.extendedMin();
      long[] emax = block.extendedMax();
      for (int d = 0; d < 3; d++) {
        assertEquals(Math.max(0, min[d] - HALO[d]), emin[d]);
        assertEquals(Math.min(VOLUME[d] - 1, max[d] + HALO[d]), emax[d]);
      }
      for (long z = min[2]; z <= max[2]; z++) {
        for (long y = min[1]; y <= max[1]; y++) {
          for (long x = min[0]; x <= max[0]; x++) {
            owner[(int) (x + VOLUME[0] * (y + VOLUME[1] * z))]++;
            long[] p = {x, y, z};
            assertEquals(block.index(), grid.blockIndexOfVoxel(p));
            assertTrue(block.coreContains(p));
          }
        }
      }
    }
    for (int count : owner) {
      assertEquals(1, count);
    }
  }

  @Test
  void facesJoinAdjacentCoresOnceEach() {
    // The number of faces of a g0 x g1 x g2 grid is (g0-1) g1 g2 + g0 (g1-1) g2 + g0 g1 (g2-1).
    assertEquals(2 * 3 * 2 + 3 * 2 * 2 + 3 * 3 * 1, grid.faceCount());
    Set<String> pairs = new HashSet<>();
    int previousLower = -1;
    int previousAxis = 0;
    for (Face face : grid.faces()) {
      assertTrue(pairs.add(face.lowerBlock() + "-" + face.upperBlock()));
      Block lower = grid.block(face.lowerBlock());
      Block upper = grid.block(face.upperBlock());
      long[] gl = lower.gridPosition();
      long[] gu = upper.gridPosition();
      for (int d = 0; d < 3; d++) {
        assertEquals(gl[d] + (d == face.axis() ? 1 : 0), gu[d]);
        if (d != face.axis()) {
          assertEquals(lower.coreMin()[d], face.lateralMin()[d]);
          assertEquals(lower.coreMax()[d], face.lateralMax()[d]);
        }
      }
      assertEquals(lower.coreMax()[face.axis()] + 1, face.position());
      assertEquals(upper.coreMin()[face.axis()], face.position());
      assertEquals(face.index(), grid.faceIndex(face.lowerBlock(), face.axis()));
      assertEquals(face.index(), grid.faceIndex(face.upperBlock(), face.axis(), false));
      if (face.axis() == previousAxis) {
        assertTrue(face.lowerBlock() > previousLower, "faces ordered by lower block");
      }
      previousAxis = face.axis();
      previousLower = face.lowerBlock();
    }
    assertEquals(-1, grid.faceIndex(2, 0));
    assertEquals(-1, grid.faceIndex(0, 1, false));
  }

  @Test
  void faceIndicesOfABlockAreItsNeighbours() {
    Block centre = grid.block(grid.blockIndex(new long[] {1, 1, 0}));
    int[] faces = grid.faceIndicesOf(centre.index());
    assertEquals(5, faces.length);
    for (int f : faces) {
      Face face = grid.face(f);
      assertTrue(face.lowerBlock() == centre.index() || face.upperBlock() == centre.index());
    }
    assertEquals(3, grid.faceIndicesOf(0).length);
  }

  @Test
  void chunksOfCoresCoverTheChunkGridOnce() {
    assertArrayEquals(new long[] {5, 5, 4}, grid.chunkGridShape());
    Set<String> seen = new HashSet<>();
    for (int b = 0; b < grid.blockCount(); b++) {
      for (long[] chunk : grid.chunkPositionsOf(b)) {
        assertTrue(seen.add(chunk[0] + "," + chunk[1] + "," + chunk[2]));
      }
    }
    assertEquals(grid.chunkCount(), seen.size());
    assertArrayEquals(new long[] {1, 2, 3}, grid.chunkPosition(1 + 5 * (2 + 5 * 3)));
  }

  @Test
  void blockNotAMultipleOfTheChunkShapeSuggestsNearestShapes() {
    SunderException e = assertThrows(SunderException.class,
        () -> BlockGrid.of(VOLUME, CHUNK, new int[] {20, 10, 6}, HALO));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("[20, 10, 6]"), e.getMessage());
    assertTrue(e.getMessage().contains("[16, 10, 4] or [24, 10, 8]"), e.getMessage());
  }

  @Test
  void badShapesAreConfigErrors() {
    assertEquals(ErrorKind.INVALID_CONFIG, assertThrows(SunderException.class,
        () -> BlockGrid.of(VOLUME, CHUNK, BLOCK, new int[] {1, -1, 0})).kind());
    assertEquals(ErrorKind.INVALID_CONFIG, assertThrows(SunderException.class,
        () -> BlockGrid.of(VOLUME, new int[] {8, 5}, BLOCK, HALO)).kind());
    assertEquals(ErrorKind.INVALID_CONFIG, assertThrows(SunderException.class,
        () -> BlockGrid.of(new long[] {37, 0, 13}, CHUNK, BLOCK, HALO)).kind());
  }

  @Test
  void shortHaloIsReportedNotRejected() {
    Offsets offsets = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0},
        new int[] {0, 0, -1}, new int[] {-4, 0, 0}, new int[] {0, 2, -3});
    List<HaloShortfall> shortfalls = grid.haloShortfalls(offsets.reach());
    assertEquals(List.of(new HaloShortfall(0, 3, 4), new HaloShortfall(2, 1, 3)), shortfalls);
    assertTrue(shortfalls.get(0).message().contains("axis x"));
    assertTrue(grid.haloShortfalls(new int[] {1, 0, 0}).isEmpty());
  }

  @Test
  void oneBlockLargerThanTheVolumeCoversIt() {
    BlockGrid single = BlockGrid.of(VOLUME, CHUNK, new int[] {40, 25, 16}, HALO);
    assertEquals(1, single.blockCount());
    assertEquals(0, single.faceCount());
    Block only = single.block(0);
    assertArrayEquals(new long[] {36, 21, 12}, only.coreMax());
    assertArrayEquals(only.coreMin(), only.extendedMin());
    assertArrayEquals(only.coreMax(), only.extendedMax());
  }

  @Test
  void randomGridsPartitionTheirVolume() {
    Random random = new Random(13);
    for (int trial = 0; trial < 200; trial++) {
      int n = 1 + random.nextInt(3);
      long[] volume = new long[n];
      int[] chunk = new int[n];
      int[] block = new int[n];
      int[] halo = new int[n];
      for (int d = 0; d < n; d++) {
        volume[d] = 1 + random.nextInt(40);
        chunk[d] = 1 + random.nextInt(6);
        block[d] = chunk[d] * (1 + random.nextInt(4));
        halo[d] = random.nextInt(5);
      }
      BlockGrid g = BlockGrid.of(volume, chunk, block, halo);
      long voxels = 0;
      for (Block b : g.blocks()) {
        voxels += b.coreVoxelCount();
        assertEquals(b.index(), g.blockIndex(b.gridPosition()));
        assertEquals(b, g.block(b.index()));
      }
      assertEquals(java.util.Arrays.stream(volume).reduce(1, (a, c) -> a * c), voxels);
      int faces = 0;
      for (int b = 0; b < g.blockCount(); b++) {
        faces += g.faceIndicesOf(b).length;
      }
      assertEquals(2 * g.faceCount(), faces);
      for (int f = 0; f < g.faceCount(); f++) {
        assertEquals(f, g.face(f).index());
      }
      assertFalse(g.faceCount() < 0);
    }
  }
}
