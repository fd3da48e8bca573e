package org.sunder.stitching;

import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.multicut.MulticutSolver;

/**
 * {@link ReducedGraphSolverContract} for {@link MulticutSolver} on summed weights: the greedy
 * additive contraction alone, the default.
 */
class MulticutSolverTest extends ReducedGraphSolverContract {
  @Override
  ReducedGraphSolver solver() {
    return new MulticutSolver(Linkage.SUM, false);
  }

  /**
   * None: the multicut solves the fragments' graph, and fragments near a face depend on the box
   * they were computed in, so even exact affinities do not give the one-block result on the
   * thin fibres of the test scene (see {@code BlockwiseRunTest}).
   */
  @Override
  PartitionConfig exactOneBlockConfig() {
    return null;
  }
}
