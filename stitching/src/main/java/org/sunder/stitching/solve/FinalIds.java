package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.List;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.task.BlockSummary;

/**
 * Numbers the final ids: block by block in index order, local ids ascending, each segment
 * takes the next id unless it is a boundary segment whose cluster already has one. Consecutive
 * from 1, and independent of the order the tasks ran in. O(segments).
 */
public final class FinalIds {
  private FinalIds() {}

  /**
   * @param summaries one per block, sorted by block index, covering {@code 0..blockCount-1}
   * @param graph the reduced graph the clusters belong to
   * @param clusters per reduced graph node, its cluster index
   */
  public static FinalIdMap assign(IdLayout layout, int blockCount, List<BlockSummary> summaries,
      ReducedGraph graph, int[] clusters) {
    return assign(layout, blockCount, summaries, graph, clusters, new long[0], new int[0]);
  }

  /**
   * As {@link #assign(IdLayout, int, List, ReducedGraph, int[])}, with segments outside the
   * reduced graph that belong to a cluster too (a size filter joined them).
   *
   * @param joinedIds provisional ids of such segments, ascending
   * @param joinedCluster per joined id, its cluster (numbered as {@code clusters})
   */
  public static FinalIdMap assign(IdLayout layout, int blockCount, List<BlockSummary> summaries,
      ReducedGraph graph, int[] clusters, long[] joinedIds, int[] joinedCluster) {
    requireComplete(blockCount, summaries);
    int maxCluster = -1;
    for (int c : clusters) {
      maxCluster = Math.max(maxCluster, c);
    }
    for (int c : joinedCluster) {
      maxCluster = Math.max(maxCluster, c);
    }
    long[] finalOfCluster = new long[maxCluster + 1];
    long[][] finalIds = new long[blockCount][];
    long next = 1;
    int node = 0;
    long[] nodeIds = graph.nodeIds();
    for (BlockSummary s : summaries) {
      long[] ids = new long[s.segmentCount() + 1];
      int[] boundary = s.boundaryLocalIds();
      int b = 0;
      for (int local = 1; local <= s.segmentCount(); local++) {
        if (b < boundary.length && boundary[b] == local) {
          if (nodeIds[node] != layout.provisional(s.block(), local)) {
            throw new SunderException(ErrorKind.INTERNAL, "reduced graph node " + node
                + " does not match block " + s.block() + " local id " + local);
          }
          int c = clusters[node++];
          if (finalOfCluster[c] == 0) {
            finalOfCluster[c] = next++;
          }
          ids[local] = finalOfCluster[c];
          b++;
        } else {
          int joined = joinedIds.length == 0 ? -1
              : Arrays.binarySearch(joinedIds, layout.provisional(s.block(), local));
          if (joined < 0) {
            ids[local] = next++;
          } else {
            int c = joinedCluster[joined];
            if (finalOfCluster[c] == 0) {
              finalOfCluster[c] = next++;
            }
            ids[local] = finalOfCluster[c];
          }
        }
      }
      finalIds[s.block()] = ids;
    }
    return new FinalIdMap(layout, finalIds, next - 1);
  }

  static void requireComplete(int blockCount, List<BlockSummary> summaries) {
    if (summaries.size() != blockCount) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "the solve got " + summaries.size()
          + " block summaries for " + blockCount + " blocks; every block must be partitioned"
          + " first");
    }
    for (int i = 0; i < blockCount; i++) {
      if (summaries.get(i).block() != i) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "block summaries: expected one per"
            + " block 0.." + (blockCount - 1) + ", found block " + summaries.get(i).block()
            + " at position " + i + " (duplicate or missing block)");
      }
    }
  }
}
