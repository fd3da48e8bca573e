package org.sunder.stitching;

import org.sunder.blockwise.partition.PartitionConfig;

/** {@link ReducedGraphSolverContract} for {@link MutexWatershedSolver}. */
class MutexWatershedSolverTest extends ReducedGraphSolverContract {
  @Override
  ReducedGraphSolver solver() {
    return new MutexWatershedSolver();
  }

  @Override
  PartitionConfig exactOneBlockConfig() {
    return PartitionConfig.mutexWatershed(null, null);
  }
}
