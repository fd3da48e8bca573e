package org.sunder.blockwise.partition;

import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * Merges every segment smaller than a voxel count into the adjacent segment of strongest
 * attraction (largest {@link Linkage} value of the statistics between them, ties to the smaller
 * segment id), smallest segment first (ties by label), until no segment below the size is
 * left that has a neighbour it may join. A pair flagged cannot-link is never joined; flags and
 * statistics are combined as segments merge, so a constraint between parts holds for the whole.
 * A small segment with no neighbour, or only cannot-link ones, stays. Masked voxels (label 0)
 * stay 0. Output labels are 1..k in order of first voxel.
 *
 * <p>Time {@code O((n + p) log p)} for {@code n} voxels and {@code p} segment pairs (adjacency
 * merged smaller into larger); memory {@code O(n + p)}. Immutable and thread-safe.
 */
public final class SizeFilter {
  private final int minSize;
  private final Linkage linkage;

  /**
   * @param minSize segments with fewer voxels are merged away; 0 or 1 keeps everything
   * @param linkage how the statistics between two segments rank their attraction
   */
  public SizeFilter(int minSize, Linkage linkage) {
    if (minSize < 0) {
      throw new IllegalArgumentException("minimum segment size " + minSize + " is negative");
    }
    this.minSize = minSize;
    this.linkage = Objects.requireNonNull(linkage, "linkage");
  }

  public int minSize() {
    return minSize;
  }

  public Linkage linkage() {
    return linkage;
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

  /**
   * The filtered segmentation.
   *
   * @param statistics edge statistics between segment labels (ids 1..segmentCount)
   * @param cannotLinkOrNull one flag per row of {@code statistics}, or null for none
   */
  public Segmentation apply(Segmentation segmentation, EdgeStatistics statistics,
      boolean[] cannotLinkOrNull) {
    int[] labels = segmentation.labels();
    int count = segmentation.segmentCount();
    if (cannotLinkOrNull != null && cannotLinkOrNull.length != statistics.size()) {
      throw new IllegalArgumentException(cannotLinkOrNull.length + " cannot-link flags for "
          + statistics.size() + " segment pairs");
    }
    long[] size = new long[count];
    for (int l : labels) {
      if (l > 0) {
        size[l - 1]++;
      }
    }
    if (minSize <= 1 || count == 0) {
      return segmentation;
    }
    Merging merging = new Merging(count, statistics, cannotLinkOrNull, size);
    int[] representative = merging.run();
    int[] clusterOfVoxel = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      clusterOfVoxel[i] = labels[i] > 0 ? representative[labels[i] - 1] + 1 : 0;
    }
    return relabel(clusterOfVoxel, count);
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

    Merging(int count, EdgeStatistics statistics, boolean[] flags, long[] size) {
      this.size = size;
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
      for (int i = 0; i < count; i++) {
        parent[i] = i;
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
        if (size[c] > 0 && size[c] < minSize) {
          small.push(-size[c], c, c);
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
        int keep = graph.degree(target) >= graph.degree(c) ? target : c;
        int gone = keep == c ? target : c;
        touched.clear();
        graph.contract(keep, gone, combine, touched);
        parent[gone] = keep;
        size[keep] += size[gone];
        size[gone] = 0;
        if (size[keep] < minSize) {
          small.push(-size[keep], keep, keep);
        }
        for (int t = 0; t < touched.size(); t++) {
          int e = touched.get(t);
          int other = graph.endA(e) == keep ? graph.endB(e) : graph.endA(e);
          if (size[other] < minSize) {
            small.push(-size[other], other, other);
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

    private int strongestNeighbour(int c) {
      IntIntHashMap around = graph.neighbours(c);
      int best = -1;
      double bestValue = Double.NEGATIVE_INFINITY;
      for (int slot = 0; slot < around.capacity(); slot++) {
        int d = around.keyAt(slot);
        if (d < 0) {
          continue;
        }
        int e = around.valueAt(slot);
        if (cannotLink[e]) {
          continue;
        }
        double value = linkage.value(sum[e], edges[e], min[e], max[e]);
        if (value > bestValue || (value == bestValue && d < best)) {
          best = d;
          bestValue = value;
        }
      }
      return best;
    }
  }

  @Override
  public String toString() {
    return "SizeFilter[" + minSize + " voxels, " + linkage.jsonName() + "]";
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof SizeFilter f && f.minSize == minSize && f.linkage == linkage;
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(new Object[] {minSize, linkage});
  }
}
