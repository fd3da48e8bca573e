package org.sunder.stitching.solve;

import java.util.List;
import java.util.function.LongPredicate;

/**
 * The task function of one part (super-block) of a hierarchical solve level: decides what the
 * part's edges decide alone and hands the rest up. A part whose {@code inside} accepts every
 * node (the driver's last level) decides everything. Deterministic: the result depends only on
 * the edges' content and the inside test, not on their order.
 */
public interface PartSolver {

  /** A name for reports. */
  String name();

  /**
   * @param edges every edge with at least one end inside the part, one copy per key
   * @param inside whether a node (provisional id) belongs to the part
   */
  PartResult solve(SolveEdges edges, LongPredicate inside);

  /**
   * A part's input at the next level: the outputs of its parts one level down, the copies of
   * each edge (one from the part at each of its ends) joined ({@link SolveEdges#joinCopies}).
   * This concatenates them and joins in key order; a solver whose outputs come in an order of
   * its own may merge them in it instead.
   */
  default SolveEdges gather(List<SolveEdges> outputs) {
    return SolveEdges.concatenation(outputs).joinCopies();
  }
}
