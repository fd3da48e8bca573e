package org.sunder.blockwise.partition.config;

import org.sunder.blockwise.ErrorKind;
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
 * constraints or threshold; weights by channel role by default. Its size filter never joins
 * across a repulsive edge it was kept apart by unless the rule says so.
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
