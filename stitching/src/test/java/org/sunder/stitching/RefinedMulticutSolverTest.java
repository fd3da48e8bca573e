package org.sunder.stitching;

import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.multicut.MulticutSolver;

/**
 * {@link ReducedGraphSolverContract} for {@link MulticutSolver} on summed weights with
 * Kernighan–Lin refinement ({@code "kernighanLin": true}).
 */
class RefinedMulticutSolverTest extends ReducedGraphSolverContract {
  @Override
  ReducedGraphSolver solver() {
    return new MulticutSolver(Linkage.SUM, true);
  }

  /** None, as for {@link MulticutSolverTest}. */
  @Override
  PartitionConfig exactOneBlockConfig() {
    return null;
  }
}
