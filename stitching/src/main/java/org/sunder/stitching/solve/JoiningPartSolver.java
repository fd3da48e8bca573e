package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.function.LongPredicate;

/**
 * A part of fragment agglomeration's hierarchical solve: first joins the pieces of fragments cut
 * by a face ({@link MulticutPartSolver#JOINED} rows: pairs with at least
 * {@link GlobalSolve#MIN_CONTINUED_PAIRS} continued voxel pairs), as the single-level solve
 * does before it continues the method ({@link GlobalSolve#clustersJoiningContinuations}), then
 * hands the contracted pairs to a {@link LinkagePartSolver}.
 *
 * <p>A group of joined pieces whose joined rows all lie inside the part is whole: its pieces
 * become one node, named by its smallest id, and their pairs are its pairs. A group with a
 * joined row leaving the part is not whole yet (its other pieces lie in another part): its
 * pieces are held back, given to the linkage part as nodes outside the part, and their joined
 * rows go up. The linkage part decides only what no outside node can change (its dominance
 * rule), so its result does not depend on how a held-back group ends up, and the level where
 * the group is whole joins it before anything merges with it: the same clusters as the
 * single-level solve, up to exact ties and the rounding of sums taken in another order.
 *
 * <p>With the sum linkage and threshold 0 this is also the multicut of
 * {@code fragments-multicut} without Kernighan–Lin refinement (greedy additive edge contraction
 * contracts the pair of largest summed weight while one is positive: sum-linkage agglomeration
 * stopped at 0), but that multicut runs by domain decomposition ({@link MulticutPartSolver}):
 * the sum's dominance bound settles too little on realistic tissue.
 *
 * <p>O(m log m) for the part's m rows plus the linkage part's cost.
 */
public final class JoiningPartSolver implements PartSolver {
  private final LinkagePartSolver linkage;

  public JoiningPartSolver(LinkagePartSolver linkage) {
    this.linkage = linkage;
  }

  @Override
  public String name() {
    return linkage.name() + " after joining continued pieces";
  }

  @Override
  public PartResult solve(SolveEdges rows, LongPredicate inside) {
    Groups groups = Groups.of(rows, inside);
    SolveEdges contracted = new SolveEdges(rows.size());
    SolveEdges heldBackJoins = new SolveEdges(16);
    long joinsDecided = 0;
    for (int e = 0; e < rows.size(); e++) {
      long u = rows.u(e);
      long v = rows.v(e);
      if (rows.kind(e) == MulticutPartSolver.JOINED) {
        if (groups.isHeldBack(u) || groups.isHeldBack(v)) {
          heldBackJoins.add(u, v, rows.weight(e), rows.keyU(e), rows.keyV(e), rows.kind(e));
        } else {
          joinsDecided++;
        }
        continue;
      }
      long a = groups.nameOf(u);
      long b = groups.nameOf(v);
      if (a != b) {
        contracted.add(a, b, rows.weight(e), rows.keyU(e), rows.keyV(e), rows.kind(e));
      }
    }
    PartResult inner = contracted.size() == 0
        ? new PartResult(new long[0], new long[0], new SolveEdges(0), 0, 0)
        : linkage.solve(contracted, node -> inside.test(node) && !groups.isHeldBack(node));
    SolveEdges remaining = inner.remaining();
    remaining.addAll(heldBackJoins);
    long[] merged = groups.renamedNodes();
    long[] representative = new long[merged.length];
    for (int i = 0; i < merged.length; i++) {
      representative[i] = groups.nameOf(merged[i]);
    }
    MergeMap composed = compose(new MergeMap(merged, representative),
        new MergeMap(inner.merged(), inner.representative()));
    long heldBackRows = 0;
    for (int e = 0; e < heldBackJoins.size(); e++) {
      heldBackRows += inside.test(heldBackJoins.u(e)) && inside.test(heldBackJoins.v(e)) ? 1 : 0;
    }
    return new PartResult(composed.nodes(), composed.representatives(), remaining,
        inner.decidedEdges() + joinsDecided, inner.heldBackEdges() + heldBackRows);
  }

  /**
   * The map of {@code first} then {@code second} (both ascending by node): a node renamed by
   * {@code first} takes its name's name in {@code second}; nodes of {@code second} keep theirs.
   */
  private static MergeMap compose(MergeMap first, MergeMap second) {
    long[] nodes = new long[first.size() + second.size()];
    long[] reps = new long[nodes.length];
    int i = 0;
    int j = 0;
    for (int k = 0; k < nodes.length; k++) {
      if (j == second.size() || i < first.size() && first.nodes()[i] < second.nodes()[j]) {
        nodes[k] = first.nodes()[i];
        reps[k] = second.apply(first.representatives()[i++]);
      } else {
        nodes[k] = second.nodes()[j];
        reps[k] = second.representatives()[j++];
      }
    }
    return new MergeMap(nodes, reps);
  }

  /** The joined groups of one part's rows. */
  private static final class Groups {
    /** Ends of joined rows, ascending, unique. */
    private final long[] ids;
    private final int[] parent;
    /** Per root: the group's smallest id. */
    private final long[] smallest;
    /** Per root: a joined row of the group leaves the part. */
    private final boolean[] leaving;

    private Groups(long[] ids) {
      this.ids = ids;
      parent = new int[ids.length];
      smallest = ids.clone();
      leaving = new boolean[ids.length];
      for (int i = 0; i < ids.length; i++) {
        parent[i] = i;
      }
    }

    static Groups of(SolveEdges rows, LongPredicate inside) {
      long[] ends = new long[16];
      int count = 0;
      for (int e = 0; e < rows.size(); e++) {
        if (rows.kind(e) == MulticutPartSolver.JOINED) {
          if (count + 2 > ends.length) {
            ends = Arrays.copyOf(ends, 2 * ends.length);
          }
          ends[count++] = rows.u(e);
          ends[count++] = rows.v(e);
        }
      }
      Groups g = new Groups(Arrays.stream(ends, 0, count).sorted().distinct().toArray());
      for (int e = 0; e < rows.size(); e++) {
        if (rows.kind(e) == MulticutPartSolver.JOINED) {
          int a = g.find(g.indexOf(rows.u(e)));
          int b = g.find(g.indexOf(rows.v(e)));
          boolean leaves = !inside.test(rows.u(e)) || !inside.test(rows.v(e));
          if (a != b) {
            g.parent[b] = a;
            g.smallest[a] = Math.min(g.smallest[a], g.smallest[b]);
            g.leaving[a] |= g.leaving[b];
          }
          g.leaving[a] |= leaves;
        }
      }
      return g;
    }

    private int indexOf(long id) {
      return Arrays.binarySearch(ids, id);
    }

    private int find(int x) {
      while (parent[x] != x) {
        parent[x] = parent[parent[x]];
        x = parent[x];
      }
      return x;
    }

    /** Whether {@code id} belongs to a group with a joined row leaving the part. */
    boolean isHeldBack(long id) {
      int i = indexOf(id);
      return i >= 0 && leaving[find(i)];
    }

    /** The node {@code id} is part of here: its whole group's smallest id, else itself. */
    long nameOf(long id) {
      int i = indexOf(id);
      if (i < 0) {
        return id;
      }
      int r = find(i);
      return leaving[r] ? id : smallest[r];
    }

    /** The ids whose name is another id, ascending. */
    long[] renamedNodes() {
      long[] out = new long[ids.length];
      int count = 0;
      for (long id : ids) {
        if (nameOf(id) != id) {
          out[count++] = id;
        }
      }
      return Arrays.copyOf(out, count);
    }
  }
}
