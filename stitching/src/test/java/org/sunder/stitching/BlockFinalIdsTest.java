package org.sunder.stitching;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.mutex.MutexWatershedSolver;
import org.sunder.stitching.solve.BlockFinalIds;
import org.sunder.stitching.solve.BlockFinalIds.BlockClusters;
import org.sunder.stitching.solve.BlockFinalIds.Numbered;
import org.sunder.stitching.solve.FinalIdMap;
import org.sunder.stitching.solve.FinalIds;
import org.sunder.stitching.solve.ReducedGraph;
import org.sunder.stitching.task.BlockSummary;

/**
 * Per-block final ids equal the single map's ({@link FinalIds}), are consecutive from 1, and do
 * not depend on the order the block tasks run in.
 */
class BlockFinalIdsTest {

  @Test
  void perBlockNumberingEqualsTheSingleMapInAnyTaskOrder() {
    Random random = new Random(13);
    for (int trial = 0; trial < 40; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(1 + random.nextInt(5), 1 + random.nextInt(4),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      ReducedGraph dense = RandomReducedGraphs.graph(grid, layout, random, trial % 2 == 0,
          1 + random.nextInt(8), 2);
      // spread the boundary segments among segments that touch no face
      int blocks = grid.blockCount();
      int[] segmentCount = new int[blocks];
      int[][] boundary = new int[blocks][];
      long[] nodeIds = new long[dense.nodeCount()];
      int node = 0;
      for (int b = 0; b < blocks; b++) {
        int k = 0;
        while (node + k < nodeIds.length && layout.blockOf(dense.nodeIds()[node + k]) == b) {
          k++;
        }
        segmentCount[b] = k + random.nextInt(6);
        List<Integer> locals = new ArrayList<>();
        for (int l = 1; l <= segmentCount[b]; l++) {
          locals.add(l);
        }
        Collections.shuffle(locals, random);
        boundary[b] = locals.subList(0, k).stream().mapToInt(Integer::intValue).sorted()
            .toArray();
        for (int i = 0; i < k; i++) {
          nodeIds[node++] = layout.provisional(b, boundary[b][i]);
        }
      }
      ReducedGraph graph = new ReducedGraph(nodeIds, dense.edges(), dense.separatedU(),
          dense.separatedV());
      int[] clusters = new MutexWatershedSolver().clusters(graph);
      List<BlockSummary> summaries = new ArrayList<>();
      for (int b = 0; b < blocks; b++) {
        summaries.add(new BlockSummary(b, new long[segmentCount[b]], boundary[b],
            new int[boundary[b].length], new long[boundary[b].length], EdgeStatistics.empty(),
            new long[0], new long[0],
            EdgeStatistics.empty()));
      }
      FinalIdMap expected = FinalIds.assign(layout, blocks, summaries, graph, clusters);

      long[][] actual = perBlock(layout, blocks, segmentCount, boundary, nodeIds, clusters,
          random);
      for (int b = 0; b < blocks; b++) {
        assertArrayEquals(expected.finalIds()[b], actual[b], "trial " + trial + " block " + b);
      }
      long[] all = Arrays.stream(actual).flatMapToLong(a -> Arrays.stream(a, 1, a.length))
          .distinct().sorted().toArray();
      for (int i = 0; i < all.length; i++) {
        assertEquals(i + 1, all[i], "final ids are consecutive from 1");
      }
    }
  }

  /** The four steps, block tasks in a random order, the join done by sorting publications. */
  private static long[][] perBlock(IdLayout layout, int blocks, int[] segmentCount,
      int[][] boundary, long[] nodeIds, int[] clusters, Random random) {
    long[] repOfCluster = new long[nodeIds.length];
    Arrays.fill(repOfCluster, Long.MAX_VALUE);
    for (int i = 0; i < nodeIds.length; i++) {
      repOfCluster[clusters[i]] = Math.min(repOfCluster[clusters[i]], nodeIds[i]);
    }
    BlockClusters[] input = new BlockClusters[blocks];
    int node = 0;
    for (int b = 0; b < blocks; b++) {
      long[] reps = new long[boundary[b].length];
      for (int i = 0; i < reps.length; i++) {
        reps[i] = repOfCluster[clusters[node++]];
      }
      input[b] = new BlockClusters(b, segmentCount[b], boundary[b], reps);
    }
    List<Integer> order = new ArrayList<>();
    for (int b = 0; b < blocks; b++) {
      order.add(b);
    }
    long[] counts = new long[blocks];
    Collections.shuffle(order, random);
    for (int b : order) {
      counts[b] = BlockFinalIds.ownedCount(layout, input[b]);
    }
    long[] offsets = BlockFinalIds.offsets(counts);
    Numbered[] numbered = new Numbered[blocks];
    Collections.shuffle(order, random);
    for (int b : order) {
      numbered[b] = BlockFinalIds.number(layout, input[b], offsets[b]);
    }
    long[][] result = new long[blocks][];
    Collections.shuffle(order, random);
    for (int b : order) {
      long[] needed = BlockFinalIds.needed(layout, input[b]);
      long[] finals = new long[needed.length];
      for (int i = 0; i < needed.length; i++) {
        Numbered owner = numbered[layout.blockOf(needed[i])];
        int at = Arrays.binarySearch(owner.ownedRepresentatives(), needed[i]);
        assertTrue(at >= 0, "the owner publishes representative " + needed[i]);
        finals[i] = owner.ownedFinalIds()[at];
      }
      result[b] = BlockFinalIds.complete(layout, input[b], numbered[b], needed, finals);
    }
    return result;
  }
}
