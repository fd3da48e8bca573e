package org.sunder.blockwise.partition.config;

import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.AgglomerativeSolver;
import org.sunder.blockwise.partition.fragments.FragmentsAgglomerationPartitioner;
import org.sunder.blockwise.partition.fragments.WatershedFragments;

/**
 * {@code "fragments-agglomeration"}: watershed fragments ({@link WatershedFragments}) joined by
 * agglomerative clustering with the configured linkage (default mean), constraints and
 * threshold ({@link FragmentsAgglomerationPartitioner}), continued on the reduced graph by
 * {@link AgglomerativeSolver}.
 */
public record FragmentsAgglomerationMethod() implements PartitionMethod {

  @Override
  public String jsonName() {
    return "fragments-agglomeration";
  }

  @Override
  public boolean usesFragments() {
    return true;
  }

  /**
   * Two: mean linkage carries a few differing fragments far. Measured ({@code QualityBenchmark
   * 256 256 96 1,2,3 fragments-agglomeration 27}, bodies and neurites, blockwise against whole
   * volume): one halo 0.079 / 0.063 / 0.006 bits, two 0.018 / 0.024 / 0.002, three the same as
   * two; the multicut of {@code fragments-multicut} is within 0.01 bits with one.
   */
  @Override
  public int contextHalos() {
    return 2;
  }

  @Override
  public void validate(PartitionConfig config, Offsets offsets) {
    config.fragments().forDimension(offsets.dimension());
  }

  @Override
  public Partitioner partitioner(PartitionConfig config) {
    return new FragmentsAgglomerationPartitioner(config.fragments(),
        AgglomerationMethod.agglomeration(config), config.weights(), config.subsampling());
  }

  @Override
  public ReducedGraphSolver solver(PartitionConfig config) {
    return AgglomerationMethod.agglomerativeSolver(config);
  }

  /** {@inheritDoc} (a stated bound, not measured: the voxel-level work is the seeded watershed on the boundary map, the graph has one node per fragment) */
  @Override
  public int workingBytesPerVoxel() {
    return 150;
  }

  /** {@inheritDoc} (not measured for linkage on the reduced graph; taken as the Mutex Watershed's, whose heap-ordered merging it shares) */
  @Override
  public double solveNanosPerEdge() {
    return MutexWatershedMethod.SOLVE_NANOS_PER_EDGE;
  }
}
