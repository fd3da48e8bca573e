package org.sunder.blockwise.partition;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;

/**
 * The Mutex Watershed, after "The Mutex Watershed and its Objective: Efficient, Parameter-Free
 * Graph Partitioning" (TPAMI 2020): edges are taken in descending {@code |weight|}; an attractive
 * edge joins its two clusters unless a mutual-exclusion constraint separates them, a repulsive
 * edge adds such a constraint unless they are already one. Edges of weight 0 are skipped.
 *
 * <p>Order, ties included: descending {@code |weight|}, then repulsive before attractive, then
 * ascending edge id ({@code voxel + k * voxelCount} on the grid, the edge index on a
 * {@link SignedGraph}); so the grid and its {@link GridGraph#toSignedGraph()} copy give the same
 * partition, and 8-bit affinities give the same partition as their float values {@code b / 255}.
 *
 * <p>Sorting: 8-bit affinities by counting sort over the at most {@code 256 * offsetCount}
 * distinct weights ({@code O(E)}, one {@code int} per edge); float weights by an in-place radix
 * sort of one packed {@code long} per edge ({@code O(E)}); sparse graphs by a stable radix sort.
 * Then {@code O(E α(N))} union-find work plus the constraint bookkeeping of
 * {@link MutexClusters}. Memory on the grid: 8 (float) or 4 (8-bit) bytes per edge slot plus
 * 20 bytes per voxel plus the constraints. Thread-safe (no state).
 */
public final class MutexWatershed implements Partitioner {
  private final WeightRule rule;
  private final Subsampling subsampling;

  public MutexWatershed(WeightRule rule, Subsampling subsampling) {
    this.rule = rule;
    this.subsampling = subsampling;
  }

  @Override
  public Segmentation partition(AffinityBlock block) {
    return partition(GridGraph.of(block, rule, subsampling));
  }

  /** The Mutex Watershed of a voxel grid graph; masked voxels get label 0. */
  public static Segmentation partition(GridGraph graph) {
    MutexClusters clusters = new MutexClusters(graph.nodeCount());
    if (graph.block().isQuantized()) {
      runQuantized(graph, clusters);
    } else {
      runFloat(graph, clusters);
    }
    return Segmentation.fromClusters(clusters.roots(), graph.block().maskOrNull());
  }

  /** The Mutex Watershed of a sparse signed graph. */
  public static Clustering partition(SignedGraph graph) {
    int m = graph.edgeCount();
    int kept = 0;
    for (int e = 0; e < m; e++) {
      if (graph.weight(e) != 0) {
        kept++;
      }
    }
    long[] keys = new long[kept];
    int[] ids = new int[kept];
    int i = 0;
    for (int e = 0; e < m; e++) {
      double w = graph.weight(e);
      if (w != 0) {
        long magnitude = Long.MAX_VALUE - Double.doubleToLongBits(Math.abs(w));
        keys[i] = (magnitude << 1) | (w > 0 ? 1 : 0);
        ids[i++] = e;
      }
    }
    RadixSort.sortByKeyUnsigned(keys, ids);
    MutexClusters clusters = new MutexClusters(graph.nodeCount());
    for (int j = 0; j < kept; j++) {
      int e = ids[j];
      if ((keys[j] & 1) != 0) {
        clusters.attract(graph.edgeU(e), graph.edgeV(e));
      } else {
        clusters.repel(graph.edgeU(e), graph.edgeV(e));
      }
    }
    return Clustering.fromRepresentatives(clusters.roots());
  }

  /** Bits of the voxel part of a packed edge id {@code (k << bits) | voxel}. */
  private static int voxelBits(int nodeCount) {
    return Math.max(1, 32 - Integer.numberOfLeadingZeros(nodeCount - 1));
  }

  private static void runFloat(GridGraph graph, MutexClusters clusters) {
    int bits = voxelBits(graph.nodeCount());
    long[] packed = new long[graph.edgeSlotCount()];
    int[] count = new int[1];
    graph.forEachEdge((source, target, k, w) -> {
      if (w != 0) {
        long magnitude = 0x7FFFFFFFL - Float.floatToRawIntBits(Math.abs(w));
        long id = ((long) k << bits) | source;
        packed[count[0]++] = (magnitude << 33) | (w > 0 ? 1L << 32 : 0) | id;
      }
    });
    int m = count[0];
    RadixSort.sortUnsigned(packed, 0, m);
    int voxelMask = (1 << bits) - 1;
    int[] delta = deltas(graph);
    for (int i = 0; i < m; i++) {
      long x = packed[i];
      int id = (int) x;
      int source = id & voxelMask;
      int target = source + delta[id >>> bits];
      if ((x & (1L << 32)) != 0) {
        clusters.attract(source, target);
      } else {
        clusters.repel(source, target);
      }
    }
  }

  private static void runQuantized(GridGraph graph, MutexClusters clusters) {
    float[] table = graph.byteWeightTableOrNull();
    int[] rankOf = new int[table.length];
    int ranks = rankWeights(table, rankOf);
    boolean[] attractive = new boolean[ranks];
    for (int j = 0; j < table.length; j++) {
      if (rankOf[j] >= 0) {
        attractive[rankOf[j]] = table[j] > 0;
      }
    }
    byte[] bytes = graph.block().byteValuesOrNull();
    int n = graph.nodeCount();
    int[] start = new int[ranks + 1];
    graph.forEachEdge((source, target, k, w) -> {
      int r = rankOf[(k << 8) + (bytes[source + k * n] & 0xff)];
      if (r >= 0) {
        start[r + 1]++;
      }
    });
    for (int r = 0; r < ranks; r++) {
      start[r + 1] += start[r];
    }
    int bits = voxelBits(n);
    int[] sorted = new int[start[ranks]];
    int[] next = java.util.Arrays.copyOf(start, ranks);
    graph.forEachEdge((source, target, k, w) -> {
      int r = rankOf[(k << 8) + (bytes[source + k * n] & 0xff)];
      if (r >= 0) {
        sorted[next[r]++] = (k << bits) | source;
      }
    });
    int voxelMask = (1 << bits) - 1;
    int[] delta = deltas(graph);
    for (int r = 0; r < ranks; r++) {
      boolean attract = attractive[r];
      for (int i = start[r]; i < start[r + 1]; i++) {
        int id = sorted[i];
        int source = id & voxelMask;
        int target = source + delta[id >>> bits];
        if (attract) {
          clusters.attract(source, target);
        } else {
          clusters.repel(source, target);
        }
      }
    }
  }

  /**
   * Dense ranks of the non-zero entries of {@code table} in processing order (descending
   * magnitude, repulsive first); zero weights get rank -1. Returns the number of ranks.
   */
  private static int rankWeights(float[] table, int[] rankOf) {
    long[] keys = new long[table.length];
    int[] ids = new int[table.length];
    int count = 0;
    for (int j = 0; j < table.length; j++) {
      rankOf[j] = -1;
      float w = table[j];
      if (w != 0) {
        long magnitude = 0x7FFFFFFFL - Float.floatToRawIntBits(Math.abs(w));
        keys[count] = (magnitude << 1) | (w > 0 ? 1 : 0);
        ids[count++] = j;
      }
    }
    keys = java.util.Arrays.copyOf(keys, count);
    ids = java.util.Arrays.copyOf(ids, count);
    RadixSort.sortByKeyUnsigned(keys, ids);
    int rank = -1;
    for (int i = 0; i < count; i++) {
      if (i == 0 || keys[i] != keys[i - 1]) {
        rank++;
      }
      rankOf[ids[i]] = rank;
    }
    return rank + 1;
  }

  private static int[] deltas(GridGraph graph) {
    int[] delta = new int[graph.offsetCount()];
    for (int k = 0; k < delta.length; k++) {
      delta[k] = graph.delta(k);
    }
    return delta;
  }
}
