package org.sunder.blockwise.partition.mutex;

import org.sunder.blockwise.collections.RadixSort;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;

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
 * weights by a counting sort of the edge ids on the top bits of a 32-bit key and a radix sort
 * of the 64-bit (key, edge id) entries of the buckets out of order, stable and {@code O(E)}; sparse graphs by a stable LSD radix sort of 64-bit keys. Then
 * {@code O(E α(N))} union-find work plus the constraint bookkeeping of {@link MutexClusters}.
 * Memory on the grid: 4 bytes per present edge plus 1 byte per edge slot and 24 per voxel,
 * plus the constraints (up to about 22 bytes per live constraint, in {@link MutexClusters});
 * float weights instead take 8 bytes per present edge of a bucket out of order (4 for the
 * others), 1 bit per edge slot and a scratch array of 8 bytes per edge of the largest bucket
 * out of order. Static functions,
 * thread-safe (no state); {@link MutexWatershedPartitioner} is the configured method.
 */
public final class MutexWatershed {
  private MutexWatershed() {}

  /**
   * The unsigned 64-bit key of a weight in this order: ascending keys take descending
   * {@code |weight|} ({@link Double#compare}'s order, NaN first), then attractive
   * ({@code weight > 0}) before the rest. The lowest bit is 1 for the rest.
   */
  public static long orderKey(double weight) {
    long magnitude = Long.MAX_VALUE - Double.doubleToLongBits(Math.abs(weight));
    return (magnitude << 1) | (weight > 0 ? 0 : 1);
  }

  /** The Mutex Watershed of a voxel grid graph; masked voxels get label 0. */
  public static Segmentation partition(GridGraph graph) {
    return run(graph, null).segmentation(graph.block().maskOrNull());
  }

  /**
   * The Mutex Watershed of a voxel grid graph with the merges that lean on open voxels held
   * back (see {@link SettledPartition}); {@code open} has one flag per voxel.
   */
  public static SettledPartition partitionSettled(GridGraph graph, byte[] open) {
    SettledPartition.checkOpen(open, graph.nodeCount());
    MutexClusters clusters = run(graph, open);
    return SettledPartition.of(clusters.roots(), clusters.pieceRoots(), open,
        graph.block().maskOrNull());
  }

  private static MutexClusters run(GridGraph graph, byte[] openOrNull) {
    MutexClusters clusters = new MutexClusters(graph.nodeCount());
    if (openOrNull != null) {
      clusters.holdBack(openOrNull);
    }
    if (graph.block().isQuantized()) {
      runQuantized(graph, clusters);
    } else {
      runFloat(graph, clusters);
    }
    return clusters;
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
        keys[i] = orderKey(w);
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

  /**
   * Float weights: a 32-bit key per edge (inverted magnitude, then attractive before
   * repulsive), computed from the weight where needed rather than stored per slot, and a
   * most-significant-digit radix sort of the present slots' packed edge ids
   * {@code (k << bits) | voxel} (same order as the edge id, decoded without a division): a
   * stable counting sort by the top {@code 32 - LOW_BITS} key bits (exponent and top mantissa
   * bits; few enough buckets for the scatter to stay in cache). The counting pass notes the
   * buckets whose keys ascend with the edge id (ties, typically); the scatter pass writes their
   * edges as one {@code int} id each, the sign kept in one bit per edge slot, and runs them as
   * they are. The edges of any other bucket are written as 64-bit entries, the key with its top
   * bit flipped (so signed order is unsigned key order) above the id, so the weights are not
   * read again; each such bucket is sorted by a stable least-significant-digit radix sort of
   * the low {@code LOW_BITS} bits in two passes. Stable passes over ids generated in ascending
   * order give exactly (key, edge id) order. The weight of an edge is computed twice.
   */
  private static void runFloat(GridGraph graph, MutexClusters clusters) {
    int n = graph.nodeCount();
    byte[] present = graph.presentSlots();
    int[] size = new int[HIGH_BUCKETS];
    int[] last = new int[HIGH_BUCKETS];
    java.util.Arrays.fill(last, Integer.MIN_VALUE);
    boolean[] disordered = new boolean[HIGH_BUCKETS];
    for (int k = 0, slot = 0; k < graph.offsetCount(); k++) {
      for (int v = 0; v < n; v++, slot++) {
        float w = present[slot] == 0 ? 0 : graph.weight(v, k);
        if (w != 0) {
          int x = floatKey(w);
          int b = x >>> LOW_BITS;
          size[b]++;
          int ordered = x ^ Integer.MIN_VALUE;
          disordered[b] |= ordered < last[b];
          last[b] = ordered;
        }
      }
    }
    // ordered buckets index ids, the others entries
    int[] start = new int[HIGH_BUCKETS];
    int idCount = 0;
    int entryCount = 0;
    int largest = 0;
    for (int b = 0; b < HIGH_BUCKETS; b++) {
      if (disordered[b]) {
        start[b] = entryCount;
        entryCount += size[b];
        largest = Math.max(largest, size[b]);
      } else {
        start[b] = idCount;
        idCount += size[b];
      }
    }
    int[] ids = new int[idCount];
    long[] entries = new long[entryCount];
    long[] repulsive = new long[(present.length + 63) >>> 6];
    int[] next = start.clone();
    int bits = voxelBits(n);
    for (int k = 0, slot = 0; k < graph.offsetCount(); k++) {
      for (int v = 0; v < n; v++, slot++) {
        float w = present[slot] == 0 ? 0 : graph.weight(v, k);
        if (w != 0) {
          int x = floatKey(w);
          int b = x >>> LOW_BITS;
          int id = (k << bits) | v;
          if (disordered[b]) {
            entries[next[b]++] = entry(x, id);
          } else {
            ids[next[b]++] = id;
            if ((x & 1) != 0) {
              repulsive[slot >>> 6] |= 1L << slot;
            }
          }
        }
      }
    }
    int[] delta = deltas(graph);
    long[] scratch = new long[largest];
    int[] count = new int[DIGIT_BUCKETS];
    for (int b = 0; b < HIGH_BUCKETS; b++) {
      int from = start[b];
      int to = from + size[b];
      if (disordered[b]) {
        digitPass(entries, from, to, scratch, 0, 0, count);
        digitPass(scratch, 0, to - from, entries, from, DIGIT_BITS, count);
        process(entries, from, to, bits, delta, clusters);
      } else {
        processIds(repulsive, ids, from, to, bits, n, delta, clusters);
      }
    }
  }

  /** The edge slot {@code voxel + k * n} of a packed edge id {@code (k << bits) | voxel}. */
  private static int slotOf(int id, int bits, int n) {
    return (id >>> bits) * n + (id & ((1 << bits) - 1));
  }

  /** Runs packed edge ids already in (key, edge id) order; one bit per slot gives the sign. */
  private static void processIds(long[] repulsive, int[] ids, int from, int to, int bits, int n,
      int[] delta, MutexClusters clusters) {
    int voxelMask = (1 << bits) - 1;
    for (int i = from; i < to; i++) {
      int id = ids[i];
      int source = id & voxelMask;
      int target = source + delta[id >>> bits];
      int slot = slotOf(id, bits, n);
      if ((repulsive[slot >>> 6] & (1L << slot)) == 0) {
        clusters.attract(source, target);
      } else {
        clusters.repel(source, target);
      }
    }
  }

  /**
   * One stable counting-sort pass of {@code source[from, to)} into {@code target} from
   * {@code at}, by the key digit {@code (key >>> shift) & (DIGIT_BUCKETS - 1)}.
   */
  private static void digitPass(long[] source, int from, int to, long[] target, int at,
      int shift, int[] count) {
    java.util.Arrays.fill(count, 0);
    for (int i = from; i < to; i++) {
      count[(keyOf(source[i]) >>> shift) & (DIGIT_BUCKETS - 1)]++;
    }
    int sum = at;
    for (int d = 0; d < DIGIT_BUCKETS; d++) {
      int c = count[d];
      count[d] = sum;
      sum += c;
    }
    for (int i = from; i < to; i++) {
      long e = source[i];
      target[count[(keyOf(e) >>> shift) & (DIGIT_BUCKETS - 1)]++] = e;
    }
  }

  /** Runs the entries {@code [from, to)}, each holding a packed edge id {@code (k << bits) | voxel}. */
  private static void process(long[] entries, int from, int to, int bits, int[] delta,
      MutexClusters clusters) {
    int voxelMask = (1 << bits) - 1;
    for (int i = from; i < to; i++) {
      long entry = entries[i];
      int id = (int) entry;
      int source = id & voxelMask;
      int target = source + delta[id >>> bits];
      if ((entry & (1L << 32)) == 0) {
        clusters.attract(source, target);
      } else {
        clusters.repel(source, target);
      }
    }
  }

  /**
   * Sorted entry of a key and a packed edge id: signed entry order is (unsigned key, unsigned
   * id) order, and packed ids are in edge id order.
   */
  private static long entry(int key, int packedId) {
    return ((long) (key ^ Integer.MIN_VALUE) << 32) | (packedId & 0xFFFFFFFFL);
  }

  private static int keyOf(long entry) {
    return (int) (entry >>> 32) ^ Integer.MIN_VALUE;
  }

  /** Key bits sorted inside a top-level bucket: two digits of {@link #DIGIT_BITS}. */
  private static final int LOW_BITS = 20;
  private static final int DIGIT_BITS = LOW_BITS / 2;
  private static final int DIGIT_BUCKETS = 1 << DIGIT_BITS;
  /** Top-level buckets of the float sort, one per value of the top key bits. */
  private static final int HIGH_BUCKETS = 1 << (32 - LOW_BITS);

  /** Key of a non-zero weight: ascending key = descending magnitude, attractive first. */
  private static int floatKey(float w) {
    int magnitude = 0x7FFFFFFF - Float.floatToRawIntBits(Math.abs(w));
    return (magnitude << 1) | (w > 0 ? 0 : 1);
  }

  /**
   * 8-bit affinities: a stable counting sort of the packed edge ids of the present slots by the
   * rank of their weight among the distinct weights.
   */
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
    byte[] present = graph.presentSlots();
    int[] start = new int[ranks + 1];
    for (int k = 0, slot = 0; k < graph.offsetCount(); k++) {
      for (int v = 0; v < n; v++, slot++) {
        int r = present[slot] == 0 ? -1 : rankOf[(k << 8) + (bytes[slot] & 0xff)];
        if (r >= 0) {
          start[r + 1]++;
        }
      }
    }
    for (int r = 0; r < ranks; r++) {
      start[r + 1] += start[r];
    }
    int bits = voxelBits(n);
    int[] sorted = new int[start[ranks]];
    int[] next = java.util.Arrays.copyOf(start, ranks);
    for (int k = 0, slot = 0; k < graph.offsetCount(); k++) {
      for (int v = 0; v < n; v++, slot++) {
        int r = present[slot] == 0 ? -1 : rankOf[(k << 8) + (bytes[slot] & 0xff)];
        if (r >= 0) {
          sorted[next[r]++] = (k << bits) | v;
        }
      }
    }
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
