package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.collections.UnionFind;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.sizefilter.SizeFilter;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner.CannotLink;
import org.sunder.stitching.RandomReducedGraphs;

/**
 * The size filter by parts ({@link SizeFilterPartSolver}) gives the single-level filter's
 * groups (as {@link FinalSizeFilter} runs it: segments in the order of their smallest
 * provisional id) at every number of levels, on random reduced graphs whose segments span
 * blocks. Statistics are multiples of 1/4, so sums are exact in any order and ties frequent.
 */
class SizeFilterPartSolverTest {

  /** A random segmentation of a reduced graph's nodes: pieces joined along some pairs. */
  private record Case(ReducedGraph graph, EdgeStatistics pairs, int[] segment, long[] sizes) {}

  private static Case randomCase(Random random, BlockGrid grid, IdLayout layout, int minSize) {
    ReducedGraph graph = RandomReducedGraphs.graph(grid, layout, random, false,
        2 + random.nextInt(10), 1 + random.nextInt(3));
    EdgeStatistics e = graph.edges();
    int m = e.size();
    long[] u = new long[m];
    long[] v = new long[m];
    double[] sum = new double[m];
    long[] count = new long[m];
    double[] min = new double[m];
    double[] max = new double[m];
    for (int i = 0; i < m; i++) {
      u[i] = e.u(i);
      v[i] = e.v(i);
      count[i] = e.count(i);
      min[i] = Math.round(4 * e.min(i)) / 4.0;
      max[i] = Math.max(min[i], Math.round(4 * e.max(i)) / 4.0);
      sum[i] = Math.round(4 * e.sum(i)) / 4.0;
    }
    EdgeStatistics pairs = EdgeStatistics.of(u, v, sum, count, min, max);
    int n = graph.nodeCount();
    int[] parent = new int[n];
    for (int i = 0; i < n; i++) {
      parent[i] = i;
    }
    for (int i = 0; i < pairs.size(); i++) {
      if (pairs.sum(i) > 0 && random.nextInt(3) > 0) {
        int a = UnionFind.root(parent, (int) pairs.u(i));
        int b = UnionFind.root(parent, (int) pairs.v(i));
        parent[Math.max(a, b)] = Math.min(a, b);
      }
    }
    // some pieces joined without a pair between them (as pieces joined across a face by
    // continued voxel pairs alone): only their joined rows tell a part they are one segment
    for (int k = 0; k < n / 10; k++) {
      int a = UnionFind.root(parent, random.nextInt(n));
      int b = UnionFind.root(parent, random.nextInt(n));
      parent[Math.max(a, b)] = Math.min(a, b);
    }
    int[] segment = new int[n];
    long[] sizes = new long[n];
    for (int i = 0; i < n; i++) {
      segment[i] = UnionFind.root(parent, i);
      sizes[i] = random.nextInt(4) == 0 ? minSize / 2 + random.nextInt(2 * minSize)
          : 1 + random.nextInt(minSize / 3);
    }
    return new Case(graph, pairs, segment, sizes);
  }

  /** The single-level filter, per node its group (canonical). */
  private static int[] singleLevel(Case c, SizeFilter filter, CannotLink cannotLink) {
    int n = c.segment.length;
    // segments in the order of their smallest node (the segment's root is its smallest node)
    int[] position = new int[n];
    Arrays.fill(position, -1);
    int count = 0;
    for (int i = 0; i < n; i++) {
      if (c.segment[i] == i) {
        position[i] = count++;
      }
    }
    long[] sizes = new long[count];
    for (int i = 0; i < n; i++) {
      sizes[position[c.segment[i]]] += c.sizes[i];
    }
    int m = c.pairs.size();
    long[] u = new long[m];
    long[] v = new long[m];
    for (int i = 0; i < m; i++) {
      u[i] = position[c.segment[(int) c.pairs.u(i)]] + 1;
      v[i] = position[c.segment[(int) c.pairs.v(i)]] + 1;
    }
    EdgeStatistics statistics = EdgeStatistics.of(u, v, c.pairs.copySum(), c.pairs.copyCount(),
        c.pairs.copyMin(), c.pairs.copyMax());
    int[] group = filter.groups(sizes, statistics,
        org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner.cannotLinkFlags(
            cannotLink, statistics, Linkage.SUM), null);
    int[] out = new int[n];
    for (int i = 0; i < n; i++) {
      out[i] = group[position[c.segment[i]]];
    }
    return RandomReducedGraphs.canonical(out);
  }

  private static SolveEdges rows(Case c) {
    long[] ids = c.graph.nodeIds();
    SolveEdges rows = new SolveEdges(16);
    for (int i = 0; i < ids.length; i++) {
      long rank = ids[c.segment[i]];
      SizeFilterPartSolver.addNode(rows, ids[i], c.sizes[i], rank);
      if (c.segment[i] != i) {
        SizeFilterPartSolver.addJoined(rows, ids[i], rank);
      }
    }
    for (int i = 0; i < c.pairs.size(); i++) {
      long a = ids[(int) c.pairs.u(i)];
      long b = ids[(int) c.pairs.v(i)];
      LinkagePartSolver.addPair(rows, a, b, c.pairs.sum(i), c.pairs.count(i), c.pairs.min(i),
          c.pairs.max(i), Math.min(a, b), Math.max(a, b));
    }
    return rows;
  }

  private static int[] groupsOf(HierarchicalSolve.Result result, long[] ids) {
    long[] reps = result.representatives().resolve(ids);
    int[] out = new int[ids.length];
    for (int i = 0; i < ids.length; i++) {
      int r = Arrays.binarySearch(ids, reps[i]);
      assertTrue(r >= 0 && r <= i, "node " + i + " has representative " + reps[i]);
      out[i] = r;
    }
    return RandomReducedGraphs.canonical(out);
  }

  @Test
  void everyNumberOfLevelsGivesTheSingleLevelFilter() {
    Random random = new Random(97);
    int withLevels = 0;
    long decidedBelowDriver = 0;
    for (int trial = 0; trial < 150; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(5), 1 + random.nextInt(4),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      int minSize = 12 + random.nextInt(20);
      Case c = randomCase(random, grid, layout, minSize);
      SizeFilter filter = new SizeFilter(minSize, Linkage.MEAN,
          SizeFilter.Rule.values()[trial % 2]);
      CannotLink cannotLink = trial % 3 == 0 ? CannotLink.REPULSIVE_EDGE : CannotLink.NONE;
      int[] expected = singleLevel(c, filter, cannotLink);
      SolveEdges rows = rows(c);
      SizeFilterPartSolver solver = new SizeFilterPartSolver(filter, cannotLink, Linkage.SUM);
      SuperBlocks superBlocks = new SuperBlocks(grid, layout, 2);
      long[] ids = c.graph.nodeIds();
      for (long bound = 1; ; bound *= 3) {
        HierarchicalSolve.Result result;
        try {
          result = HierarchicalSolve.run(superBlocks, rows, bound, solver, null);
        } catch (SunderException tooLarge) {
          continue;
        }
        assertArrayEquals(expected, groupsOf(result, ids), "trial " + trial + ", bound "
            + bound + ", " + result.levels().size() + " levels");
        if (!result.levels().isEmpty()) {
          withLevels++;
          decidedBelowDriver += result.levels().get(0).decidedEdges();
        }
        if (result.levels().isEmpty()) {
          break;
        }
      }
    }
    assertTrue(withLevels > 100, withLevels + " solves with levels");
    assertTrue(decidedBelowDriver > 0, "no part decided anything below the driver");
  }
}
