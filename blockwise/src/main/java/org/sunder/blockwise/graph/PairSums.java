package org.sunder.blockwise.graph;

/**
 * Per-pair statistics of single edges added one by one, summed as {@link RegionGraph} sums them:
 * under an unbiased logit rule ({@link WeightRule#unbiasedLogitClamp}) each edge adds its
 * unrounded logit ({@link WeightRule#logitOfClamped}) and the pair's minimum and maximum are the
 * rounded weights of its smallest and largest clamped affinity; under any other rule the
 * graph's weights. So statistics gathered in pieces (a face's seam edges, 64-bit labels) agree
 * with a block's region graph up to the last bits of the sums. Like the region graph, it sums a
 * run of consecutive edges of one pair in registers and adds the run to its table once: under
 * logits as the logarithm of the product of the edges' odds, one logarithm per run instead of
 * one per edge. Not thread-safe.
 */
public final class PairSums {
  private final GridGraph graph;
  private final double clamp;
  private final EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);
  // The run below mirrors RegionGraph.PairRuns' own on purpose: one run object shared by both
  // made the region graph's pass, the hottest loop of the partition, 5-10 % slower.
  /** The current run's pair, smaller id first; {@code count} 0 when there is none. */
  private long low;
  private long high;
  private long count;
  private double sum;
  /** The run's smallest and largest weight, or clamped affinity under logits. */
  private double min;
  private double max;
  /** Under logits: the product of the run's odds not yet in {@link #sum}. */
  private double odds;

  public PairSums(GridGraph graph) {
    this.graph = graph;
    this.clamp = graph.rule().unbiasedLogitClamp();
  }

  /**
   * Visits the graph's edges between different {@code labels}
   * ({@link GridGraph#forEachEdgeAcross(long[], GridGraph.EdgeVisitor)}), passing each edge's
   * value as {@link #add} takes it: its affinity under an unbiased logit rule, else its weight.
   */
  public void forEachValueAcross(long[] labels, GridGraph.EdgeVisitor visitor) {
    if (Double.isNaN(clamp)) {
      graph.forEachEdgeAcross(labels, visitor);
    } else {
      graph.forEachAffinityAcross(labels, visitor);
    }
  }

  /** As {@link #forEachValueAcross(long[], GridGraph.EdgeVisitor)} for 32-bit labels. */
  public void forEachValueAcross(int[] labels, GridGraph.EdgeVisitor visitor) {
    if (Double.isNaN(clamp)) {
      graph.forEachEdgeAcross(labels, visitor);
    } else {
      graph.forEachAffinityAcross(labels, visitor);
    }
  }

  /** Whether an edge of value {@code value} (see {@link #forEachValueAcross}) repels. */
  public boolean repels(float value) {
    return Double.isNaN(clamp) ? value < 0 : value < 0.5f;
  }

  /** Adds one edge of value {@code value} (see {@link #forEachValueAcross}) to pair (a, b). */
  public void add(long a, long b, float value) {
    long x = Math.min(a, b);
    long y = Math.max(a, b);
    if (count == 0 || x != low || y != high) {
      flush();
      low = x;
      high = y;
      sum = 0;
      odds = 1;
      min = Double.POSITIVE_INFINITY;
      max = Double.NEGATIVE_INFINITY;
    }
    count++;
    if (Double.isNaN(clamp)) {
      sum += value;
      min = Math.min(min, value);
      max = Math.max(max, value);
      return;
    }
    double c = Math.min(Math.max(value, clamp), 1 - clamp);
    odds *= c / (1 - c);
    if (odds < RegionGraph.SMALL_ODDS || odds > RegionGraph.LARGE_ODDS) {
      sum += Math.log(odds);
      odds = 1;
    }
    min = Math.min(min, c);
    max = Math.max(max, c);
  }

  /** Adds the current run to the table and ends it. */
  private void flush() {
    if (count > 0) {
      acc.add(low, high, Double.isNaN(clamp) ? sum : sum + Math.log(odds), count, min, max);
      count = 0;
    }
  }

  /** The statistics added so far. */
  public EdgeStatistics build() {
    flush();
    EdgeStatistics rows = acc.build();
    return Double.isNaN(clamp) ? rows
        : rows.withMinMax(c -> (float) WeightRule.logitOfClamped(c));
  }
}
