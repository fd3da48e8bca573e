package org.sunder.blockwise.partition.config;

import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.mutex.MutexWatershed;
import org.sunder.blockwise.partition.mutex.MutexWatershedPartitioner;
import org.sunder.blockwise.partition.mutex.MutexWatershedSolver;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

/**
 * {@code "mutex-watershed"}: the Mutex Watershed on the voxel graph ({@link MutexWatershed}),
 * continued on the reduced graph by {@link MutexWatershedSolver}. Takes no linkage,
 * constraints or threshold; weights by channel role and {@link #LONG_RANGE_KEPT} of the
 * long-range edges by default. Its size filter never joins across a repulsive edge it was kept
 * apart by unless the rule says so.
 */
public record MutexWatershedMethod() implements PartitionMethod {

  @Override
  public String jsonName() {
    return "mutex-watershed";
  }

  @Override
  public boolean takesLinkage() {
    return false;
  }

  @Override
  public WeightRule defaultWeights() {
    return WeightRule.byChannelRole();
  }

  /**
   * {@link #LONG_RANGE_KEPT} of the long-range edges, chosen by a seeded hash of the edge
   * ({@link Subsampling#hash}), so every block and face keeps the same ones.
   */
  @Override
  public Subsampling defaultSubsampling() {
    return Subsampling.hash(LONG_RANGE_KEPT, LONG_RANGE_SEED);
  }

  /**
   * The share of long-range edges the method reads by default. On noisy predictions every
   * long-range repulsive edge read early adds a mutual-exclusion constraint that keeps pieces of
   * one object apart for good; reading fewer over-segments less and costs less, but a block then
   * depends on constraints from further away, beyond its halo. Measured with QualityBenchmark on
   * the realistic tissue presets (96 x 256 x 256 voxels), adapted Rand error of the whole volume,
   * dense neurites / compact cells / bodies and neurites, seeds 1-3: every edge 0.313 / 0.191 /
   * 0.135 (150 000 segments for 400-660 objects); 0.2 kept 0.246 / 0.144 / 0.101; 0.1 kept 0.223
   * / 0.135 / 0.090; 0.05 kept 0.221 / 0.138 / 0.084 (34 000 segments). Blockwise (27 blocks,
   * halo the longest offset, seed 1) against the whole volume: every edge 0.004 / 0.032 / 0.034
   * bits; 0.2 kept 0.006 / 0.025 / 0.027; 0.1 kept 0.016 / 0.018 / 0.027; 0.05 kept 0.060 on
   * dense neurites. On the milder scene of the stitching module's BlockwiseRunTest (halo twice
   * the longest offset) 0.1 kept is 0.28 bits from the whole volume and 0.05 kept 1.8 bits (one
   * object merged across many), against 0.009 with every edge and 0.004 with 0.2 kept: 0.2 is
   * the sparsest share that stitched everywhere. KernelBenchmark: 2.7 to 3.8 times faster than
   * every edge on the presets, half the memory.
   */
  public static final double LONG_RANGE_KEPT = 0.2;

  /** The hash seed of the default subsampling (any fixed value; part of the results). */
  public static final long LONG_RANGE_SEED = 7;

  @Override
  public void checkKeys(Linkage linkage, boolean constraints, double threshold) {
    if (linkage != null || constraints || threshold != 0) {
      throw new PartitionConfigException(ErrorKind.INVALID_CONFIG,
          "linkage/constraints/threshold: not used by method \"mutex-watershed\"; "
              + "remove them or use \"agglomeration\"");
    }
  }

  @Override
  public Partitioner partitioner(PartitionConfig config) {
    return new MutexWatershedPartitioner(config.weights(), config.subsampling());
  }

  @Override
  public ReducedGraphSolver solver(PartitionConfig config) {
    return new MutexWatershedSolver();
  }

  @Override
  public SizeFilteredPartitioner.CannotLink cannotLink(PartitionConfig config) {
    return SizeFilteredPartitioner.CannotLink.REPULSIVE_EDGE;
  }

  /** {@inheritDoc} (measured: 565 to 640 on the three presets) */
  @Override
  public int workingBytesPerVoxel() {
    return 600;
  }

  /** {@inheritDoc} ({@value #SOLVE_NANOS_PER_EDGE}) */
  @Override
  public double solveNanosPerEdge() {
    return SOLVE_NANOS_PER_EDGE;
  }

  /**
   * The level-by-level solve's CPU time per reduced-graph edge: HierarchicalSolveBenchmark, Mutex
   * Watershed on 95.6 M edges, 337 ns (220 at 0.85 M), medians of five runs, with bulk edge files
   * and the part's pair sets replaced by a counting sort.
   */
  static final double SOLVE_NANOS_PER_EDGE = 340;
}
