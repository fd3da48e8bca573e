package org.sunder.stitching.solve;

import java.nio.file.Path;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.SegmentGraph;
import org.sunder.blockwise.partition.agglomeration.AgglomerativeSolver;
import org.sunder.blockwise.partition.mutex.MutexWatershedSolver;

/**
 * A {@link ReducedGraphSolver} that solves the reduced graph level by level over super-blocks
 * ({@link HierarchicalSolve}) when it has more edges than the driver bound, giving the same
 * clusters as the single-level solve of its method (the Mutex Watershed and the linkage
 * agglomeration), or for the multicut ({@link MulticutPartSolver}) a partition by domain
 * decomposition close to it.
 */
public final class HierarchicalSolver implements ReducedGraphSolver {
  private final PartSolver parts;
  private final SuperBlocks superBlocks;
  private final long maxDriverEdges;
  private final Path workDir;
  private HierarchicalSolve.Result last;

  /** @param workDir where the levels' edge files go, or null to keep them in memory */
  public HierarchicalSolver(PartSolver parts, SuperBlocks superBlocks, long maxDriverEdges,
      Path workDir) {
    this.parts = parts;
    this.superBlocks = superBlocks;
    this.maxDriverEdges = maxDriverEdges;
    this.workDir = workDir;
  }

  @Override
  public String name() {
    return parts.name() + " (hierarchical)";
  }

  /** The figures of the last {@link #clusters} call. */
  public HierarchicalSolve.Result lastResult() {
    return last;
  }

  @Override
  public int[] clusters(SegmentGraph graph) {
    SolveEdges edges = parts instanceof LinkagePartSolver ? linkageEdges(graph)
        : parts instanceof MulticutPartSolver ? multicutEdges(graph) : mutexEdges(graph);
    last = HierarchicalSolve.run(superBlocks, edges, maxDriverEdges, parts, workDir);
    long[] nodeIds = graph.nodeIds();
    int[] clusters = new int[nodeIds.length];
    for (int i = 0; i < nodeIds.length; i++) {
      clusters[i] = java.util.Arrays.binarySearch(nodeIds, last.representatives().resolve(
          nodeIds[i]));
    }
    return clusters;
  }

  /**
   * The pairs of a reduced graph as {@link LinkagePartSolver} reads them (four rows per pair,
   * keyed by the pair's provisional ids; separated pairs play no part, as in
   * {@link AgglomerativeSolver}). O(p).
   */
  public static SolveEdges linkageEdges(SegmentGraph graph) {
    long[] ids = graph.nodeIds();
    EdgeStatistics edges = graph.edges();
    SolveEdges out = new SolveEdges(4 * edges.size());
    for (int e = 0; e < edges.size(); e++) {
      long a = ids[(int) edges.u(e)];
      long b = ids[(int) edges.v(e)];
      LinkagePartSolver.addPair(out, a, b, edges.sum(e), edges.count(e), edges.min(e),
          edges.max(e), a, b);
    }
    return out;
  }

  /**
   * The pairs of a reduced graph as {@link MulticutPartSolver} reads them: per pair its cost
   * (summed weights, the single-level multicut's cost), and for a {@link ReducedGraph} a joined
   * row per pair with at least {@link GlobalSolve#MIN_CONTINUED_PAIRS} continued voxel pairs
   * (the pairs the single-level solve joins first); keyed by provisional ids. O(p).
   */
  public static SolveEdges multicutEdges(SegmentGraph graph) {
    long[] ids = graph.nodeIds();
    EdgeStatistics edges = graph.edges();
    SolveEdges out = new SolveEdges(edges.size());
    for (int e = 0; e < edges.size(); e++) {
      MulticutPartSolver.addPair(out, ids[(int) edges.u(e)], ids[(int) edges.v(e)],
          edges.sum(e));
    }
    if (graph instanceof ReducedGraph reduced) {
      EdgeStatistics continued = reduced.continued();
      for (int e = 0; e < continued.size(); e++) {
        if (continued.count(e) >= GlobalSolve.MIN_CONTINUED_PAIRS) {
          MulticutPartSolver.addJoined(out, ids[(int) continued.u(e)],
              ids[(int) continued.v(e)], continued.count(e));
        }
      }
    }
    return out;
  }

  /**
   * The Mutex Watershed's edges of a reduced graph, as {@link MutexWatershedSolver} lists them:
   * per pair its largest weight if positive and its smallest if negative, and each separated
   * pair at {@link SolveEdges#APART}; nodes and keys are provisional ids. O(p).
   */
  public static SolveEdges mutexEdges(SegmentGraph graph) {
    long[] ids = graph.nodeIds();
    EdgeStatistics edges = graph.edges();
    SolveEdges out = new SolveEdges(2 * edges.size() + graph.separatedU().length);
    for (int i = 0; i < graph.separatedU().length; i++) {
      long a = ids[graph.separatedU()[i]];
      long b = ids[graph.separatedV()[i]];
      out.add(a, b, SolveEdges.APART, a, b, SolveEdges.SEPARATED);
    }
    for (int e = 0; e < edges.size(); e++) {
      long a = ids[(int) edges.u(e)];
      long b = ids[(int) edges.v(e)];
      if (edges.max(e) > 0) {
        out.add(a, b, edges.max(e), a, b, SolveEdges.MAX);
      }
      if (edges.min(e) < 0) {
        out.add(a, b, edges.min(e), a, b, SolveEdges.MIN);
      }
    }
    return out;
  }
}
