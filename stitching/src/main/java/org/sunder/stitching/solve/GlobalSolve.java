package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
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
    ReducedGraphSolver solver = solverFor(config);
    int[] clusters = clustersJoiningContinuations(graph, solver);
    FinalIds.requireComplete(blockCount, blocks);
    long[] segmentCounts = new long[blockCount];
    for (BlockSummary s : blocks) {
      segmentCounts[s.block()] = s.segmentCount();
    }
    SolvedFinalIds map;
    if (config.minSegmentSize() > 1) {
      FinalSizeFilter.Result filtered =
          FinalSizeFilter.apply(layout, blocks, graph, clusters, config);
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
   * joins two pieces before it continues the method. Joining on a single pair also joins the
   * slivers that a block with a thin halo cuts differently from its neighbour, which merges
   * objects the one-block run keeps apart. Measured on the dense-neurites preset (seed 1, 128 x
   * 128 x 48 voxels, 8 blocks), fragment agglomeration / multicut: at least 1 pair, 0.27 / 0.24
   * bits from the one-block result, 2 objects cut at faces; at least 10, 0.11 / 0.064 bits, 3
   * cut (2 at the control planes); joining nothing, 0.33 / 0.10 bits, 19 / 10 cut. Joining only
   * mutually best pairs measured worse (more objects cut where a block split a fragment its
   * neighbour kept whole). Measured again once the multicut stopped depending on node numbering
   * (default method, three presets, seeds 1-3, 128 x 128 x 48 voxels, 12 blocks): at least 1
   * pair, 0.044 / 0.040 / 0.034 bits from the one-block result (dense neurites / compact cells /
   * bodies and neurites) but a blockwise adapted Rand error of 0.086 / 0.043 / 0.026; at least
   * 10, 0.058 / 0.008 / 0.062 bits and 0.078 / 0.035 / 0.025. With the one-block run's fragments
   * given to every block (a diagnostic), every piece left to the solve and joins from 1 pair, the
   * blockwise result equals the one-block result (bodies and neurites, seed 1: VOI 2e-15 bits):
   * what remains is that fragments near a face depend on the box they were computed in.
   * Measured again once the multicut stopped refining by Kernighan–Lin (default method, seeds
   * 1-3, 96 x 256 x 256 voxels, 27 blocks, {@code QualityBenchmark ... default 27}), bits from
   * the whole-volume result and objects cut at faces beyond the control planes, dense neurites /
   * compact cells / bodies and neurites: at least 10 pairs, 0.035 / 0.013 / 0.046 bits and
   * +4.0 / +0.6 / +10.0 objects; at least 3, 0.014 / 0.016 / 0.028 bits and +3.4 / -1.7 / +5.0
   * objects, for an adapted Rand error 1-2 % higher (0.1376 to 0.1386, 0.0496 to 0.0512, 0.0534
   * to 0.0547); at least 1, 0.015 / 0.030 bits on the first two (compact cells worse). Fragment
   * agglomeration in the same runs, at least 10 / at least 3: 0.40 / 0.13 bits and +10.7 / +5.3
   * objects on dense neurites, 0.015 / 0.018 bits and +6.3 / -1.3 on compact cells, 1.03 / 0.67
   * bits and +26.5 / +9.5 on bodies and neurites (seeds 1 and 2).
   */
  static final long MIN_CONTINUED_PAIRS = 3;

  /**
   * The solver's clusters of {@code graph}, after joining the pieces that continue across a
   * face (the halves of one fragment; only the fragment methods report them): the method then
   * continues from the fragment-level statistics a one-block run would see. O(p log p).
   */
  static int[] clustersJoiningContinuations(ReducedGraph graph, ReducedGraphSolver solver) {
    if (graph.continued().size() == 0) {
      return solver.clusters(graph);
    }
    int[] group = graph.continuationGroups(MIN_CONTINUED_PAIRS);
    int[] ofGroup = solver.clusters(graph.joined(group));
    int[] clusters = new int[group.length];
    for (int i = 0; i < group.length; i++) {
      clusters[i] = ofGroup[group[i]];
    }
    return clusters;
  }

  public static ReducedGraphSolver solverFor(PartitionConfig config) {
    return config.createSolver();
  }
}
