package org.sunder.stitching.solve;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.sunder.blockwise.collections.RadixSort;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.sizefilter.SizeFilter;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;
import org.sunder.stitching.task.BlockSummary;

/**
 * The size filter on the global solve's result. The segments that reach a face (boundary
 * segments) are judged here, by their size in the volume: a final segment is a cluster of
 * boundary segments, its size the sum of their core voxels. For the fragment methods the blocks
 * filter nothing, and every segment below the threshold is judged here too, so the filter runs
 * over the volume's segments as a one-block run's filter would (every segment that can merge or
 * absorb is in the graph: the small ones, the boundary ones and their neighbours); for the voxel
 * methods each block filtered the segments lying wholly inside its core away from the faces.
 * A segment's neighbours are the other clusters (reduced-graph edges) and the blocks' other
 * segments beside it ({@link BlockSummary#interiorEdges()}); the configured {@link SizeFilter}
 * runs on that graph.
 *
 * <p>The outcome: per reduced-graph node a new cluster index, and per interior segment beside
 * a boundary segment its cluster in the same numbering. {@code O(p log p)} for {@code p} pairs.
 */
final class FinalSizeFilter {
  private FinalSizeFilter() {}

  /**
   * @param clusterOfNode per reduced-graph node, its cluster (indices below
   *     {@code clusterOfNode.length + joinedIds.length})
   * @param joinedIds the other segments the filter judged or saw as a neighbour (provisional
   *     ids, ascending); each may have joined a cluster or been joined by one
   * @param joinedCluster per joined id, its cluster (same numbering as {@code clusterOfNode})
   */
  record Result(int[] clusterOfNode, long[] joinedIds, int[] joinedCluster) {}

  /**
   * What the filter reads that does not depend on the solve's clusters, so it can be prepared
   * while the solve runs.
   *
   * @param interior the blocks' interior edges, merged
   * @param interiorIds the ends of interior edges that are not reduced-graph nodes, ascending
   * @param nodeSizes per reduced-graph node, its voxels
   * @param interiorSizes per interior id, its voxels
   * @param endU per interior edge, its first end: a node index, or {@code -1 - j} for interior
   *     id {@code j}
   * @param endV its second end, alike
   */
  record Inputs(EdgeStatistics interior, long[] interiorIds, long[] nodeSizes,
      long[] interiorSizes, int[] endU, int[] endV) {}

  /**
   * The filter's inputs independent of the clusters. O(k log n) for k interior edges and n
   * nodes (one binary search of each end among the nodes).
   *
   * @param blocks one summary per block, at its block index
   */
  static Inputs inputs(IdLayout layout, List<BlockSummary> blocks, ReducedGraph graph) {
    List<EdgeStatistics> parts = new ArrayList<>();
    for (BlockSummary s : blocks) {
      parts.add(s.interiorEdges());
    }
    EdgeStatistics interior = EdgeStatistics.mergeAll(parts);
    long[] nodeIds = graph.nodeIds();
    // each end looked up once among the nodes; the others are the interior ids
    int k = interior.size();
    int[] endU = new int[k];
    int[] endV = new int[k];
    long[] outside = new long[2 * k];
    int count = 0;
    for (int e = 0; e < k; e++) {
      endU[e] = Arrays.binarySearch(nodeIds, interior.u(e));
      if (endU[e] < 0) {
        outside[count++] = interior.u(e);
      }
      endV[e] = Arrays.binarySearch(nodeIds, interior.v(e));
      if (endV[e] < 0) {
        outside[count++] = interior.v(e);
      }
    }
    long[] interiorIds = Arrays.stream(outside, 0, count).sorted().distinct().toArray();
    for (int e = 0; e < k; e++) {
      if (endU[e] < 0) {
        endU[e] = -1 - Arrays.binarySearch(interiorIds, interior.u(e));
      }
      if (endV[e] < 0) {
        endV[e] = -1 - Arrays.binarySearch(interiorIds, interior.v(e));
      }
    }
    long[] nodeSizes = new long[nodeIds.length];
    for (int i = 0; i < nodeIds.length; i++) {
      nodeSizes[i] = sizeOf(layout, blocks, nodeIds[i]);
    }
    long[] interiorSizes = new long[interiorIds.length];
    for (int j = 0; j < interiorIds.length; j++) {
      interiorSizes[j] = sizeOf(layout, blocks, interiorIds[j]);
    }
    return new Inputs(interior, interiorIds, nodeSizes, interiorSizes, endU, endV);
  }

  /**
   * @param blocks one summary per block, at its block index
   * @param clusters per reduced-graph node, the solve's cluster (any numbering)
   */
  static Result apply(IdLayout layout, List<BlockSummary> blocks, ReducedGraph graph,
      int[] clusters, PartitionConfig config) {
    return apply(inputs(layout, blocks, graph), graph, clusters, config);
  }

  /**
   * The filter on the solve's clusters, with its inputs prepared ({@link #inputs}).
   *
   * @param clusters per reduced-graph node, the solve's cluster (any numbering)
   */
  static Result apply(Inputs in, ReducedGraph graph, int[] clusters, PartitionConfig config) {
    SizeFilter filter = config.createSizeFilter();
    int nodes = graph.nodeCount();
    int[] dense = denseClusters(clusters);
    int clusterCount = 0;
    for (int c : dense) {
      clusterCount = Math.max(clusterCount, c + 1);
    }
    long[] nodeIds = graph.nodeIds();
    long[] interiorIds = in.interiorIds();
    int total = clusterCount + interiorIds.length;
    int[] position = rankPositions(dense, nodeIds, interiorIds, clusterCount);
    long[] sizes = new long[total];
    for (int i = 0; i < nodes; i++) {
      sizes[position[dense[i]]] += in.nodeSizes()[i];
    }
    for (int j = 0; j < interiorIds.length; j++) {
      sizes[position[clusterCount + j]] = in.interiorSizes()[j];
    }
    EdgeStatistics statistics = clusterStatistics(graph.edges(), dense, in, clusterCount,
        position);
    boolean[] flags = SizeFilteredPartitioner.cannotLinkFlags(config.sizeFilterCannotLink(),
        statistics, config.linkage());
    int[] group = filter.groups(sizes, statistics, flags, null);
    int[] clusterOfNode = new int[nodes];
    for (int i = 0; i < nodes; i++) {
      clusterOfNode[i] = group[position[dense[i]]];
    }
    int[] joinedCluster = new int[interiorIds.length];
    for (int j = 0; j < interiorIds.length; j++) {
      joinedCluster[j] = group[position[clusterCount + j]];
    }
    return new Result(clusterOfNode, interiorIds, joinedCluster);
  }

  /** Clusters renumbered densely from 0 in order of first node. */
  private static int[] denseClusters(int[] clusters) {
    int max = -1;
    for (int c : clusters) {
      max = Math.max(max, c);
    }
    int[] index = new int[max + 1];
    Arrays.fill(index, -1);
    int[] dense = new int[clusters.length];
    int next = 0;
    for (int i = 0; i < clusters.length; i++) {
      int c = clusters[i];
      if (index[c] < 0) {
        index[c] = next++;
      }
      dense[i] = index[c];
    }
    return dense;
  }

  /**
   * The filter's order of its segments (clusters {@code 0..clusterCount-1}, then interior ids):
   * by rank, a cluster's its smallest node id, an interior segment's its id; so the order, and
   * the filter's ties, depend on provisional ids alone, as in the filter by parts
   * ({@link SizeFilterPartSolver}). Per segment, its position.
   */
  private static int[] rankPositions(int[] dense, long[] nodeIds, long[] interiorIds,
      int clusterCount) {
    long[] rank = new long[clusterCount + interiorIds.length];
    for (int i = nodeIds.length - 1; i >= 0; i--) {
      rank[dense[i]] = nodeIds[i];
    }
    for (int j = 0; j < interiorIds.length; j++) {
      rank[clusterCount + j] = interiorIds[j];
    }
    int[] byRank = RadixSort.order(rank.length, i -> RadixSort.signedKey(rank[i]));
    int[] position = new int[rank.length];
    for (int p = 0; p < byRank.length; p++) {
      position[byRank[p]] = p;
    }
    return position;
  }

  private static long sizeOf(IdLayout layout, List<BlockSummary> blocks, long provisionalId) {
    return blocks.get(layout.blockOf(provisionalId)).segmentSizes()[
        (int) layout.localOf(provisionalId) - 1];
  }

  /** Statistics between filter segments, ids {@code 1..}: their positions plus 1. */
  private static EdgeStatistics clusterStatistics(EdgeStatistics edges, int[] dense, Inputs in,
      int clusterCount, int[] position) {
    EdgeStatistics interior = in.interior();
    int m = edges.size();
    int k = interior.size();
    long[] u = new long[m + k];
    long[] v = new long[m + k];
    for (int e = 0; e < m; e++) {
      u[e] = position[dense[(int) edges.u(e)]] + 1;
      v[e] = position[dense[(int) edges.v(e)]] + 1;
    }
    for (int e = 0; e < k; e++) {
      u[m + e] = position[filterNode(in.endU()[e], dense, clusterCount)] + 1;
      v[m + e] = position[filterNode(in.endV()[e], dense, clusterCount)] + 1;
    }
    return EdgeStatistics.of(u, v, concat(edges.copySum(), interior.copySum()),
        concat(edges.copyCount(), interior.copyCount()),
        concat(edges.copyMin(), interior.copyMin()), concat(edges.copyMax(), interior.copyMax()));
  }

  /** An interior edge's end ({@link Inputs#endU}) among the filter's segments. */
  private static int filterNode(int end, int[] dense, int clusterCount) {
    return end >= 0 ? dense[end] : clusterCount - 1 - end;
  }

  private static double[] concat(double[] a, double[] b) {
    double[] c = Arrays.copyOf(a, a.length + b.length);
    System.arraycopy(b, 0, c, a.length, b.length);
    return c;
  }

  private static long[] concat(long[] a, long[] b) {
    long[] c = Arrays.copyOf(a, a.length + b.length);
    System.arraycopy(b, 0, c, a.length, b.length);
    return c;
  }
}
