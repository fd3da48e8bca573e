package org.sunder.blockwise.graph;

/**
 * The graph of segments of a label array: one row of {@link EdgeStatistics} per pair of
 * distinct labels joined by at least one present edge of a {@link GridGraph} (every offset,
 * long-range ones included, after masking and subsampling). Label 0 means "no segment": edges
 * touching it are skipped. Built in one pass over the edges ({@link GridGraph#forEachEdgeAcross}),
 * {@code O(nodeCount * offsetCount)} expected time plus {@code O(p log p)} for {@code p} pairs. Immutable.
 */
public final class RegionGraph {
  private final EdgeStatistics statistics;

  private RegionGraph(EdgeStatistics statistics) {
    this.statistics = statistics;
  }

  /** Region graph of {@code labels} (box voxels in memory order) over {@code graph}'s edges. */
  public static RegionGraph of(int[] labels, GridGraph graph) {
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);
    graph.forEachEdgeAcross(labels, (s, t, k, w) -> {
      int a = labels[s];
      int b = labels[t];
      if (a != 0 && b != 0) {
        acc.add(a, b, w);
      }
    });
    return new RegionGraph(acc.build());
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
    return new RegionGraph(acc.build());
  }

  /** The statistics per touching pair of labels, canonical order. */
  public EdgeStatistics statistics() {
    return statistics;
  }
}
