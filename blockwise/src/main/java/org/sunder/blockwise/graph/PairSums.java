package org.sunder.blockwise.graph;

/**
 * Per-pair statistics of single edges added one by one, summed as {@link RegionGraph} sums them:
 * under an unbiased logit rule ({@link WeightRule#unbiasedLogitClamp}) each edge adds its
 * unrounded logit ({@link WeightRule#logitOfClamped}) and the pair's minimum and maximum are the
 * rounded weights of its smallest and largest clamped affinity; under any other rule the
 * graph's weights. So statistics gathered in pieces (a face's seam edges, 64-bit labels) agree
 * with a block's region graph up to the last bits of the sums. Not thread-safe.
 */
public final class PairSums {
  private final GridGraph graph;
  private final double clamp;
  private final EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);

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
    if (Double.isNaN(clamp)) {
      acc.add(a, b, value);
      return;
    }
    double c = Math.min(Math.max(value, clamp), 1 - clamp);
    acc.add(a, b, WeightRule.logitOfClamped(c), 1, c, c);
  }

  /** The statistics added so far. */
  public EdgeStatistics build() {
    EdgeStatistics rows = acc.build();
    return Double.isNaN(clamp) ? rows
        : rows.withMinMax(c -> (float) WeightRule.logitOfClamped(c));
  }
}
