package org.sunder.blockwise.metrics;

import java.io.Serializable;
import java.util.Arrays;
import java.util.Objects;

/**
 * Voxel counts per pair (ground-truth label, segment label), the one input every score in
 * {@link Scorer} is computed from. Accumulated block by block and mergeable: the table of a
 * volume is the sum of the tables of any partition of its voxels, so partial tables of blocks
 * (or of Spark partitions) can be summed in any order.
 *
 * <p>Storage is an open-addressing hash table on primitive arrays (label pairs as two
 * {@code long}s, counts as {@code long}); labels are arbitrary 64-bit values (read as unsigned).
 * Adding an array costs {@code O(n)} expected, and consecutive voxels with the same pair are
 * counted as one run, so smooth label volumes touch the table rarely. Memory is about
 * {@code 48} bytes per distinct pair. Not thread-safe: use one table per thread and
 * {@link #merge} them.
 */
public final class ContingencyTable implements Serializable {
  private static final long serialVersionUID = 1L;
  private static final int MIN_CAPACITY = 16;

  private long[] groundTruth;
  private long[] segment;
  private long[] count;
  private int size;
  private long voxels;

  /** An empty table. */
  public ContingencyTable() {
    allocate(MIN_CAPACITY);
  }

  /** Counts every voxel of two label arrays of the same length. */
  public void add(long[] groundTruthLabels, long[] segmentLabels) {
    requireSameLength(groundTruthLabels, segmentLabels, null);
    int n = groundTruthLabels.length;
    int i = 0;
    while (i < n) {
      long g = groundTruthLabels[i];
      long s = segmentLabels[i];
      int end = i + 1;
      while (end < n && groundTruthLabels[end] == g && segmentLabels[end] == s) {
        end++;
      }
      add(g, s, end - i);
      i = end;
    }
  }

  /** Counts the voxels of two label arrays where {@code mask} is non-zero. */
  public void add(long[] groundTruthLabels, long[] segmentLabels, byte[] mask) {
    requireSameLength(groundTruthLabels, segmentLabels, mask);
    int n = groundTruthLabels.length;
    int i = 0;
    while (i < n) {
      if (mask[i] == 0) {
        i++;
        continue;
      }
      long g = groundTruthLabels[i];
      long s = segmentLabels[i];
      int end = i + 1;
      while (end < n && mask[end] != 0 && groundTruthLabels[end] == g && segmentLabels[end] == s) {
        end++;
      }
      add(g, s, end - i);
      i = end;
    }
  }

  /** Adds {@code voxelCount} voxels with the given pair of labels. */
  public void add(long groundTruthLabel, long segmentLabel, long voxelCount) {
    if (voxelCount <= 0) {
      if (voxelCount == 0) {
        return;
      }
      throw new IllegalArgumentException("voxel count must be >= 0, got " + voxelCount);
    }
    int slot = find(groundTruthLabel, segmentLabel);
    if (count[slot] == 0) {
      groundTruth[slot] = groundTruthLabel;
      segment[slot] = segmentLabel;
      size++;
    }
    count[slot] += voxelCount;
    voxels += voxelCount;
    if (size * 4L > groundTruth.length * 3L) {
      rehash(groundTruth.length * 2);
    }
  }

  /** Adds every count of {@code other} to this table; {@code other} is unchanged. */
  public void merge(ContingencyTable other) {
    for (int i = 0; i < other.count.length; i++) {
      if (other.count[i] != 0) {
        add(other.groundTruth[i], other.segment[i], other.count[i]);
      }
    }
  }

  /** The voxels counted for one pair; 0 if the pair never occurred. */
  public long count(long groundTruthLabel, long segmentLabel) {
    return count[find(groundTruthLabel, segmentLabel)];
  }

  /** The number of voxels counted. */
  public long voxelCount() {
    return voxels;
  }

  /** The number of distinct label pairs. */
  public int pairCount() {
    return size;
  }

  /**
   * The non-zero pairs sorted by ground-truth label, then segment label (both unsigned).
   * Allocates a few arrays of {@link #pairCount()} entries; {@code O(p log p)} (primitive sorts
   * of the labels, then counting sorts by rank).
   */
  public Pairs sortedPairs() {
    long[] g = new long[size];
    long[] s = new long[size];
    long[] c = new long[size];
    int k = 0;
    for (int i = 0; i < count.length; i++) {
      if (count[i] != 0) {
        g[k] = groundTruth[i];
        s[k] = segment[i];
        c[k] = count[i];
        k++;
      }
    }
    int[] bySegment = new LabelRanks(s).stableSort(LabelRanks.identity(size));
    int[] order = new LabelRanks(g).stableSort(bySegment);
    return new Pairs(permute(g, order), permute(s, order), permute(c, order));
  }

  /** Tables are equal when they hold the same counts for the same pairs. */
  @Override
  public boolean equals(Object o) {
    if (!(o instanceof ContingencyTable other) || other.size != size || other.voxels != voxels) {
      return false;
    }
    for (int i = 0; i < count.length; i++) {
      if (count[i] != 0 && other.count(groundTruth[i], segment[i]) != count[i]) {
        return false;
      }
    }
    return true;
  }

  @Override
  public int hashCode() {
    long h = voxels * 31 + size;
    for (int i = 0; i < count.length; i++) {
      if (count[i] != 0) {
        h += mix(groundTruth[i] * 0x9E3779B97F4A7C15L ^ segment[i]) * count[i];
      }
    }
    return Long.hashCode(h);
  }

  @Override
  public String toString() {
    return "ContingencyTable[" + size + " pairs, " + voxels + " voxels]";
  }

  /**
   * Pairs with their counts in parallel arrays, sorted by ground-truth label then segment label.
   * The arrays are owned by the caller.
   */
  public record Pairs(long[] groundTruth, long[] segment, long[] count) {
    public Pairs {
      Objects.requireNonNull(groundTruth, "groundTruth");
      Objects.requireNonNull(segment, "segment");
      Objects.requireNonNull(count, "count");
      if (segment.length != groundTruth.length || count.length != groundTruth.length) {
        throw new IllegalArgumentException("pair arrays differ in length");
      }
    }

    /** The number of pairs. */
    public int size() {
      return count.length;
    }

    @Override
    public boolean equals(Object o) {
      return o instanceof Pairs p && Arrays.equals(groundTruth, p.groundTruth)
          && Arrays.equals(segment, p.segment) && Arrays.equals(count, p.count);
    }

    @Override
    public int hashCode() {
      return Objects.hash(Arrays.hashCode(groundTruth), Arrays.hashCode(segment),
          Arrays.hashCode(count));
    }

    @Override
    public String toString() {
      return "Pairs[" + count.length + "]";
    }
  }

  private int find(long g, long s) {
    int mask = groundTruth.length - 1;
    int slot = (int) mix(g * 0x9E3779B97F4A7C15L + s) & mask;
    while (count[slot] != 0 && (groundTruth[slot] != g || segment[slot] != s)) {
      slot = (slot + 1) & mask;
    }
    return slot;
  }

  private void rehash(int capacity) {
    long[] oldG = groundTruth;
    long[] oldS = segment;
    long[] oldC = count;
    allocate(capacity);
    for (int i = 0; i < oldC.length; i++) {
      if (oldC[i] != 0) {
        int slot = find(oldG[i], oldS[i]);
        groundTruth[slot] = oldG[i];
        segment[slot] = oldS[i];
        count[slot] = oldC[i];
      }
    }
  }

  private void allocate(int capacity) {
    groundTruth = new long[capacity];
    segment = new long[capacity];
    count = new long[capacity];
  }

  private static long mix(long z) {
    z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
    z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
    return z ^ (z >>> 31);
  }

  private static long[] permute(long[] values, int[] order) {
    long[] out = new long[order.length];
    for (int i = 0; i < order.length; i++) {
      out[i] = values[order[i]];
    }
    return out;
  }

  private static void requireSameLength(long[] g, long[] s, byte[] mask) {
    if (g.length != s.length || (mask != null && mask.length != g.length)) {
      throw new IllegalArgumentException("label arrays differ in length: ground truth " + g.length
          + ", segmentation " + s.length + (mask == null ? "" : ", mask " + mask.length));
    }
  }
}
