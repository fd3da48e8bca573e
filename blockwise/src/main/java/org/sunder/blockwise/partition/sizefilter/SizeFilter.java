package org.sunder.blockwise.partition.sizefilter;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;
import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.collections.IntIntHashMap;
import org.sunder.blockwise.collections.IntList;
import org.sunder.blockwise.collections.MaxHeap;
import org.sunder.blockwise.graph.ContractionGraph;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.agglomeration.Linkage;

/**
 * Merges away every segment smaller than a voxel count. Smallest segment first, a small segment
 * joins the adjacent segment it is most attracted to (largest {@link Linkage} value of the
 * statistics between them), and the merged segment waits its turn again while it is still
 * small. Ties, in both choices, go to the lower <em>tie label</em>: a segment's label; a merged
 * segment's, the lowest label of its parts while it is small, fixed once it is not (it holds
 * {@code minSize} voxels or is left alone). So the result depends only on the input, and the
 * filter acts on each connected set of small segments, with the segments around it, as if alone:
 * a merge elsewhere changes neither the statistics nor the tie label of anything it sees (what
 * lets a hierarchical solve filter part by part). Only a segment below the size is ever merged
 * away: two segments that both hold at least {@code minSize} voxels are never joined.
 *
 * <p>Cannot-link flags mark the pairs the partition method kept apart; flags and statistics
 * are combined as segments merge, so a constraint between parts holds for the whole. What a
 * small segment with only constrained neighbours does depends on the {@link Rule}:
 * {@link Rule#COMPLETE} (default) joins its most attracted constrained neighbour, so no segment
 * below the size remains unless it touches no other segment at all;
 * {@link Rule#WITHIN_CONSTRAINTS} leaves it. Under both rules an unconstrained neighbour is
 * preferred over any constrained one.
 *
 * <p>Segments marked <em>left alone</em> (e.g. pieces cut by a block face, whose size in the
 * block says nothing about their size in the volume) are never merged away as small ones, but
 * may absorb a small neighbour; a segment that absorbed one stays left alone. Masked voxels
 * (label 0) stay 0. Output labels are 1..k in order of first voxel.
 *
 * <p>Time {@code O((n + p) log p)} for {@code n} voxels and {@code p} segment pairs (adjacency
 * merged smaller into larger); memory {@code O(n + p)}. Immutable and thread-safe.
 */
public final class SizeFilter {
  /** What a small segment whose every neighbour is constrained does. */
  public enum Rule {
    /**
     * Joins its most attracted neighbour anyway: no segment below the size remains unless it
     * touches no other segment.
     */
    COMPLETE("complete"),
    /** Stays: the filter never joins a constrained pair. */
    WITHIN_CONSTRAINTS("within-constraints");

    private final String jsonName;

    Rule(String jsonName) {
      this.jsonName = jsonName;
    }

    @JsonValue
    public String jsonName() {
      return jsonName;
    }

    /** The rule named {@code name}; {@link PartitionConfigException} naming the key if none. */
    @JsonCreator
    public static Rule fromName(String name) {
      for (Rule r : values()) {
        if (r.jsonName.equals(name)) {
          return r;
        }
      }
      throw new PartitionConfigException(ErrorKind.INVALID_CONFIG, "sizeFilter: unknown value \""
          + name + "\"; expected \"complete\" or \"within-constraints\"");
    }
  }

  private final int minSize;
  private final Linkage linkage;
  private final Rule rule;

  /**
   * @param minSize segments with fewer voxels are merged away; 0 or 1 keeps everything
   * @param linkage how the statistics between two segments rank their attraction
   * @param rule whether a small segment may join a constrained neighbour
   */
  public SizeFilter(int minSize, Linkage linkage, Rule rule) {
    if (minSize < 0) {
      throw new IllegalArgumentException("minimum segment size " + minSize + " is negative");
    }
    this.minSize = minSize;
    this.linkage = Objects.requireNonNull(linkage, "linkage");
    this.rule = Objects.requireNonNull(rule, "rule");
  }

  public int minSize() {
    return minSize;
  }

  public Linkage linkage() {
    return linkage;
  }

  public Rule rule() {
    return rule;
  }

  /** Cannot-link flags for pairs joined by at least one repulsive edge ({@code min < 0}). */
  public static boolean[] repulsivePairs(EdgeStatistics statistics) {
    boolean[] flags = new boolean[statistics.size()];
    for (int i = 0; i < flags.length; i++) {
      flags[i] = statistics.min(i) < 0;
    }
    return flags;
  }

  /** Cannot-link flags for pairs whose linkage is not 0 (what constrained clustering leaves). */
  public static boolean[] nonZeroLinkagePairs(EdgeStatistics statistics, Linkage linkage) {
    boolean[] flags = new boolean[statistics.size()];
    for (int i = 0; i < flags.length; i++) {
      flags[i] = linkage.value(statistics.sum(i), statistics.count(i), statistics.min(i),
          statistics.max(i)) != 0;
    }
    return flags;
  }

  /** As {@link #apply(Segmentation, EdgeStatistics, boolean[], boolean[])}, none left alone. */
  public Segmentation apply(Segmentation segmentation, EdgeStatistics statistics,
      boolean[] cannotLinkOrNull) {
    return apply(segmentation, statistics, cannotLinkOrNull, null);
  }

  /**
   * The filtered segmentation.
   *
   * @param statistics edge statistics between segment labels (ids 1..segmentCount)
   * @param cannotLinkOrNull one flag per row of {@code statistics}, or null for none
   * @param leaveAloneOrNull per label ({@code segmentCount + 1} entries, index 0 unused), the
   *     segments never merged away as small ones; or null for none
   */
  public Segmentation apply(Segmentation segmentation, EdgeStatistics statistics,
      boolean[] cannotLinkOrNull, boolean[] leaveAloneOrNull) {
    int[] labels = segmentation.labels();
    int count = segmentation.segmentCount();
    if (leaveAloneOrNull != null && leaveAloneOrNull.length != count + 1) {
      throw new IllegalArgumentException(leaveAloneOrNull.length + " leave-alone flags for "
          + count + " segments (label 0 included)");
    }
    if (minSize <= 1 || count == 0) {
      return segmentation;
    }
    long[] size = new long[count];
    for (int l : labels) {
      if (l > 0) {
        size[l - 1]++;
      }
    }
    boolean[] leaveAlone = leaveAloneOrNull == null ? null
        : Arrays.copyOfRange(leaveAloneOrNull, 1, count + 1);
    int[] representative = groups(size, statistics, cannotLinkOrNull, leaveAlone);
    int[] clusterOfVoxel = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      clusterOfVoxel[i] = labels[i] > 0 ? representative[labels[i] - 1] + 1 : 0;
    }
    return relabel(clusterOfVoxel, count);
  }

  /**
   * The filter on a graph of segments {@code 0..sizes.length-1}, e.g. the global solve's
   * clusters: per segment, the index of the segment that represents its group (equal values are
   * joined). Arrays are not modified.
   *
   * @param sizes voxels per segment; segments of size 0 are never merged away
   * @param statistics edge statistics between segment ids {@code 1..sizes.length} (id = index
   *     + 1)
   * @param cannotLinkOrNull one flag per row of {@code statistics}, or null for none
   * @param leaveAloneOrNull per segment index, never merged away as a small one; or null
   */
  public int[] groups(long[] sizes, EdgeStatistics statistics, boolean[] cannotLinkOrNull,
      boolean[] leaveAloneOrNull) {
    int count = sizes.length;
    if (cannotLinkOrNull != null && cannotLinkOrNull.length != statistics.size()) {
      throw new IllegalArgumentException(cannotLinkOrNull.length + " cannot-link flags for "
          + statistics.size() + " segment pairs");
    }
    if (leaveAloneOrNull != null && leaveAloneOrNull.length != count) {
      throw new IllegalArgumentException(leaveAloneOrNull.length + " leave-alone flags for "
          + count + " segments");
    }
    if (minSize <= 1 || count == 0) {
      int[] identity = new int[count];
      for (int c = 0; c < count; c++) {
        identity[c] = c;
      }
      return identity;
    }
    return new Merging(count, statistics, cannotLinkOrNull, sizes.clone(),
        leaveAloneOrNull == null ? new boolean[count] : leaveAloneOrNull.clone()).run();
  }

  private static Segmentation relabel(int[] clusterOfVoxel, int count) {
    int[] map = new int[count + 1];
    int next = 0;
    for (int i = 0; i < clusterOfVoxel.length; i++) {
      int c = clusterOfVoxel[i];
      if (c > 0) {
        if (map[c] == 0) {
          map[c] = ++next;
        }
        clusterOfVoxel[i] = map[c];
      }
    }
    return new Segmentation(clusterOfVoxel, next);
  }

  /** The merge loop over segments 0..count−1 (label − 1). */
  private final class Merging {
    private final long[] size;
    private final double[] sum;
    private final long[] edges;
    private final double[] min;
    private final double[] max;
    private final boolean[] cannotLink;
    private final ContractionGraph graph;
    private final ContractionGraph.EdgeMerge combine;
    private final int[] parent;
    private final boolean[] leftAlone;
    /**
     * Per group representative, its tie label: the lowest member index while the group is small,
     * fixed once it is not. The tie-breaker of both choices.
     */
    private final int[] lowest;

    Merging(int count, EdgeStatistics statistics, boolean[] flags, long[] size,
        boolean[] leftAlone) {
      this.size = size;
      this.leftAlone = leftAlone;
      int m = statistics.size();
      int[] u = new int[m];
      int[] v = new int[m];
      for (int i = 0; i < m; i++) {
        u[i] = segment(statistics.u(i), count);
        v[i] = segment(statistics.v(i), count);
      }
      sum = statistics.copySum();
      edges = statistics.copyCount();
      min = statistics.copyMin();
      max = statistics.copyMax();
      cannotLink = flags == null ? new boolean[m] : flags.clone();
      combine = (into, from) -> {
        sum[into] += sum[from];
        edges[into] += edges[from];
        min[into] = Math.min(min[into], min[from]);
        max[into] = Math.max(max[into], max[from]);
        cannotLink[into] |= cannotLink[from];
      };
      graph = ContractionGraph.build(count, u, v, combine);
      parent = new int[count];
      lowest = new int[count];
      for (int i = 0; i < count; i++) {
        parent[i] = i;
        lowest[i] = i;
      }
    }

    private static int segment(long id, int count) {
      if (id < 1 || id > count) {
        throw new IllegalArgumentException("segment pair with label " + id + " outside 1.."
            + count);
      }
      return (int) (id - 1);
    }

    int[] run() {
      MaxHeap small = new MaxHeap(64);
      for (int c = 0; c < size.length; c++) {
        if (isSmall(c)) {
          small.push(-size[c], lowest[c], c);
        }
      }
      IntList touched = new IntList(16);
      while (!small.isEmpty()) {
        long s = (long) -small.topKey();
        int c = small.topPayload();
        small.pop();
        if (parent[c] != c || size[c] != s) {
          continue;
        }
        int target = strongestNeighbour(c);
        if (target < 0) {
          continue;
        }
        int tieLabel = isSmall(target) ? Math.min(lowest[c], lowest[target]) : lowest[target];
        int keep = graph.degree(target) >= graph.degree(c) ? target : c;
        int gone = keep == c ? target : c;
        touched.clear();
        graph.contract(keep, gone, combine, touched);
        parent[gone] = keep;
        size[keep] += size[gone];
        size[gone] = 0;
        leftAlone[keep] |= leftAlone[gone];
        lowest[keep] = tieLabel;
        if (isSmall(keep)) {
          small.push(-size[keep], lowest[keep], keep);
        }
        for (int t = 0; t < touched.size(); t++) {
          int e = touched.get(t);
          int other = graph.endA(e) == keep ? graph.endB(e) : graph.endA(e);
          if (isSmall(other)) {
            small.push(-size[other], lowest[other], other);
          }
        }
      }
      int[] root = new int[size.length];
      for (int c = 0; c < root.length; c++) {
        int r = c;
        while (parent[r] != r) {
          r = parent[r];
        }
        root[c] = r;
      }
      return root;
    }

    private boolean isSmall(int c) {
      return size[c] > 0 && size[c] < minSize && !leftAlone[c];
    }

    /**
     * The unconstrained neighbour of strongest attraction; without one, under
     * {@link Rule#COMPLETE} the constrained neighbour of strongest attraction; else -1.
     */
    private int strongestNeighbour(int c) {
      IntIntHashMap around = graph.neighbours(c);
      int free = -1;
      double freeValue = Double.NEGATIVE_INFINITY;
      int constrained = -1;
      double constrainedValue = Double.NEGATIVE_INFINITY;
      for (int slot = 0; slot < around.capacity(); slot++) {
        int d = around.keyAt(slot);
        if (d < 0) {
          continue;
        }
        int e = around.valueAt(slot);
        double value = linkage.value(sum[e], edges[e], min[e], max[e]);
        if (!cannotLink[e]) {
          if (free < 0 || value > freeValue || (value == freeValue && lowest[d] < lowest[free])) {
            free = d;
            freeValue = value;
          }
        } else if (constrained < 0 || value > constrainedValue
            || (value == constrainedValue && lowest[d] < lowest[constrained])) {
          constrained = d;
          constrainedValue = value;
        }
      }
      return free >= 0 ? free : rule == Rule.COMPLETE ? constrained : -1;
    }
  }

  @Override
  public String toString() {
    return "SizeFilter[" + minSize + " voxels, " + linkage.jsonName() + ", " + rule.jsonName()
        + "]";
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof SizeFilter f && f.minSize == minSize && f.linkage == linkage
        && f.rule == rule;
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(new Object[] {minSize, linkage, rule});
  }
}
