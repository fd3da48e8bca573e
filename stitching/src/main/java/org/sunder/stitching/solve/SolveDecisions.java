package org.sunder.stitching.solve;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Objects;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.stitching.task.SeamEdges;

/**
 * The least certain decisions of a global solve across block faces, for proofreading: per seam
 * pair (two pieces from different blocks that share voxel edges across a face), whether the
 * solve joined them and how strongly the mean edge weight agrees ({@link SolveDecision#margin()}).
 * The joins and the cuts with the smallest margins are where a merge or a split error is most
 * likely; each pair of final ids is listed once, at its least certain contact. Pairs with fewer
 * than {@code minVoxelEdges} edges (grazing contacts) are left out.
 * O(p log p) for p seam pairs.
 */
public final class SolveDecisions {
  private SolveDecisions() {}

  /** The decisions in ascending margin, at most {@code perKind} joins and {@code perKind} cuts. */
  public static List<SolveDecision> leastCertain(List<SeamEdges> seams,
      java.util.function.LongUnaryOperator finalIds,
      int perKind, long minVoxelEdges) {
    Objects.requireNonNull(finalIds, "finalIds");
    if (perKind < 0) {
      throw new IllegalArgumentException("perKind must be >= 0, got " + perKind);
    }
    List<SolveDecision> joins = new ArrayList<>();
    List<SolveDecision> cuts = new ArrayList<>();
    for (SeamEdges seam : seams) {
      EdgeStatistics edges = seam.edges();
      for (int i = 0; i < edges.size(); i++) {
        if (edges.count(i) < minVoxelEdges) {
          continue;
        }
        long a = Math.min(edges.u(i), edges.v(i));
        long b = Math.max(edges.u(i), edges.v(i));
        long fa = finalIds.applyAsLong(a);
        long fb = finalIds.applyAsLong(b);
        SolveDecision d = new SolveDecision(fa == fb, seam.face(), a, b, fa, fb,
            edges.count(i), edges.mean(i));
        (d.joined() ? joins : cuts).add(d);
      }
    }
    List<SolveDecision> result = new ArrayList<>(smallest(joins, perKind));
    result.addAll(smallest(cuts, perKind));
    result.sort(ORDER);
    return result;
  }

  /** Ascending margin, then face, then ids: a total order, so the list is deterministic. */
  static final Comparator<SolveDecision> ORDER = Comparator
      .comparingDouble(SolveDecision::margin)
      .thenComparingInt(SolveDecision::face)
      .thenComparingLong(SolveDecision::provisionalA)
      .thenComparingLong(SolveDecision::provisionalB);

  /** The first {@code n} in {@link #ORDER}, one per pair of final ids (its least certain). */
  private static List<SolveDecision> smallest(List<SolveDecision> decisions, int n) {
    decisions.sort(ORDER);
    List<SolveDecision> kept = new ArrayList<>();
    java.util.Set<List<Long>> seen = new java.util.HashSet<>();
    for (SolveDecision d : decisions) {
      if (kept.size() == n) {
        break;
      }
      if (seen.add(List.of(Math.min(d.finalA(), d.finalB()), Math.max(d.finalA(), d.finalB())))) {
        kept.add(d);
      }
    }
    return kept;
  }
}
