package org.sunder.stitching.solve;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
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
   * The graph with each node's edges moved to its representative ({@code group[i]}, itself a
   * node): pairs inside a group vanish, pairs between two groups merge their statistics. Node
   * ids and separated pairs are kept (the solvers that use groups ignore the latter).
   * O(p log p).
   */
  ReducedGraph joined(int[] group) {
    long[] from = new long[group.length];
    long[] to = new long[group.length];
    for (int i = 0; i < group.length; i++) {
      from[i] = i;
      to[i] = group[i];
    }
    return new ReducedGraph(nodeIds, edges.relabel(from, to), separatedU, separatedV,
        EdgeStatistics.empty());
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
