package org.sunder.blockwise.graph;

/**
 * The graph of segments of a label array: one row of {@link EdgeStatistics} per pair of
 * distinct labels joined by at least one present edge of a {@link GridGraph} (every offset,
 * long-range ones included, after masking and subsampling). Label 0 means "no segment": edges
 * touching it are skipped. Built in one pass over the edges ({@link GridGraph#forEachEdgeAcross}),
 * {@code O(nodeCount * offsetCount)} expected time plus {@code O(p log p)} for {@code p} pairs. Immutable.
 */
public final class RegionGraph {
  /** Marks a pair's row as one of edges inside the region in the one-pass accumulation. */
  private static final long INSIDE = 1L << 62;

  private final EdgeStatistics statistics;
  private final EdgeStatistics insideStatistics;

  private RegionGraph(EdgeStatistics statistics, EdgeStatistics insideStatistics) {
    this.statistics = statistics;
    this.insideStatistics = insideStatistics;
  }

  /** Region graph of {@code labels} (box voxels in memory order) over {@code graph}'s edges. */
  public static RegionGraph of(int[] labels, GridGraph graph) {
    return of(labels, graph, null, null);
  }

  /**
   * As {@link #of(int[], GridGraph)}, and beside it, in the same pass, the statistics over the
   * edges whose two ends are both marked in {@code inside} (for a block: its core), so a caller
   * that needs both never walks the edges twice. Each pair is looked up once per edge: an edge
   * inside counts in a row of its own (the pair's key flagged), and the whole statistics are the
   * two rows merged, so their sums may differ from {@link #of(int[], GridGraph)}'s in the last
   * bits.
   */
  public static RegionGraph of(int[] labels, GridGraph graph, byte[] inside) {
    if (inside.length != labels.length) {
      throw new IllegalArgumentException("inside has " + inside.length + " flags for "
          + labels.length + " voxels");
    }
    return of(labels, graph, inside, null);
  }

  /**
   * As {@link #of(int[], GridGraph, byte[])} with {@code insideOrNull} (null: no inside
   * statistics), leaving out every edge with an end where {@code ignoredOrNull} is non-zero
   * (one flag per voxel, or null).
   */
  public static RegionGraph of(int[] labels, GridGraph graph, byte[] insideOrNull,
      byte[] ignoredOrNull) {
    for (byte[] flags : new byte[][] {insideOrNull, ignoredOrNull}) {
      if (flags != null && flags.length != labels.length) {
        throw new IllegalArgumentException(flags.length + " voxel flags for " + labels.length
            + " voxels");
      }
    }
    PairRuns runs = new PairRuns(labels, insideOrNull, ignoredOrNull);
    graph.forEachEdgeAcross(labels, runs);
    EdgeStatistics rows = runs.build();
    if (insideOrNull == null) {
      return new RegionGraph(rows, EdgeStatistics.empty());
    }
    EdgeStatistics insideRows = rowsWhere(rows, true);
    return new RegionGraph(rowsWhere(rows, false).merge(insideRows), insideRows);
  }

  /**
   * Sums the edges of one pair that follow each other (a row of voxels along a boundary) in
   * registers and adds each such run to the hash table once.
   */
  private static final class PairRuns implements GridGraph.EdgeVisitor {
    private final int[] labels;
    private final byte[] insideOrNull;
    private final byte[] ignoredOrNull;
    private final EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);
    /** The current run's pair (the larger label flagged {@link #INSIDE} or not). */
    private long low;
    private long high;
    private long count;
    private double sum;
    private double min;
    private double max;

    PairRuns(int[] labels, byte[] insideOrNull, byte[] ignoredOrNull) {
      this.labels = labels;
      this.insideOrNull = insideOrNull;
      this.ignoredOrNull = ignoredOrNull;
    }

    @Override
    public void visit(int s, int t, int k, float w) {
      int a = labels[s];
      int b = labels[t];
      if (a == 0 || b == 0
          || ignoredOrNull != null && (ignoredOrNull[s] | ignoredOrNull[t]) != 0) {
        return;
      }
      long x = Math.min(a, b);
      long y = Math.max(a, b);
      if (insideOrNull != null && insideOrNull[s] != 0 && insideOrNull[t] != 0) {
        y |= INSIDE;
      }
      if (count > 0 && x == low && y == high) {
        count++;
        sum += w;
        min = Math.min(min, w);
        max = Math.max(max, w);
        return;
      }
      flush();
      low = x;
      high = y;
      count = 1;
      sum = w;
      min = w;
      max = w;
    }

    private void flush() {
      if (count > 0) {
        acc.add(low, high, sum, count, min, max);
      }
    }

    EdgeStatistics build() {
      flush();
      count = 0;
      return acc.build();
    }
  }

  /** The rows flagged {@link #INSIDE} (or not), the flag cleared. */
  private static EdgeStatistics rowsWhere(EdgeStatistics rows, boolean flagged) {
    int count = 0;
    for (int e = 0; e < rows.size(); e++) {
      count += ((rows.v(e) & INSIDE) != 0) == flagged ? 1 : 0;
    }
    long[] u = new long[count];
    long[] v = new long[count];
    double[] sum = new double[count];
    long[] n = new long[count];
    double[] min = new double[count];
    double[] max = new double[count];
    int row = 0;
    for (int e = 0; e < rows.size(); e++) {
      if (((rows.v(e) & INSIDE) != 0) == flagged) {
        u[row] = rows.u(e);
        v[row] = rows.v(e) & ~INSIDE;
        sum[row] = rows.sum(e);
        n[row] = rows.count(e);
        min[row] = rows.min(e);
        max[row++] = rows.max(e);
      }
    }
    return EdgeStatistics.of(u, v, sum, n, min, max);
  }

  /** As {@link #of(int[], GridGraph)} for 64-bit labels. */
  public static RegionGraph of(long[] labels, GridGraph graph) {
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);
    graph.forEachEdgeAcross(labels, (s, t, k, w) -> {
      long a = labels[s];
      long b = labels[t];
      if (a != 0 && b != 0) {
        acc.add(a, b, w);
      }
    });
    return new RegionGraph(acc.build(), EdgeStatistics.empty());
  }

  /** The statistics per touching pair of labels, canonical order. */
  public EdgeStatistics statistics() {
    return statistics;
  }

  /**
   * The statistics over the edges with both ends inside the region given to
   * {@link #of(int[], GridGraph, byte[])}; empty for a graph built without one.
   */
  public EdgeStatistics insideStatistics() {
    return insideStatistics;
  }
}
