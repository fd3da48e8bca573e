package org.sunder.stitching.solve;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.IntFunction;
import java.util.function.LongPredicate;
import java.util.function.LongUnaryOperator;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * Level 1's input of one part of the hierarchical solve, built from the block summaries of the
 * part's blocks and the seam edges of the faces that can hold an edge with an end in the part,
 * without assembling the whole reduced graph: the same edges, in the same order and with the
 * same floating-point sums, as the whole graph's edges with an end in the part
 * ({@link HierarchicalSolver#mutexEdges}, {@link HierarchicalSolver#linkageEdges} or
 * {@link HierarchicalSolver#multicutEdges} of the reduced graph, then distributed to the parts).
 *
 * <p>Which faces: a face owns the voxel edges whose lower end lies in the block below it (see
 * {@link SeamEdges}); the other end lies within the longest offset of the face, so at most
 * {@link #steps} blocks away along each axis (one step when no offset is longer than a block;
 * more with long-range offsets longer than a block). So the faces above every block within that
 * many steps of the part suffice. Sums match because the tables are combined by
 * {@link EdgeStatistics#mergeAll} over the same list as {@link ReducedGraph#assemble} (blocks,
 * then faces, in index order) with the tables not read left empty: the merge tree, and so every
 * pair's order of addition, is the same. Cost: O(rows read · log(blocks + faces)) and a
 * reference per block and face.
 */
public final class PartInputs {
  private PartInputs() {}

  /**
   * Per axis (memory order), the most blocks apart the two ends of a seam edge can lie: the
   * longest offset along the axis in blocks, rounded up, at least 1. O(dimensions).
   */
  public static int[] steps(BlockGrid grid, Offsets offsets) {
    int[] reach = offsets.reach();
    int[] block = grid.blockShape();
    int[] steps = new int[block.length];
    for (int d = 0; d < block.length; d++) {
      steps[d] = Math.max(1, (reach[d] + block[d] - 1) / block[d]);
    }
    return steps;
  }

  /**
   * The blocks whose upper faces can hold an edge with an end in {@code part} of level 1 when no
   * offset is longer than a block: the part's blocks and their neighbours (26-neighbourhood),
   * ascending.
   */
  public static int[] neighbourhood(BlockGrid grid, SuperBlocks superBlocks, int part) {
    int[] ones = new int[grid.gridShape().length];
    Arrays.fill(ones, 1);
    return neighbourhood(grid, superBlocks, part, ones);
  }

  /**
   * The blocks whose upper faces can hold an edge with an end in {@code part} of level 1: the
   * part's blocks and those within {@code steps[d]} blocks of one along every axis {@code d},
   * ascending.
   */
  public static int[] neighbourhood(BlockGrid grid, SuperBlocks superBlocks, int part,
      int[] steps) {
    long[] shape = grid.gridShape();
    boolean[] take = new boolean[grid.blockCount()];
    for (int b = 0; b < grid.blockCount(); b++) {
      if (superBlocks.partOfBlock(b, 1) != part) {
        continue;
      }
      long[] g = grid.gridPosition(b);
      int n = g.length;
      int cells = 1;
      for (int d = 0; d < n; d++) {
        cells *= 2 * steps[d] + 1;
      }
      long[] q = new long[n];
      for (int s = 0; s < cells; s++) {
        int rest = s;
        boolean inside = true;
        for (int d = 0; d < n; d++) {
          int width = 2 * steps[d] + 1;
          q[d] = g[d] + rest % width - steps[d];
          rest /= width;
          inside &= q[d] >= 0 && q[d] < shape[d];
        }
        if (inside) {
          take[grid.blockIndex(q)] = true;
        }
      }
    }
    int count = 0;
    for (boolean t : take) {
      count += t ? 1 : 0;
    }
    int[] out = new int[count];
    count = 0;
    for (int b = 0; b < take.length; b++) {
      if (take[b]) {
        out[count++] = b;
      }
    }
    return out;
  }

  /**
   * The Mutex Watershed's level-1 input of {@code part} (or the linkage rows when
   * {@code linkage}): separated pairs of its blocks first, then per pair with an end in the part
   * its rows, keyed by provisional ids.
   *
   * @param summaryOf reads block {@code b}'s summary (called for the part's blocks only)
   * @param seamsOf reads face {@code f}'s seam edges (called for the faces named above only)
   */
  public static SolveEdges levelOne(BlockGrid grid, SuperBlocks superBlocks, int part,
      boolean linkage, IntFunction<BlockSummary> summaryOf, IntFunction<SeamEdges> seamsOf) {
    int[] ones = new int[grid.gridShape().length];
    Arrays.fill(ones, 1);
    return levelOne(grid, superBlocks, part, linkage ? Rows.LINKAGE : Rows.MUTEX, ones,
        summaryOf, seamsOf);
  }

  /** The row format of a part solver's input. */
  public enum Rows {
    /** {@link MutexPartSolver}'s: separated pairs, and per pair its largest and smallest weight. */
    MUTEX,
    /** {@link LinkagePartSolver}'s: four statistics per pair. */
    LINKAGE,
    /**
     * {@link MulticutPartSolver}'s: per pair its cost, and a joined row per pair with at least
     * {@link GlobalSolve#MIN_CONTINUED_PAIRS} continued voxel pairs (as
     * {@link HierarchicalSolver#multicutEdges}).
     */
    MULTICUT
  }

  /**
   * Level 1's input of {@code part} in the row format {@code rows}: for the Mutex Watershed the
   * separated pairs of its blocks first, then per pair with an end in the part its rows (and for
   * the multicut the joined rows of continued pairs with an end in the part, the continued counts
   * summed over the same faces as the single-level solve's), keyed by provisional ids.
   *
   * @param steps see {@link #steps}
   * @param summaryOf reads block {@code b}'s summary (called for the part's blocks only)
   * @param seamsOf reads face {@code f}'s seam edges (called for the faces named above only)
   */
  public static SolveEdges levelOne(BlockGrid grid, SuperBlocks superBlocks, int part,
      Rows rows, int[] steps, IntFunction<BlockSummary> summaryOf,
      IntFunction<SeamEdges> seamsOf) {
    boolean linkage = rows != Rows.MUTEX;
    IdLayout layout = superBlocks.layout();
    Tables tables = Tables.read(grid, superBlocks, part, steps, summaryOf, seamsOf);
    List<BlockSummary> own = tables.own;
    EdgeStatistics merged = tables.pairs;
    SolveEdges out = new SolveEdges(16);
    if (!linkage) {
      for (BlockSummary s : own) {
        for (int i = 0; i < s.separatedU().length; i++) {
          long a = s.separatedU()[i];
          long b = s.separatedV()[i];
          out.add(a, b, SolveEdges.APART, a, b, SolveEdges.SEPARATED);
        }
      }
    }
    for (int e = 0; e < merged.size(); e++) {
      long a = merged.u(e);
      long b = merged.v(e);
      if (superBlocks.partOfBlock(layout.blockOf(a), 1) != part
          && superBlocks.partOfBlock(layout.blockOf(b), 1) != part) {
        continue;
      }
      if (rows == Rows.MULTICUT) {
        MulticutPartSolver.addPair(out, a, b, merged.sum(e));
      } else if (linkage) {
        LinkagePartSolver.addPair(out, a, b, merged.sum(e), merged.count(e), merged.min(e),
            merged.max(e), a, b);
      } else {
        if (merged.max(e) > 0) {
          out.add(a, b, merged.max(e), a, b, SolveEdges.MAX);
        }
        if (merged.min(e) < 0) {
          out.add(a, b, merged.min(e), a, b, SolveEdges.MIN);
        }
      }
    }
    if (rows == Rows.MULTICUT) {
      EdgeStatistics joined = tables.continued;
      for (int e = 0; e < joined.size(); e++) {
        long a = joined.u(e);
        long b = joined.v(e);
        boolean near = superBlocks.partOfBlock(layout.blockOf(a), 1) == part
            || superBlocks.partOfBlock(layout.blockOf(b), 1) == part;
        if (near && joined.count(e) >= GlobalSolve.MIN_CONTINUED_PAIRS) {
          MulticutPartSolver.addJoined(out, a, b, joined.count(e));
        }
      }
    }
    return out;
  }

  /**
   * Level 1's input of {@code part} for the size filter after the solve
   * ({@link SizeFilterPartSolver}): per pair with an end in the part its four statistics, and a
   * joined row when the solve put both ends in one segment (the same representative; so does
   * a continued pair the solve joined); the statistics of the part's blocks' interior edges
   * ({@link BlockSummary#interiorEdges}); and one size row per node of the part, its rank the
   * solve's representative (every node with a pair, and every segment the solve joined to
   * another).
   *
   * @param solvedOf reads block {@code b}'s final representatives of the solve (its
   *     {@link LevelFiles#finals} file of level 0), for the part's blocks and those a pair
   *     reaches
   */
  public static SolveEdges sizeFilterLevelOne(BlockGrid grid, SuperBlocks superBlocks, int part,
      int[] steps, IntFunction<BlockSummary> summaryOf, IntFunction<SeamEdges> seamsOf,
      IntFunction<MergeMap> solvedOf) {
    IdLayout layout = superBlocks.layout();
    Tables tables = Tables.read(grid, superBlocks, part, steps, summaryOf, seamsOf);
    Map<Integer, MergeMap> solved = new HashMap<>();
    LongUnaryOperator rank = node -> solved.computeIfAbsent(layout.blockOf(node),
        solvedOf::apply).apply(node);
    LongPredicate inside = node -> superBlocks.partOfBlock(layout.blockOf(node), 1) == part;
    SolveEdges out = new SolveEdges(16);
    EdgeStatistics pairs = tables.pairs;
    for (int e = 0; e < pairs.size(); e++) {
      long a = pairs.u(e);
      long b = pairs.v(e);
      if (inside.test(a) || inside.test(b)) {
        LinkagePartSolver.addPair(out, a, b, pairs.sum(e), pairs.count(e), pairs.min(e),
            pairs.max(e), a, b);
        if (rank.applyAsLong(a) == rank.applyAsLong(b)) {
          SizeFilterPartSolver.addJoined(out, a, b);
        }
      }
    }
    EdgeStatistics continued = tables.continued;
    for (int e = 0; e < continued.size(); e++) {
      long a = continued.u(e);
      long b = continued.v(e);
      if ((inside.test(a) || inside.test(b))
          && rank.applyAsLong(a) == rank.applyAsLong(b)) {
        SizeFilterPartSolver.addJoined(out, a, b);
      }
    }
    for (BlockSummary s : tables.own) {
      EdgeStatistics interior = s.interiorEdges();
      for (int e = 0; e < interior.size(); e++) {
        LinkagePartSolver.addPair(out, interior.u(e), interior.v(e), interior.sum(e),
            interior.count(e), interior.min(e), interior.max(e), interior.u(e),
            interior.v(e));
      }
    }
    long[] nodes = new long[2 * out.size()];
    int count = 0;
    for (int e = 0; e < out.size(); e++) {
      if (inside.test(out.u(e))) {
        nodes[count++] = out.u(e);
      }
      if (inside.test(out.v(e))) {
        nodes[count++] = out.v(e);
      }
    }
    Map<Integer, BlockSummary> own = new HashMap<>();
    for (BlockSummary s : tables.own) {
      own.put(s.block(), s);
      // every segment the solve joined to another is a node, pairs or not
      long[] joined = solved.computeIfAbsent(s.block(), solvedOf::apply).nodes();
      if (count + joined.length > nodes.length) {
        nodes = Arrays.copyOf(nodes, count + joined.length);
      }
      System.arraycopy(joined, 0, nodes, count, joined.length);
      count += joined.length;
    }
    for (long node : Arrays.stream(nodes, 0, count).sorted().distinct().toArray()) {
      long voxels = own.get(layout.blockOf(node)).segmentSizes()[
          (int) layout.localOf(node) - 1];
      SizeFilterPartSolver.addNode(out, node, voxels, rank.applyAsLong(node));
    }
    return out;
  }

  /**
   * What level 1 of a part reads: its blocks' summaries, and the reduced graph's pairs and
   * continued pairs with an end near the part, merged as the single-level solve merges them.
   */
  private record Tables(List<BlockSummary> own, EdgeStatistics pairs,
      EdgeStatistics continued) {
    static Tables read(BlockGrid grid, SuperBlocks superBlocks, int part, int[] steps,
        IntFunction<BlockSummary> summaryOf, IntFunction<SeamEdges> seamsOf) {
      List<EdgeStatistics> tables = new ArrayList<>(grid.blockCount() + grid.faceCount());
      List<BlockSummary> own = new ArrayList<>();
      for (int b = 0; b < grid.blockCount(); b++) {
        if (superBlocks.partOfBlock(b, 1) == part) {
          BlockSummary s = summaryOf.apply(b);
          own.add(s);
          tables.add(s.innerEdges());
        } else {
          tables.add(EdgeStatistics.empty());
        }
      }
      EdgeStatistics[] faces = new EdgeStatistics[grid.faceCount()];
      EdgeStatistics[] continued = new EdgeStatistics[grid.faceCount()];
      Arrays.fill(faces, EdgeStatistics.empty());
      Arrays.fill(continued, EdgeStatistics.empty());
      for (int b : neighbourhood(grid, superBlocks, part, steps)) {
        for (int axis = 0; axis < grid.gridShape().length; axis++) {
          int f = grid.faceIndex(b, axis);
          if (f >= 0) {
            SeamEdges seam = seamsOf.apply(f);
            faces[f] = seam.edges();
            continued[f] = seam.continued();
          }
        }
      }
      tables.addAll(Arrays.asList(faces));
      return new Tables(own, EdgeStatistics.mergeAll(tables),
          EdgeStatistics.mergeAll(Arrays.asList(continued)));
    }
  }
}
