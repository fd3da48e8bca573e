package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.multicut.MulticutSolver;
import org.sunder.blockwise.partition.mutex.MutexWatershedSolver;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * The solve stage: assembles the {@link ReducedGraph} from all block summaries and seam edges,
 * partitions it with the method family the blocks used, and maps every provisional id to a
 * final id (consecutive from 1; see {@link FinalIds}). Segments that touch no face never enter
 * the graph and simply get the next final id. The result depends only on the summaries' and
 * seams' content, not on their order.
 *
 * <p>Methods: {@code mutex-watershed} continues as the Mutex Watershed of the reduced graph
 * (absolute-maximum linkage with constraints), keeping each block's separations (see
 * {@link MutexWatershedSolver}); {@code agglomeration} and
 * {@code fragments-agglomeration} continue with the configured linkage, constraints and
 * threshold; {@code fragments-multicut} solves the multicut of the reduced graph on the
 * linkage values (summed weights by default; see {@link MulticutSolver}). For the fragment
 * methods, whose blocks give back the fragments of the clusters they could not settle, pieces
 * that continue across a face ({@link SeamEdges#continued()}: the halves of one fragment) are
 * joined first, so the method continues from the statistics of whole fragments. With a size
 * filter ({@code minSegmentSize}) the filter then runs on the final segments that reach a face,
 * by their size in the volume, and for the fragment methods on every small segment
 * ({@link FinalSizeFilter}). Cost: O(p log p) for p
 * reduced-graph pairs plus the agglomeration's O(p log p); memory about 100 bytes per pair.
 */
public final class GlobalSolve {
  private GlobalSolve() {}

  /**
   * The final ids of the solved segments (with each block's offset) and the figures of the
   * solve.
   */
  public record Result(SolvedFinalIds solved, SolveReport report) implements Serializable {
    /** Every block's map as one value (a number per segment: tests and in-process runs). */
    public FinalIdMap finalIds() {
      return solved.toMap();
    }
  }

  /** Solves the setup's run from every block's summary and every face's seam edges. */
  public static Result run(StitchingSetup setup, List<BlockSummary> summaries,
      List<SeamEdges> seams) {
    return solve(setup.idLayout(), setup.grid().blockCount(), setup.partition(), summaries,
        seams);
  }

  static Result solve(IdLayout layout, int blockCount, PartitionConfig config,
      List<BlockSummary> summaries, List<SeamEdges> seams) {
    long start = System.nanoTime();
    List<BlockSummary> blocks = new ArrayList<>(summaries);
    blocks.sort(Comparator.comparingInt(BlockSummary::block));
    ReducedGraph graph = ReducedGraph.assemble(layout, blocks, seams);
    // what the size filter reads besides the clusters, prepared on another core meanwhile
    CompletableFuture<FinalSizeFilter.Inputs> filterInputs = config.minSegmentSize() > 1
        ? CompletableFuture.supplyAsync(() -> FinalSizeFilter.inputs(layout, blocks, graph))
        : null;
    ReducedGraphSolver solver = solverFor(config);
    int[] clusters =
        clustersJoiningContinuations(graph, ReducedGraph.firstVoxels(blocks), solver);
    FinalIds.requireComplete(blockCount, blocks);
    long[] segmentCounts = new long[blockCount];
    for (BlockSummary s : blocks) {
      segmentCounts[s.block()] = s.segmentCount();
    }
    SolvedFinalIds map;
    if (filterInputs != null) {
      FinalSizeFilter.Result filtered =
          FinalSizeFilter.apply(joined(filterInputs), graph, clusters, config);
      map = solvedWithJoined(layout, segmentCounts, graph.nodeIds(), filtered.clusterOfNode(),
          filtered.joinedIds(), filtered.joinedCluster());
    } else {
      map = SolvedFinalIds.number(layout, segmentCounts, graph.nodeIds(), clusters);
    }
    double seconds = (System.nanoTime() - start) / 1e9;
    long segments = 0;
    for (BlockSummary s : blocks) {
      segments += s.segmentCount();
    }
    SolveReport report = new SolveReport(solver.name(), segments, graph.nodeCount(),
        graph.edges().size(), map.finalIdCount(), seconds);
    return new Result(map, report);
  }

  /** The value of {@code future}, or the exception it ended with, unwrapped. */
  private static <T> T joined(CompletableFuture<T> future) {
    try {
      return future.join();
    } catch (CompletionException e) {
      if (e.getCause() instanceof RuntimeException cause) {
        throw cause;
      }
      if (e.getCause() instanceof Error cause) {
        throw cause;
      }
      throw e;
    }
  }

  /**
   * The solved segments' final ids when a size filter joined segments outside the reduced graph
   * ({@code joinedIds}, ascending) to its clusters: both lists merged in ascending id. O(n).
   */
  static SolvedFinalIds solvedWithJoined(IdLayout layout, long[] segmentCounts, long[] nodeIds,
      int[] clusterOfNode, long[] joinedIds, int[] joinedCluster) {
    long[] ids = new long[nodeIds.length + joinedIds.length];
    int[] clusters = new int[ids.length];
    int i = 0;
    int j = 0;
    for (int k = 0; k < ids.length; k++) {
      if (j >= joinedIds.length || i < nodeIds.length && nodeIds[i] < joinedIds[j]) {
        ids[k] = nodeIds[i];
        clusters[k] = clusterOfNode[i++];
      } else {
        ids[k] = joinedIds[j];
        clusters[k] = joinedCluster[j++];
      }
    }
    return SolvedFinalIds.number(layout, segmentCounts, ids, clusters);
  }

  /**
   * The fewest continued voxel pairs (see {@link SeamEdges#continued()}) for which the solve
   * joins two pieces before it continues the method: one. The fragment methods compute a
   * block's fragments in its context ({@code AffinityReader#readBlock}), so the two blocks at a
   * face see the same fragments there, and one pair across the face marks the halves of one
   * fragment of a one-block run. Measured with the default method ({@code QualityBenchmark 256
   * 256 96 1,2,3 default 27}), bits from the whole-volume result, dense neurites / compact cells
   * / bodies and neurites: from 1 pair 0.008 / 0.008 / 0.0002, every volume cutting as many
   * objects at the faces as the whole-volume result; from 3 pairs 0.009 / 0.009 / 0.004, one
   * more object cut on every volume of bodies and neurites. Before the context, a block with a
   * thin halo cut slivers near a face differently from its neighbour, a single pair joined them
   * wrongly, and 3 measured best (the repository's history holds those figures).
   */
  static final long MIN_CONTINUED_PAIRS = 1;

  /**
   * The solver's clusters of {@code graph}, after joining the pieces that continue across a
   * face (the halves of one fragment; only the fragment methods report them): the method then
   * continues from the fragment-level statistics a one-block run would see, over the joined
   * pieces in ascending order of their first voxels ({@code firstVoxels}, per node), the order
   * of a one-block run's fragments, so that ties fall as they fall there. O(p log p).
   */
  static int[] clustersJoiningContinuations(ReducedGraph graph, long[] firstVoxels,
      ReducedGraphSolver solver) {
    if (graph.continued().size() == 0) {
      return solver.clusters(graph);
    }
    ReducedGraph.Joined joined =
        graph.joined(graph.continuationGroups(MIN_CONTINUED_PAIRS), firstVoxels);
    int[] ofJoined = solver.clusters(joined.graph());
    int[] clusters = new int[joined.nodeOf().length];
    for (int i = 0; i < clusters.length; i++) {
      clusters[i] = ofJoined[joined.nodeOf()[i]];
    }
    return clusters;
  }

  public static ReducedGraphSolver solverFor(PartitionConfig config) {
    return config.createSolver();
  }
}
