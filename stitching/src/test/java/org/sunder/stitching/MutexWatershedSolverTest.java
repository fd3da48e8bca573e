package org.sunder.stitching;

import org.sunder.blockwise.partition.MutexWatershedSolver;
import org.sunder.blockwise.partition.PartitionConfig;
import org.sunder.blockwise.partition.ReducedGraphSolver;

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
