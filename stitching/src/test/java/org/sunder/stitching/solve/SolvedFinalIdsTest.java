package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.task.BlockSummary;

/** Final ids numbered per block from the solved segments equal the driver's single map. */
class SolvedFinalIdsTest {
  private static final IdLayout LAYOUT = new IdLayout(20);

  @TempDir
  Path dir;

  private static BlockSummary summary(int block, int segments, int[] boundary) {
    long[] sizes = new long[segments];
    Arrays.fill(sizes, 1);
    return new BlockSummary(block, sizes, boundary, new int[boundary.length],
        new long[boundary.length], EdgeStatistics.empty(), new long[0], new long[0],
        EdgeStatistics.empty());
  }

  /** Per block maps, built in a shuffled block order, gathered into one array per block. */
  private static long[][] blockwise(List<BlockSummary> summaries, long[] solvedIds,
      int[] clusters, Random random) {
    long[] counts = summaries.stream().mapToLong(BlockSummary::segmentCount).toArray();
    SolvedFinalIds solved = SolvedFinalIds.number(LAYOUT, counts, solvedIds, clusters);
    List<Integer> order = new ArrayList<>();
    for (int b = 0; b < counts.length; b++) {
      order.add(b);
    }
    Collections.shuffle(order, random);
    long[][] maps = new long[counts.length][];
    for (int b : order) {
      maps[b] = BlockIdMap.of(LAYOUT, counts[b], solved.part(b)).finalIds();
    }
    return maps;
  }

  @Test
  void equalsTheSingleMapOnRandomBlocksAndClusters() {
    Random random = new Random(13);
    for (int trial = 0; trial < 200; trial++) {
      int blocks = 1 + random.nextInt(9);
      List<BlockSummary> summaries = new ArrayList<>();
      List<Long> nodes = new ArrayList<>();
      List<Long> others = new ArrayList<>();
      for (int b = 0; b < blocks; b++) {
        int n = random.nextInt(12);
        int[] boundary = n == 0 ? new int[0] : random.ints(1, n + 1).distinct()
            .limit(random.nextInt(n + 1)).sorted().toArray();
        summaries.add(summary(b, n, boundary));
        for (int local = 1; local <= n; local++) {
          long id = LAYOUT.provisional(b, local);
          if (Arrays.binarySearch(boundary, local) >= 0) {
            nodes.add(id);
          } else {
            others.add(id);
          }
        }
      }
      long[] nodeIds = nodes.stream().mapToLong(Long::longValue).toArray();
      int clusterCount = 1 + random.nextInt(Math.max(1, nodeIds.length));
      int[] clusters = random.ints(nodeIds.length, 0, clusterCount).toArray();
      ReducedGraph graph = new ReducedGraph(nodeIds, EdgeStatistics.empty(), new int[0],
          new int[0]);
      // a size filter joins some segments outside the graph to clusters
      long[] joined = others.stream().filter(x -> random.nextInt(4) == 0)
          .mapToLong(Long::longValue).toArray();
      int[] joinedCluster = random.ints(joined.length, 0, clusterCount).toArray();

      FinalIdMap single = FinalIds.assign(LAYOUT, blocks, summaries, graph, clusters, joined,
          joinedCluster);
      long[] solvedIds = new long[nodeIds.length + joined.length];
      int[] solvedClusters = new int[solvedIds.length];
      merge(nodeIds, clusters, joined, joinedCluster, solvedIds, solvedClusters);
      long[][] maps = blockwise(summaries, solvedIds, solvedClusters, random);
      assertArrayEquals(single.finalIds(), maps, "trial " + trial);
      long counts = SolvedFinalIds.number(LAYOUT,
          summaries.stream().mapToLong(BlockSummary::segmentCount).toArray(), solvedIds,
          solvedClusters).finalIdCount();
      assertEquals(single.finalIdCount(), counts, "trial " + trial);
      // consecutive from 1 (the definition of final ids, DESIGN.md's vocabulary)
      long[] all = Arrays.stream(maps).flatMapToLong(m -> Arrays.stream(m, 1, m.length))
          .distinct().sorted().toArray();
      for (int i = 0; i < all.length; i++) {
        assertEquals(i + 1, all[i], "trial " + trial);
      }
    }
  }

  private static void merge(long[] a, int[] ca, long[] b, int[] cb, long[] out, int[] cout) {
    int i = 0;
    int j = 0;
    for (int k = 0; k < out.length; k++) {
      if (j >= b.length || i < a.length && a[i] < b[j]) {
        out[k] = a[i];
        cout[k] = ca[i++];
      } else {
        out[k] = b[j];
        cout[k] = cb[j++];
      }
    }
  }

  /**
   * Worked by hand: block 0 has segments 1..3 with 2 and 3 solved, block 1 has 1..2 with 1
   * solved; clusters {0:2, 1:1} and {0:3}. Block 0: 1 -> 1, 2 -> 2, 3 -> 3; block 1: 1 -> 2
   * (cluster of 0:2), 2 -> 4.
   */
  @Test
  void handWorkedExample() {
    long[] solved = {LAYOUT.provisional(0, 2), LAYOUT.provisional(0, 3),
        LAYOUT.provisional(1, 1)};
    SolvedFinalIds ids = SolvedFinalIds.number(LAYOUT, new long[] {3, 2}, solved,
        new int[] {7, 3, 7});
    assertEquals(4, ids.finalIdCount());
    assertArrayEquals(new long[] {0, 1, 2, 3}, BlockIdMap.of(LAYOUT, 3, ids.part(0)).finalIds());
    assertArrayEquals(new long[] {0, 2, 4}, BlockIdMap.of(LAYOUT, 2, ids.part(1)).finalIds());
    assertEquals(2, ids.finalIdOf(LAYOUT.provisional(1, 1)));
    assertEquals(-1, ids.finalIdOf(LAYOUT.provisional(1, 2)));
  }

  @Test
  void mapsRelabelOnlyTheirBlockAndRoundTripThroughFiles() {
    long[] solved = {LAYOUT.provisional(0, 2), LAYOUT.provisional(1, 1)};
    SolvedFinalIds ids = SolvedFinalIds.number(LAYOUT, new long[] {2, 3}, solved,
        new int[] {0, 0});
    BlockIdMap map = BlockIdMap.of(LAYOUT, 3, ids.part(1));
    Path partFile = dir.resolve("1.part");
    BlockIdMapFile.writePart(partFile, ids.part(1));
    SolvedFinalIds.BlockPart part = BlockIdMapFile.readPart(partFile, 1);
    assertEquals(map, BlockIdMap.of(LAYOUT, 3, part), "the map from the part read back");
    assertThrows(SunderException.class, () -> BlockIdMapFile.readPart(partFile, 0));
    Path file = dir.resolve("1.ids");
    BlockIdMapFile.Stored stored = BlockIdMapFile.write(file, map);
    assertEquals(map, BlockIdMapFile.read(file, 1, stored.checksum()));
    assertThrows(SunderException.class, () -> BlockIdMapFile.read(file, 2, -1));
    long[] labels = {0, LAYOUT.provisional(1, 1), LAYOUT.provisional(1, 3), 5};
    assertEquals(2, map.applyInPlace(labels));
    assertArrayEquals(new long[] {0, 2, 4, 5}, labels);
    assertThrows(SunderException.class,
        () -> map.applyInPlace(new long[] {LAYOUT.provisional(0, 1)}));
    assertThrows(SunderException.class, () -> SolvedFinalIds.number(LAYOUT, new long[] {2, 3},
        new long[] {LAYOUT.provisional(1, 1), LAYOUT.provisional(0, 2)}, new int[] {0, 0}));
  }
}
