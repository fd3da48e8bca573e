package org.sunder.stitching.solve;

import it.unimi.dsi.fastutil.longs.Long2IntOpenHashMap;
import java.util.Arrays;
import java.util.function.LongPredicate;
import org.sunder.blockwise.collections.RadixSort;
import org.sunder.blockwise.collections.UnionFind;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.sizefilter.SizeFilter;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

/**
 * One part of the size filter after the solve, level by level: the {@link SizeFilter} on final
 * segments that may span many parts, decided where a part can decide it alone.
 *
 * <p>Input rows: per node (a provisional id) one {@link #SIZE} row, its voxels and its
 * <em>rank</em> (the smallest provisional id of the segment it is a piece of before filtering;
 * the filter's order and tie label); a {@link #JOINED} row for pairs of nodes that are pieces
 * of one segment (for example every pair the solve left uncut, or every node and the smallest
 * of its segment); and a pair's statistics as {@link LinkagePartSolver}'s four rows. Pieces
 * with one rank are one segment.
 *
 * <p>The part joins the pieces it holds. A segment is <em>small</em> when its voxels in the
 * part are below the filter's size (with a row leaving the part, pieces outside may add more).
 * The filter acts on each connected set of small segments with the segments around it as if
 * alone (see {@link SizeFilter}: a merge elsewhere changes nothing such a set sees), so the
 * part filters every such set none of whose members has a row leaving the part, exactly as the
 * single-level filter would, ranks in the same order. (A set beside a piece of a segment that
 * continues outside has that piece as a member, since the piece has a joined or pair row
 * leaving.) The rest goes up: every row leaving the part, and the inner pairs with an end that
 * is small (two large segments never join), combined per pair of segments (sums in key order,
 * the smallest key kept), with one size row per segment those rows name. Large segments keep
 * their rank when they absorb small ones. A part holding every node (the driver's) decides
 * everything. Results equal the single-level filter's up to the order in which floating-point
 * statistics are summed.
 *
 * <p>O(m log m) for the part's m rows plus the filter's O(p log p) on the pairs it decides.
 */
public final class SizeFilterPartSolver implements PartSolver {
  /** A node's voxels (weight) and rank ({@code keyV}); a self row. */
  public static final byte SIZE = 10;
  /** Present (weight 0) when the pair's ends are pieces of one segment; the last row kind. */
  public static final byte JOINED = 11;

  private final SizeFilter filter;
  private final SizeFilteredPartitioner.CannotLink cannotLink;
  private final Linkage methodLinkage;

  /**
   * @param filter the filter (its size, linkage and rule)
   * @param cannotLink which pairs the method kept apart, from the combined statistics
   * @param methodLinkage the method's linkage, for {@link SizeFilteredPartitioner#cannotLinkFlags}
   */
  public SizeFilterPartSolver(SizeFilter filter, SizeFilteredPartitioner.CannotLink cannotLink,
      Linkage methodLinkage) {
    this.filter = filter;
    this.cannotLink = cannotLink;
    this.methodLinkage = methodLinkage;
  }

  @Override
  public String name() {
    return "size filter of " + filter.minSize() + " voxels by parts";
  }

  /** Appends a node's size row. */
  public static void addNode(SolveEdges out, long node, long voxels, long rank) {
    out.add(node, node, voxels, node, rank, SIZE);
  }

  /** Appends the row that makes two nodes pieces of one segment. */
  public static void addJoined(SolveEdges out, long a, long b) {
    out.add(a, b, 0, Math.min(a, b), Math.max(a, b), JOINED);
  }

  @Override
  public PartResult solve(SolveEdges rows, LongPredicate inside) {
    int[] order = EdgeSort.byKey(rows);
    PartNodes part = PartNodes.of(order.length, k -> rows.u(order[k]),
        k -> rows.v(order[k]), inside);
    return new Run(rows, order, part).solve();
  }

  /** The state of one part's solve; rows are read in key order ({@code order}). */
  private final class Run {
    private final SolveEdges rows;
    private final int[] order;
    private final long[] nodes;
    private final int[] iu;
    private final int[] iv;
    private final int n;
    /** Per node, its segment's node (the smallest node of the segment in the part). */
    private final int[] segment;
    /** Per segment node: its voxels in the part, rank, and whether a row leaves the part. */
    private final long[] size;
    private final long[] rank;
    private final boolean[] touchesOutside;
    /** Per segment node, whether it is small, and whether the part filters it. */
    private final boolean[] small;
    private final boolean[] decided;

    Run(SolveEdges rows, int[] order, PartNodes part) {
      this.rows = rows;
      this.order = order;
      this.nodes = part.nodes();
      this.iu = part.iu();
      this.iv = part.iv();
      this.n = nodes.length;
      this.segment = new int[n];
      this.size = new long[n];
      this.rank = new long[n];
      this.touchesOutside = new boolean[n];
      this.small = new boolean[n];
      this.decided = new boolean[n];
    }

    PartResult solve() {
      joinPieces();
      Pairs inner = Pairs.of(rows, order, iu, iv, segment);
      int[] filtered = filterDecidable(inner);
      int[] root = new int[n];
      long[] rep = new long[n];
      for (int i = 0; i < n; i++) {
        root[i] = UnionFind.root(filtered, segment[i]);
        rep[i] = nodes[root[i]];
      }
      return handUp(root, rep);
    }

    /** Joins the pieces of each segment: sizes, ranks, which are small. */
    private void joinPieces() {
      long[] nodeSize = new long[n];
      long[] nodeRank = nodes.clone();
      boolean[] hasSize = new boolean[n];
      for (int i = 0; i < n; i++) {
        segment[i] = i;
      }
      for (int k = 0; k < order.length; k++) {
        int e = order[k];
        if (rows.kind(e) == SIZE && iu[k] >= 0) {
          int i = iu[k];
          nodeSize[i] += (long) rows.weight(e);
          nodeRank[i] = hasSize[i] ? Math.min(nodeRank[i], rows.keyV(e)) : rows.keyV(e);
          hasSize[i] = true;
        } else if (rows.kind(e) == JOINED && iu[k] >= 0 && iv[k] >= 0) {
          UnionFind.union(segment, iu[k], iv[k]);
        }
      }
      Long2IntOpenHashMap byRank = new Long2IntOpenHashMap(n);
      byRank.defaultReturnValue(-1);
      for (int i = 0; i < n; i++) {
        int first = byRank.putIfAbsent(nodeRank[i], i);
        if (first >= 0) {
          UnionFind.union(segment, first, i);
        }
      }
      Arrays.fill(rank, Long.MAX_VALUE);
      for (int i = 0; i < n; i++) {
        segment[i] = UnionFind.root(segment, i);
        size[segment[i]] += nodeSize[i];
        rank[segment[i]] = Math.min(rank[segment[i]], nodeRank[i]);
      }
      for (int k = 0; k < order.length; k++) {
        if ((iu[k] < 0) != (iv[k] < 0)) {
          touchesOutside[segment[iu[k] >= 0 ? iu[k] : iv[k]]] = true;
        }
      }
      for (int s = 0; s < n; s++) {
        // a segment of no voxels is never merged away, unless pieces outside may add some
        small[s] = s == segment[s] && size[s] < filter.minSize()
            && (size[s] > 0 || touchesOutside[s]);
      }
    }

    /**
     * Filters every connected set of small segments none of which has a row leaving the part.
     * Returns a union-find forest over segment nodes: the filter's merges.
     */
    private int[] filterDecidable(Pairs inner) {
      int[] set = UnionFind.singletons(n);
      for (int p = 0; p < inner.size; p++) {
        if (small[inner.a[p]] && small[inner.b[p]]) {
          UnionFind.union(set, inner.a[p], inner.b[p]);
        }
      }
      boolean[] blocked = new boolean[n];
      for (int s = 0; s < n; s++) {
        set[s] = UnionFind.root(set, s);
        blocked[set[s]] |= small[s] && touchesOutside[s];
      }
      for (int s = 0; s < n; s++) {
        decided[s] = small[s] && !blocked[set[s]];
      }
      return filterSegments(inner);
    }

    /**
     * One filter run over the decided small segments and the large segments beside them,
     * numbered in rank order; its groups as a union-find forest over segment nodes.
     */
    private int[] filterSegments(Pairs inner) {
      boolean[] member = decided.clone();
      int[] used = new int[inner.size];
      int usedCount = 0;
      for (int p = 0; p < inner.size; p++) {
        if (decided[inner.a[p]] || decided[inner.b[p]]) {
          member[inner.a[p]] = true;
          member[inner.b[p]] = true;
          used[usedCount++] = p;
        }
      }
      int count = 0;
      for (boolean m : member) {
        count += m ? 1 : 0;
      }
      int[] members = new int[count];
      long[] keys = new long[count];
      count = 0;
      for (int s = 0; s < n; s++) {
        if (member[s]) {
          members[count] = s;
          keys[count++] = RadixSort.signedKey(rank[s]);
        }
      }
      RadixSort.sortByKeyUnsigned(keys, members, count);
      int[] index = new int[n];
      long[] sizes = new long[count];
      for (int i = 0; i < count; i++) {
        index[members[i]] = i;
        sizes[i] = size[members[i]];
      }
      long[] u = new long[usedCount];
      long[] v = new long[usedCount];
      double[] sum = new double[usedCount];
      long[] edges = new long[usedCount];
      double[] min = new double[usedCount];
      double[] max = new double[usedCount];
      for (int j = 0; j < usedCount; j++) {
        int p = used[j];
        u[j] = index[inner.a[p]] + 1;
        v[j] = index[inner.b[p]] + 1;
        sum[j] = inner.sum[p];
        edges[j] = inner.count[p];
        min[j] = inner.min[p];
        max[j] = inner.max[p];
      }
      EdgeStatistics statistics = EdgeStatistics.of(u, v, sum, edges, min, max);
      boolean[] flags = SizeFilteredPartitioner.cannotLinkFlags(cannotLink, statistics,
          methodLinkage);
      int[] group = filter.groups(sizes, statistics, flags, null);
      int[] forest = UnionFind.singletons(n);
      for (int i = 0; i < count; i++) {
        UnionFind.union(forest, members[i], members[group[i]]);
      }
      return forest;
    }

    /**
     * The part's result: every node's representative, and for the next level the rows still
     * needed (see the class comment). A filtered segment made of decided small segments alone
     * is finished: nothing of it goes up.
     */
    private PartResult handUp(int[] root, long[] rep) {
      // per filtered segment (at its root): its voxels, and its undecided piece's class and rank
      // (a filtered segment holds at most one undecided segment: the filter joins no two)
      boolean[] finished = new boolean[n];
      boolean[] rootSmall = new boolean[n];
      long[] total = new long[n];
      long[] rootRank = new long[n];
      Arrays.fill(finished, true);
      for (int s = 0; s < n; s++) {
        if (segment[s] != s) {
          continue;
        }
        int r = root[s];
        total[r] += size[s];
        if (!decided[s]) {
          finished[r] = false;
          rootSmall[r] = small[s];
          rootRank[r] = rank[s];
        }
      }
      SolveEdges out = new SolveEdges(16);
      boolean[] named = new boolean[n];
      for (int k = 0; k < order.length; k++) {
        int e = order[k];
        boolean innerU = iu[k] >= 0;
        boolean innerV = iv[k] >= 0;
        if (innerU != innerV) {
          out.add(rows, e, innerU ? rep[iu[k]] : rows.u(e), innerV ? rep[iv[k]] : rows.v(e));
          named[root[innerU ? iu[k] : iv[k]]] = true;
        }
      }
      Pairs pairs = Pairs.of(rows, order, iu, iv, root);
      long decidedPairs = 0;
      long heldBack = 0;
      for (int p = 0; p < pairs.size; p++) {
        int a = pairs.a[p];
        int b = pairs.b[p];
        if (!finished[a] && !finished[b] && (rootSmall[a] || rootSmall[b])) {
          int first = pairs.firstRow[p];
          LinkagePartSolver.addPair(out, nodes[a], nodes[b], pairs.sum[p], pairs.count[p],
              pairs.min[p], pairs.max[p], rows.keyU(first), rows.keyV(first));
          named[a] = true;
          named[b] = true;
          heldBack += pairs.rows[p];
        } else {
          decidedPairs += pairs.rows[p];
        }
      }
      for (int r = 0; r < n; r++) {
        if (named[r]) {
          addNode(out, nodes[r], total[r], rootRank[r]);
        }
      }
      return PartResult.of(nodes, rep, out, decidedPairs, heldBack);
    }
  }

  /**
   * A part's inner pairs between groups of nodes ({@code groupOf}, per node index), the rows of
   * each pair combined in key order: statistics summed, the first (smallest) key's row kept.
   */
  private static final class Pairs {
    int size;
    int[] a;
    int[] b;
    double[] sum;
    long[] count;
    double[] min;
    double[] max;
    int[] firstRow;
    /** Per pair, the original pairs combined in it (its sum rows). */
    long[] rows;

    static Pairs of(SolveEdges input, int[] order, int[] iu, int[] iv, int[] groupOf) {
      Pairs p = new Pairs();
      int cap = Math.max(4, order.length / 4);
      p.a = new int[cap];
      p.b = new int[cap];
      p.sum = new double[cap];
      p.count = new long[cap];
      p.min = new double[cap];
      p.max = new double[cap];
      p.firstRow = new int[cap];
      p.rows = new long[cap];
      Long2IntOpenHashMap index = new Long2IntOpenHashMap(cap);
      index.defaultReturnValue(-1);
      for (int k = 0; k < order.length; k++) {
        int e = order[k];
        byte kind = input.kind(e);
        if (iu[k] < 0 || iv[k] < 0 || kind < LinkagePartSolver.SUM
            || kind > LinkagePartSolver.MAX_VALUE) {
          continue;
        }
        int x = groupOf[iu[k]];
        int y = groupOf[iv[k]];
        if (x == y) {
          continue;
        }
        long key = ((long) Math.min(x, y) << 32) | Math.max(x, y);
        int at = index.get(key);
        if (at < 0) {
          at = p.add(Math.min(x, y), Math.max(x, y), e);
          index.put(key, at);
        }
        double w = input.weight(e);
        switch (kind) {
          case LinkagePartSolver.SUM -> {
            p.sum[at] += w;
            p.rows[at]++;
          }
          case LinkagePartSolver.COUNT -> p.count[at] += (long) w;
          case LinkagePartSolver.MIN_VALUE -> p.min[at] = Math.min(p.min[at], w);
          default -> p.max[at] = Math.max(p.max[at], w);
        }
      }
      return p;
    }

    private int add(int x, int y, int row) {
      if (size == a.length) {
        int cap = 2 * size;
        a = Arrays.copyOf(a, cap);
        b = Arrays.copyOf(b, cap);
        sum = Arrays.copyOf(sum, cap);
        count = Arrays.copyOf(count, cap);
        min = Arrays.copyOf(min, cap);
        max = Arrays.copyOf(max, cap);
        firstRow = Arrays.copyOf(firstRow, cap);
        rows = Arrays.copyOf(rows, cap);
      }
      a[size] = x;
      b[size] = y;
      min[size] = Double.POSITIVE_INFINITY;
      max[size] = Double.NEGATIVE_INFINITY;
      firstRow[size] = row;
      return size++;
    }
  }
}
