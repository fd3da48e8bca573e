package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/**
 * What one part of the hierarchical Mutex Watershed settles, on graphs small enough to follow
 * by hand; {@code HierarchicalSolverTest} checks whole solves against the single-level one on
 * random graphs.
 */
class MutexPartSolverTest {
  private static final long A = 1;
  private static final long B = 2;
  private static final long OUT_A = 11;
  private static final long OUT_B = 12;

  @Test
  void clustersOnlyRepulsionLeavesKeepTheirMembersAndJoin() {
    // a and b inside, each repelled by a node outside first, then attracted to each other: in
    // the whole-graph run nothing joins a or b before the attractive edge, so it joins them
    SolveEdges edges = new SolveEdges(3);
    edges.add(A, OUT_A, -0.9, A, OUT_A, SolveEdges.MIN);
    edges.add(B, OUT_B, -0.85, B, OUT_B, SolveEdges.MIN);
    edges.add(A, B, 0.8, A, B, SolveEdges.MAX);
    PartResult r = new MutexPartSolver().solve(edges, node -> node == A || node == B);
    assertEquals(1, r.decidedEdges());
    assertEquals(0, r.heldBackEdges());
    assertArrayEquals(new long[] {B}, r.merged());
    assertArrayEquals(new long[] {A}, r.representative());
    SolveEdges up = new SolveEdges(2);
    up.add(A, OUT_A, -0.9, A, OUT_A, SolveEdges.MIN);
    up.add(A, OUT_B, -0.85, B, OUT_B, SolveEdges.MIN);
    assertEquals(up, r.remaining());
  }

  @Test
  void clustersAnAttractionLeavesAreHeldBack() {
    // the same with attraction leaving: in the whole-graph run a may have joined a cluster
    // exclusive with b's, so the part cannot join them
    SolveEdges edges = new SolveEdges(3);
    edges.add(A, OUT_A, 0.9, A, OUT_A, SolveEdges.MAX);
    edges.add(B, OUT_B, 0.85, B, OUT_B, SolveEdges.MAX);
    edges.add(A, B, 0.8, A, B, SolveEdges.MAX);
    PartResult r = new MutexPartSolver().solve(edges, node -> node == A || node == B);
    assertEquals(0, r.decidedEdges());
    assertEquals(1, r.heldBackEdges());
    assertEquals(0, r.merged().length);
    assertEquals(3, r.remaining().size());
  }
}
