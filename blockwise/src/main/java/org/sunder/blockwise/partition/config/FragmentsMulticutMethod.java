package org.sunder.blockwise.partition.config;

import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.fragments.FragmentsMulticutPartitioner;
import org.sunder.blockwise.partition.fragments.WatershedFragments;
import org.sunder.blockwise.partition.multicut.MulticutSolver;

/**
 * {@code "fragments-multicut"}: watershed fragments ({@link WatershedFragments}) joined by a
 * multicut on their linkage values (default sum: the summed weights;
 * {@link FragmentsMulticutPartitioner}), continued on the reduced graph by
 * {@link MulticutSolver}. Takes no constraints or threshold. The default method of a run
 * ({@link PartitionMethod#robustDefault()}).
 */
public record FragmentsMulticutMethod() implements PartitionMethod {

  @Override
  public String jsonName() {
    return "fragments-multicut";
  }

  @Override
  public boolean usesFragments() {
    return true;
  }

  @Override
  public boolean movesFragmentBorders() {
    return FragmentsMulticutPartitioner.MOVES_BORDERS;
  }

  @Override
  public Linkage defaultLinkage() {
    return Linkage.SUM;
  }

  /**
   * Logit weights of affinities clamped to {@code [LOGIT_CLAMP, 1 - LOGIT_CLAMP]}, so that no
   * voxel edge adds more than 4.6 to a multicut cost. Measured on the realistic presets (whole
   * volume, seeds 1–3): against the clamp of {@link WeightRule#LOGIT_EPSILON}, 0.003, 0.01 and
   * 0.05 each lower the adapted Rand error on dense neurites and on bodies and neurites on
   * every seed, by 3–16 %, and leave compact cells within 0.002 (see README, "Choosing a
   * method").
   */
  public static final double LOGIT_CLAMP = 0.01;

  @Override
  public WeightRule defaultWeights() {
    return WeightRule.logit(LOGIT_CLAMP);
  }

  @Override
  public void checkKeys(Linkage linkage, boolean constraints, double threshold) {
    if (constraints || threshold != 0) {
      throw new PartitionConfigException(ErrorKind.INVALID_CONFIG,
          "constraints/threshold: not used by method \"fragments-multicut\"");
    }
  }

  @Override
  public void validate(PartitionConfig config, Offsets offsets) {
    config.fragments().forDimension(offsets.dimension());
  }

  @Override
  public Partitioner partitioner(PartitionConfig config) {
    return new FragmentsMulticutPartitioner(config.fragments(), config.linkage(),
        config.weights(), config.subsampling(), config.kernighanLin());
  }

  @Override
  public ReducedGraphSolver solver(PartitionConfig config) {
    return new MulticutSolver(config.linkage(), config.kernighanLin());
  }

  /** {@inheritDoc} (a stated bound, not measured: the voxel-level work is the seeded watershed on the boundary map, the graph has one node per fragment) */
  @Override
  public int workingBytesPerVoxel() {
    return 150;
  }

  /**
   * {@inheritDoc} (the default run of a 192 x 512 x 512 dense-neurite preset measured 25 400 ns
   * with Kernighan–Lin refinement, 147.3 s for 5.79 M reduced-graph edges on a shared 2-core
   * machine; without it that run's solve took 9.5 s against 24.8 s for the refined one run
   * just after, so the figure is scaled by 0.38)
   */
  @Override
  public double solveNanosPerEdge() {
    return 9700;
  }
}
