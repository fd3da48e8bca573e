package org.sunder.stitching;

import org.sunder.blockwise.partition.Linkage;
import org.sunder.blockwise.partition.PartitionConfig;

/** {@link ReducedGraphSolverContract} for {@link AgglomerativeSolver} with mean linkage. */
class AgglomerativeSolverTest extends ReducedGraphSolverContract {
  @Override
  ReducedGraphSolver solver() {
    return new AgglomerativeSolver(Linkage.MEAN, false, 0, "agglomeration mean");
  }

  @Override
  PartitionConfig exactOneBlockConfig() {
    return PartitionConfig.agglomeration(Linkage.MEAN, false, null, null);
  }
}
