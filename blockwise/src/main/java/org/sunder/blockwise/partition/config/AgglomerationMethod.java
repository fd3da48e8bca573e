package org.sunder.blockwise.partition.config;

import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Agglomeration;
import org.sunder.blockwise.partition.agglomeration.AgglomerationPartitioner;
import org.sunder.blockwise.partition.agglomeration.AgglomerativeSolver;


/**
 * {@code "agglomeration"}: agglomerative clustering of the voxel graph ({@link Agglomeration})
 * with the configured linkage (default mean), constraints and threshold, continued on the
 * reduced graph by {@link AgglomerativeSolver}.
 */
public record AgglomerationMethod() implements PartitionMethod {

  @Override
  public String jsonName() {
    return "agglomeration";
  }

  @Override
  public Partitioner partitioner(PartitionConfig config) {
    return new AgglomerationPartitioner(agglomeration(config), config.weights(),
        config.subsampling());
  }

  @Override
  public ReducedGraphSolver solver(PartitionConfig config) {
    return agglomerativeSolver(config);
  }

  /** The configured agglomeration (linkage, constraints, threshold) of an agglomerating method. */
  static Agglomeration agglomeration(PartitionConfig config) {
    return new Agglomeration(config.linkage(), config.constraints())
        .withThreshold(config.threshold());
  }

  /** The global solve of an agglomerating method: the agglomeration continued. */
  static ReducedGraphSolver agglomerativeSolver(PartitionConfig config) {
    return new AgglomerativeSolver(config.linkage(), config.constraints(), config.threshold(),
        "agglomeration " + config.linkage().jsonName()
            + (config.constraints() ? " with constraints" : ""));
  }

  /** {@inheritDoc} (measured for mean linkage from voxels: 1173 on the three presets) */
  @Override
  public int workingBytesPerVoxel() {
    return 1170;
  }

  /** {@inheritDoc} (not measured for linkage on the reduced graph; taken as the Mutex Watershed's, whose heap-ordered merging it shares) */
  @Override
  public double solveNanosPerEdge() {
    return MutexWatershedMethod.SOLVE_NANOS_PER_EDGE;
  }
}
