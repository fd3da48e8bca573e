package org.sunder.stitching.solve;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.stream.IntStream;
import java.util.stream.LongStream;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.collections.UnionFind;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.SegmentGraph;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * The graph the global solve works on: nodes are the boundary segments of all blocks, in
 * ascending provisional id (block by block, local id ascending); edges are the blocks' inner
 * edges and the faces' seam edges, with ids replaced by node indices. Built from summaries and
 * seams in any order; the result depends only on their content. O(p log p) for p pairs.
 *
 * @param nodeIds the provisional id of each node, ascending
 * @param edges statistics between node indices ({@code u < v}, canonical order)
 * @param separatedU with {@code separatedV}: node pairs a block kept apart (see
 *     {@link BlockSummary#separatedU()}), ascending
 * @param separatedV see {@code separatedU}
 * @param continued per node pair, the number of voxel pairs across faces through which both
 *     blocks saw one piece continue (see {@link SeamEdges#continued()}); empty unless the run
 *     tracks continuations
 */
public record ReducedGraph(long[] nodeIds, EdgeStatistics edges, int[] separatedU, int[] separatedV,
    EdgeStatistics continued) implements SegmentGraph {

  /** A graph without continued pairs. */
  public ReducedGraph(long[] nodeIds, EdgeStatistics edges, int[] separatedU, int[] separatedV) {
    this(nodeIds, edges, separatedU, separatedV, EdgeStatistics.empty());
  }

  public static ReducedGraph assemble(IdLayout layout, List<BlockSummary> summaries,
      List<SeamEdges> seams) {
    List<BlockSummary> blocks = new ArrayList<>(summaries);
    blocks.sort(Comparator.comparingInt(BlockSummary::block));
    int nodeCount = 0;
    for (BlockSummary s : blocks) {
      nodeCount += s.boundaryLocalIds().length;
    }
    long[] nodeIds = new long[nodeCount];
    int next = 0;
    List<EdgeStatistics> parts = new ArrayList<>();
    for (BlockSummary s : blocks) {
      for (int local : s.boundaryLocalIds()) {
        nodeIds[next++] = layout.provisional(s.block(), local);
      }
      parts.add(s.innerEdges());
    }
    List<SeamEdges> faces = new ArrayList<>(seams);
    faces.sort(Comparator.comparingInt(SeamEdges::face));
    List<EdgeStatistics> continuedParts = new ArrayList<>();
    for (SeamEdges seam : faces) {
      parts.add(seam.edges());
      continuedParts.add(seam.continued());
    }
    EdgeStatistics edges = toNodeIndices(EdgeStatistics.mergeAll(parts), nodeIds, layout);
    int separated = 0;
    for (BlockSummary s : blocks) {
      separated += s.separatedU().length;
    }
    int[] su = new int[separated];
    int[] sv = new int[separated];
    int row = 0;
    for (BlockSummary s : blocks) {
      for (int i = 0; i < s.separatedU().length; i++) {
        su[row] = node(nodeIds, s.separatedU()[i], layout);
        sv[row++] = node(nodeIds, s.separatedV()[i], layout);
      }
    }
    return new ReducedGraph(nodeIds, edges, su, sv,
        toNodeIndices(EdgeStatistics.mergeAll(continuedParts), nodeIds, layout));
  }

  /**
   * Each node's representative after joining every pair with at least {@code minPairs}
   * continued voxel pairs: the smallest node index of its group. O(n + p α(n)).
   */
  int[] continuationGroups(long minPairs) {
    int[] parent = UnionFind.singletons(nodeIds.length);
    for (int e = 0; e < continued.size(); e++) {
      if (continued.count(e) >= minPairs) {
        UnionFind.union(parent, (int) continued.u(e), (int) continued.v(e));
      }
    }
    for (int i = 0; i < parent.length; i++) {
      parent[i] = UnionFind.root(parent, i);
    }
    return parent;
  }

  /**
   * Per node, the first voxel of its segment ({@link BlockSummary#boundaryFirstVoxels}), in the
   * node order of {@link #assemble}. O(n + b log b) for b blocks.
   */
  public static long[] firstVoxels(List<BlockSummary> summaries) {
    return summaries.stream().sorted(Comparator.comparingInt(BlockSummary::block))
        .flatMapToLong(s -> LongStream.of(s.boundaryFirstVoxels())).toArray();
  }

  /**
   * The graph over groups of nodes and, per node of this graph, its node there.
   *
   * @param graph one node per group, ascending in {@code rank} (its node ids are the ranks);
   *     each group's edges merged, pairs inside a group gone; no separated or continued pairs
   *     (the solvers of joined pieces use neither)
   * @param nodeOf per node of this graph, the node of its group in {@code graph}
   */
  record Joined(ReducedGraph graph, int[] nodeOf) {}

  /**
   * The graph with each group of nodes ({@code group[i]}: a node naming node {@code i}'s group,
   * itself in it) as one node, the groups numbered in ascending order of the smallest
   * {@code rank} of their nodes (distinct per node). The agglomeration and the multicut break
   * ties by node order, so ranking groups by their first voxels orders them as a one-block run
   * orders its fragments. O(p log p + n log n).
   */
  Joined joined(int[] group, long[] rank) {
    int n = group.length;
    long[] groupRank = new long[n];
    Arrays.fill(groupRank, Long.MAX_VALUE);
    for (int i = 0; i < n; i++) {
      groupRank[group[i]] = Math.min(groupRank[group[i]], rank[i]);
    }
    long[] ranks = IntStream.range(0, n).filter(i -> group[i] == i).mapToLong(i -> groupRank[i])
        .sorted().toArray();
    long[] from = new long[n];
    long[] to = new long[n];
    int[] nodeOf = new int[n];
    for (int i = 0; i < n; i++) {
      nodeOf[i] = Arrays.binarySearch(ranks, groupRank[group[i]]);
      from[i] = i;
      to[i] = nodeOf[i];
    }
    return new Joined(new ReducedGraph(ranks, edges.relabel(from, to), new int[0], new int[0]),
        nodeOf);
  }

  private static int node(long[] nodeIds, long id, IdLayout layout) {
    int at = Arrays.binarySearch(nodeIds, id);
    if (at < 0) {
      throw unknown(id, layout);
    }
    return at;
  }

  private static SunderException unknown(long id, IdLayout layout) {
    return new SunderException(ErrorKind.INTERNAL, "an edge names provisional id "
        + Long.toUnsignedString(id) + " (block " + layout.blockOf(id) + ", local id "
        + layout.localOf(id) + "), which no block summary lists as a boundary segment;"
        + " summaries and seams are from different runs");
  }

  /** {@code edges} over node indices; throws naming the first provisional id not a node. */
  private static EdgeStatistics toNodeIndices(EdgeStatistics edges, long[] nodeIds,
      IdLayout layout) {
    EdgeStatistics renumbered = edges.renumbered(nodeIds);
    if (renumbered != null) {
      return renumbered;
    }
    for (int e = 0; e < edges.size(); e++) {
      for (long id : new long[] {edges.u(e), edges.v(e)}) {
        if (Arrays.binarySearch(nodeIds, id) < 0) {
          throw unknown(id, layout);
        }
      }
    }
    throw new IllegalStateException("every id is a node");
  }
}
