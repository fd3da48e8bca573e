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
 * <p>Order, ties included: descending {@code |weight|}, then attractive before repulsive, then
 * ascending edge id ({@code voxel + k * voxelCount} on the grid, the edge index on a
 * {@link SignedGraph}); so the grid and its {@link GridGraph#toSignedGraph()} copy give the same
 * partition, and 8-bit affinities give the same partition as their float values {@code b / 255}.
 *
 * <p>Sorting without boxing: 8-bit affinities by a counting sort over the at most
 * {@code 256 * offsetCount} distinct weights ({@code O(E)}, one {@code int} per edge); float
 * weights by a 32-bit key per edge slot, a stable counting sort into 2^20 buckets linear in the
 * magnitude and an exact in-place sort of the 64-bit (key, edge id) entries inside each bucket
 * whose keys differ (linear in practice, {@code O(E log E)} at worst); sparse graphs by a stable
 * LSD radix sort of 64-bit keys. Then {@code O(E α(N))} union-find work plus the constraint
 * bookkeeping of {@link MutexClusters}. Memory on the grid: 4 bytes per edge slot plus 8 per
 * present edge (float) or 4 per present edge (8-bit), plus 20 bytes per voxel plus the
 * constraints. Thread-safe (no state).
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
    return clusters.segmentation(graph.block().maskOrNull());
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
        keys[i] = (magnitude << 1) | (w > 0 ? 0 : 1);
        ids[i++] = e;
      }
    }
    RadixSort.sortByKeyUnsigned(keys, ids);
    MutexClusters clusters = new MutexClusters(graph.nodeCount());
    for (int j = 0; j < kept; j++) {
      int e = ids[j];
      if ((keys[j] & 1) == 0) {
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

  /** Absent slot in the key array of {@link #runFloat}. */
  private static final int NO_EDGE = -1;

  /**
   * Float weights: a 32-bit key per edge slot (inverted magnitude, then attractive before
   * repulsive), a stable counting sort of the present slots into buckets linear in the
   * magnitude, and an exact sort of each bucket whose keys differ. A sorted entry holds the key
   * with its top bit flipped (so signed order is unsigned key order) above the slot (= edge id,
   * below 2^31), so sorting a bucket's entries gives exactly (key, edge id) order, in place and
   * without looking keys up again.
   */
  private static void runFloat(GridGraph graph, MutexClusters clusters) {
    int n = graph.nodeCount();
    int[] key = new int[graph.edgeSlotCount()];
    java.util.Arrays.fill(key, NO_EDGE);
    graph.forEachEdge((source, target, k, w) -> {
      if (w != 0) {
        key[source + k * n] = floatKey(w);
      }
    });
    long min = minimumKey(key);
    float scale = (BUCKETS - 1) / magnitudeOf((int) min);
    int buckets = BUCKETS;
    int[] start = new int[buckets + 1];
    for (int x : key) {
      if (x != NO_EDGE) {
        start[bucketOf(x, scale) + 1]++;
      }
    }
    for (int b = 0; b < buckets; b++) {
      start[b + 1] += start[b];
    }
    long[] sorted = new long[start[buckets]];
    int[] next = java.util.Arrays.copyOf(start, buckets);
    for (int slot = 0; slot < key.length; slot++) {
      int x = key[slot];
      if (x != NO_EDGE) {
        sorted[next[bucketOf(x, scale)]++] = ((long) (x ^ Integer.MIN_VALUE) << 32) | slot;
      }
    }
    int[] delta = deltas(graph);
    for (int b = 0; b < buckets; b++) {
      int from = start[b];
      int to = start[b + 1];
      if (to - from > 1 && !sameKeys(sorted, from, to)) {
        java.util.Arrays.sort(sorted, from, to);
      }
      for (int i = from; i < to; i++) {
        long entry = sorted[i];
        int slot = (int) entry;
        int k = slot / n;
        int source = slot - k * n;
        if ((entry & (1L << 32)) == 0) {
          clusters.attract(source, source + delta[k]);
        } else {
          clusters.repel(source, source + delta[k]);
        }
      }
    }
  }

  /** Buckets of the counting sort of float keys. */
  private static final int BUCKETS = 1 << 20;

  /** The smallest present key, as an unsigned value. */
  private static long minimumKey(int[] key) {
    long min = 0xFFFFFFFFL;
    for (int x : key) {
      if (x != NO_EDGE) {
        min = Math.min(min, x & 0xFFFFFFFFL);
      }
    }
    return min;
  }

  /** The weight magnitude a key was made from. */
  private static float magnitudeOf(int key) {
    return Float.intBitsToFloat(0x7FFFFFFF - (key >>> 1));
  }

  /**
   * Counting-sort bucket of a key: linear in the magnitude, largest magnitude in bucket 0;
   * monotone in the key, so the buckets in order hold the keys in order.
   */
  private static int bucketOf(int key, float scale) {
    return BUCKETS - 1 - (int) Math.min(BUCKETS - 1, magnitudeOf(key) * scale);
  }

  /** Key of a non-zero weight: ascending key = descending magnitude, attractive first. */
  private static int floatKey(float w) {
    int magnitude = 0x7FFFFFFF - Float.floatToRawIntBits(Math.abs(w));
    return (magnitude << 1) | (w > 0 ? 0 : 1);
  }

  private static boolean sameKeys(long[] sorted, int from, int to) {
    int first = (int) (sorted[from] >>> 32);
    for (int i = from + 1; i < to; i++) {
      if ((int) (sorted[i] >>> 32) != first) {
        return false;
      }
    }
    return true;
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
   * magnitude, attractive first); zero weights get rank -1. Returns the number of ranks.
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
        keys[count] = (magnitude << 1) | (w > 0 ? 0 : 1);
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
