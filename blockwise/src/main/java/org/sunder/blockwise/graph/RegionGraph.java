package org.sunder.blockwise.graph;

/**
 * The graph of segments of a label array: one row of {@link EdgeStatistics} per pair of
 * distinct labels joined by at least one present edge of a {@link GridGraph} (every offset,
 * long-range ones included, after masking and subsampling). Label 0 means "no segment": edges
 * touching it are skipped. Built in one pass over the edges ({@link GridGraph#forEachEdgeAcross}),
 * {@code O(nodeCount * offsetCount)} expected time plus {@code O(p log p)} for {@code p} pairs. Immutable.
 */
public final class RegionGraph {
  /** Odds products beyond these are folded into a sum before they leave the double range. */
  static final double SMALL_ODDS = 1e-200;
  static final double LARGE_ODDS = 1e200;
  /**
   * Marks a pair's row as one of edges inside the region in the one-pass accumulation: the bit
   * above every 32-bit label, so a pair's ids still fit one sort key of 64 bits.
   */
  private static final long INSIDE = 1L << 31;

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
    double logitClamp = graph.rule().unbiasedLogitClamp();
    AffinityBlock block = graph.block();
    int sliceVoxels = block.dimension() == 1 ? block.voxelCount()
        : block.voxelCount() / block.shape(block.dimension() - 1);
    PairRuns runs = new PairRuns(labels, sliceVoxels, insideOrNull, ignoredOrNull, logitClamp);
    if (Double.isNaN(logitClamp)) {
      graph.forEachEdgeAcross(labels, runs);
    } else {
      graph.forEachAffinityAcross(labels, runs);
    }
    EdgeStatistics rows = runs.build();
    if (insideOrNull == null) {
      return new RegionGraph(rows, EdgeStatistics.empty());
    }
    EdgeStatistics insideRows = rowsWhere(rows, true);
    return new RegionGraph(rowsWhere(rows, false).merge(insideRows), insideRows);
  }

  /**
   * Sums the edges of one pair that follow each other (a row of voxels along a boundary) in
   * registers and adds each such run to the hash table once. Under an unbiased logit rule the
   * visits bring affinities, and a run's weights {@code log(c / (1 − c))} are summed as the
   * logarithm of the product of the odds {@code c / (1 − c)}: one logarithm per run instead of
   * one per edge (a third of the pass's time went to them). The weight rises with the clamped
   * affinity, so the table keeps each pair's smallest and largest clamped affinity and turns
   * them into weights once per pair, after the pass.
   */
  private static final class PairRuns implements GridGraph.EdgeVisitor {
    private final int[] labels;
    private final byte[] insideOrNull;
    private final byte[] ignoredOrNull;
    /** The clamp of the unbiased logit rule, or NaN (then visits bring weights). */
    private final double logitClamp;
    private final boolean logits;
    private final EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);
    /**
     * The current slice's pairs (the edges come slice by slice along the last axis): a table
     * small enough for the processor's cache takes the runs, and {@link #acc} takes each pair
     * once per slice. On the presets' blocks a pair's edges lie in about one slice, and runs
     * outnumber pairs 14 to 17 times.
     */
    private final EdgeStatistics.Accumulator slicePairs = new EdgeStatistics.Accumulator(1024);
    private final int sliceVoxels;
    /** The first voxel after the current slice. */
    private int sliceEnd;
    /** The current run's pair (the larger label flagged {@link #INSIDE} or not). */
    private long low;
    private long high;
    private long count;
    private double sum;
    /** The run's smallest and largest weight, or clamped affinity under logits. */
    private double min;
    private double max;
    /** Under logits: the product of the run's odds not yet in {@link #sum}. */
    private double odds;

    PairRuns(int[] labels, int sliceVoxels, byte[] insideOrNull, byte[] ignoredOrNull,
        double logitClamp) {
      this.labels = labels;
      this.sliceVoxels = sliceVoxels;
      this.insideOrNull = insideOrNull;
      this.ignoredOrNull = ignoredOrNull;
      this.logitClamp = logitClamp;
      this.logits = !Double.isNaN(logitClamp);
    }

    /** {@code value}: the edge's weight, or under logits its affinity. */
    @Override
    public void visit(int s, int t, int k, float value) {
      if (s >= sliceEnd) {
        closeSlice();
        sliceEnd = (s / sliceVoxels + 1) * sliceVoxels;
      }
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
      boolean continues = count > 0 && x == low && y == high;
      if (!continues) {
        flush();
        low = x;
        high = y;
        count = 0;
        sum = 0;
        odds = 1;
        min = Double.POSITIVE_INFINITY;
        max = Double.NEGATIVE_INFINITY;
      }
      count++;
      if (logits) {
        double c = Math.min(Math.max(value, logitClamp), 1 - logitClamp);
        odds *= c / (1 - c);
        if (odds < SMALL_ODDS || odds > LARGE_ODDS) {
          sum += Math.log(odds);
          odds = 1;
        }
        min = Math.min(min, c);
        max = Math.max(max, c);
      } else {
        sum += value;
        min = Math.min(min, value);
        max = Math.max(max, value);
      }
    }

    private void flush() {
      if (count == 0) {
        return;
      }
      if (!logits) {
        slicePairs.add(low, high, sum, count, min, max);
        return;
      }
      slicePairs.add(low, high, sum + Math.log(odds), count, min, max);
    }

    /** The rule's weight of a clamped affinity, as {@link WeightRule#weight} computes it. */
    private static double logitWeight(double c) {
      return (float) WeightRule.logitOfClamped(c);
    }

    /** Ends the current run and moves the slice's pairs into the block's table. */
    private void closeSlice() {
      flush();
      count = 0;
      slicePairs.drainInto(acc);
    }

    EdgeStatistics build() {
      closeSlice();
      EdgeStatistics rows = acc.build();
      return logits ? rows.withMinMax(PairRuns::logitWeight) : rows;
    }
  }

  /**
   * The rows flagged {@link #INSIDE} (or not), the flag cleared: still in canonical order, as
   * the flag sorts above every label.
   */
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
    return EdgeStatistics.ofCanonical(u, v, sum, n, min, max);
  }

  /** As {@link #of(int[], GridGraph)} for 64-bit labels. */
  public static RegionGraph of(long[] labels, GridGraph graph) {
    PairSums sums = new PairSums(graph);
    sums.forEachValueAcross(labels, (s, t, k, value) -> {
      long a = labels[s];
      long b = labels[t];
      if (a != 0 && b != 0) {
        sums.add(a, b, value);
      }
    });
    return new RegionGraph(sums.build(), EdgeStatistics.empty());
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
