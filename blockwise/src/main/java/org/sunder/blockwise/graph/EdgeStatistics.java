package org.sunder.blockwise.graph;

import java.io.Serializable;
import java.util.Arrays;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import org.sunder.blockwise.collections.RadixSort;

/**
 * Accumulated statistics of the edges between pairs of nodes (segments): for each pair
 * {@code u < v}, the sum, count, minimum and maximum of the weights of its edges. Struct of
 * arrays; pairs are unique and sorted by {@code (u, v)} (canonical order), so two instances with
 * the same content are equal and serialise to the same bytes.
 *
 * <p>Statistics are mergeable: {@link #merge} combines two tables in {@code O(n + m)} (sums and
 * counts add, minima and maxima combine), which is how blocks, faces and the global solve build
 * the reduced graph. Immutable after construction, thread-safe. Plain arrays inside, so Kryo and
 * Java serialisation both handle it.
 */
public final class EdgeStatistics implements Serializable {
  private static final long serialVersionUID = 1L;
  private static final EdgeStatistics EMPTY =
      new EdgeStatistics(new long[0], new long[0], new double[0], new long[0], new double[0],
          new double[0]);

  private final long[] u;
  private final long[] v;
  private final double[] sum;
  private final long[] count;
  private final double[] min;
  private final double[] max;

  private EdgeStatistics(long[] u, long[] v, double[] sum, long[] count, double[] min,
      double[] max) {
    this.u = u;
    this.v = v;
    this.sum = sum;
    this.count = count;
    this.min = min;
    this.max = max;
  }

  public static EdgeStatistics empty() {
    return EMPTY;
  }

  /**
   * Statistics from arbitrary rows (copied): each row is stored with its smaller id first, rows
   * with {@code u == v} are dropped, rows of the same pair are combined. The result does not
   * depend on the order of the rows: rows of one pair are combined in ascending order of
   * {@code (sum, count, min, max)}.
   *
   * @throws IllegalArgumentException for arrays of different length, a count below 1,
   *     {@code min > max}, or a value that is not finite
   */
  public static EdgeStatistics of(long[] u, long[] v, double[] sum, long[] count, double[] min,
      double[] max) {
    int n = u.length;
    if (v.length != n || sum.length != n || count.length != n || min.length != n
        || max.length != n) {
      throw new IllegalArgumentException("statistics arrays differ in length");
    }
    for (int i = 0; i < n; i++) {
      if (count[i] < 1 || !(min[i] <= max[i]) || !Double.isFinite(sum[i])
          || !Double.isFinite(min[i]) || !Double.isFinite(max[i])) {
        throw new IllegalArgumentException("row " + i + " (" + u[i] + ", " + v[i] + "): sum "
            + sum[i] + ", count " + count[i] + ", min " + min[i] + ", max " + max[i]
            + " is not a valid statistic");
      }
    }
    long[] a = new long[n];
    long[] b = new long[n];
    for (int i = 0; i < n; i++) {
      a[i] = Math.min(u[i], v[i]);
      b[i] = Math.max(u[i], v[i]);
    }
    int[] order = RadixSort.order(n, i -> RadixSort.signedKey(a[i]),
        i -> RadixSort.signedKey(b[i]), i -> RadixSort.doubleKey(sum[i]),
        i -> RadixSort.signedKey(count[i]), i -> RadixSort.doubleKey(min[i]),
        i -> RadixSort.doubleKey(max[i]));
    return collapse(order, a, b, sum, count, min, max);
  }

  /**
   * Statistics from rows already unique and in canonical order (the arrays are kept, not
   * copied), as a filter of canonical rows gives them.
   *
   * @throws IllegalArgumentException when a row is not after the one before it
   */
  static EdgeStatistics ofCanonical(long[] u, long[] v, double[] sum, long[] count,
      double[] min, double[] max) {
    for (int i = 0; i < u.length; i++) {
      if (u[i] >= v[i] || i > 0 && (u[i - 1] > u[i] || u[i - 1] == u[i] && v[i - 1] >= v[i])) {
        throw new IllegalArgumentException("row " + i + " (" + u[i] + ", " + v[i]
            + ") is out of canonical order");
      }
    }
    return new EdgeStatistics(u, v, sum, count, min, max);
  }

  /** Statistics of single edges {@code (u[i], v[i])} with weight {@code w[i]}. */
  public static EdgeStatistics ofEdges(long[] u, long[] v, double[] w) {
    long[] ones = new long[u.length];
    Arrays.fill(ones, 1);
    return of(u, v, w, ones, w, w);
  }

  private static EdgeStatistics collapse(int[] order, long[] a, long[] b, double[] sum,
      long[] count, double[] min, double[] max) {
    Builder out = new Builder(order.length);
    for (int i : order) {
      if (a[i] == b[i]) {
        continue;
      }
      out.append(a[i], b[i], sum[i], count[i], min[i], max[i]);
    }
    return out.build();
  }

  /** Number of pairs. */
  public int size() {
    return u.length;
  }

  public long u(int i) {
    return u[i];
  }

  public long v(int i) {
    return v[i];
  }

  public double sum(int i) {
    return sum[i];
  }

  public long count(int i) {
    return count[i];
  }

  public double min(int i) {
    return min[i];
  }

  public double max(int i) {
    return max[i];
  }

  public double mean(int i) {
    return sum[i] / count[i];
  }

  /** Total number of edges over all pairs. */
  public long edgeCount() {
    long total = 0;
    for (long c : count) {
      total += c;
    }
    return total;
  }

  /** Row of pair {@code (a, b)} in either order, or -1; {@code O(log size)}. */
  public int indexOf(long a, long b) {
    long x = Math.min(a, b);
    long y = Math.max(a, b);
    int lo = 0;
    int hi = u.length - 1;
    while (lo <= hi) {
      int mid = (lo + hi) >>> 1;
      int c = compare(u[mid], v[mid], x, y);
      if (c == 0) {
        return mid;
      }
      if (c < 0) {
        lo = mid + 1;
      } else {
        hi = mid - 1;
      }
    }
    return -1;
  }

  /** Both tables combined: pairs in either are kept, pairs in both are merged. O(n + m). */
  public EdgeStatistics merge(EdgeStatistics other) {
    Builder out = new Builder(size() + other.size());
    int i = 0;
    int j = 0;
    while (i < size() || j < other.size()) {
      int c = i >= size() ? 1 : j >= other.size() ? -1
          : compare(u[i], v[i], other.u[j], other.v[j]);
      if (c < 0) {
        out.append(u[i], v[i], sum[i], count[i], min[i], max[i]);
        i++;
      } else if (c > 0) {
        out.append(other.u[j], other.v[j], other.sum[j], other.count[j], other.min[j],
            other.max[j]);
        j++;
      } else {
        out.append(u[i], v[i], sum[i] + other.sum[j], count[i] + other.count[j],
            Math.min(min[i], other.min[j]), Math.max(max[i], other.max[j]));
        i++;
        j++;
      }
    }
    return out.build();
  }

  /**
   * All tables combined, neighbours in list order first, then neighbouring results, and so on:
   * a fixed tree for a given list, so the result (floating-point sums included) depends only on
   * the list. {@code O(n log k)} for {@code n} rows in {@code k} tables.
   */
  public static EdgeStatistics mergeAll(List<EdgeStatistics> parts) {
    if (parts.isEmpty()) {
      return EMPTY;
    }
    List<EdgeStatistics> level = parts;
    while (level.size() > 1) {
      List<EdgeStatistics> next = new java.util.ArrayList<>((level.size() + 1) / 2);
      for (int i = 0; i < level.size(); i += 2) {
        next.add(i + 1 < level.size() ? level.get(i).merge(level.get(i + 1)) : level.get(i));
      }
      level = next;
    }
    return level.get(0);
  }

  /**
   * The table with ids replaced: {@code id -> newIds[i]} where {@code oldIds[i] == id}
   * ({@code oldIds} sorted ascending, unique); ids not listed stay. Pairs that become one id
   * vanish, pairs that coincide merge. {@code O(size log size)}.
   */
  public EdgeStatistics relabel(long[] oldIds, long[] newIds) {
    long[] a = new long[u.length];
    long[] b = new long[u.length];
    for (int i = 0; i < u.length; i++) {
      a[i] = map(u[i], oldIds, newIds);
      b[i] = map(v[i], oldIds, newIds);
    }
    return of(a, b, sum, count, min, max);
  }

  /**
   * The table with each id {@code x} replaced by {@code newIds[x]} (ids index the array, new ids
   * lie in {@code [0, 2^31)}): pairs that become one id vanish, and the rows of pairs that
   * coincide combine in this table's order, so sums come out as adding the rows one by one.
   * One stable radix sort of the new pairs packed in 64-bit keys, where a hash table of the new
   * pairs would be probed at random once per row: {@code O(size)} per varying key byte.
   */
  public EdgeStatistics mapped(int[] newIds) {
    int n = u.length;
    long[] keys = new long[n];
    int[] rows = new int[n];
    int k = 0;
    for (int i = 0; i < n; i++) {
      int p = newIds[Math.toIntExact(u[i])];
      int q = newIds[Math.toIntExact(v[i])];
      if (p < 0 || q < 0) {
        throw new IllegalArgumentException("new id " + Math.min(p, q) + " for pair (" + u[i]
            + ", " + v[i] + "); expected 0 or more");
      }
      if (p != q) {
        keys[k] = (long) Math.min(p, q) << 32 | Math.max(p, q);
        rows[k++] = i;
      }
    }
    RadixSort.sortByKeyUnsigned(keys, rows, k);
    Builder out = new Builder(k);
    for (int j = 0; j < k; j++) {
      int r = rows[j];
      out.append(keys[j] >>> 32, keys[j] & 0xFFFFFFFFL, sum[r], count[r], min[r], max[r]);
    }
    return out.build();
  }

  /**
   * The table with each id replaced by its position in {@code sortedIds} (ascending, unique), or
   * null when an id is not listed. The map is increasing, so the canonical order is kept and
   * nothing is sorted or merged: {@code O(size log ids)}.
   */
  public EdgeStatistics renumbered(long[] sortedIds) {
    long[] a = new long[u.length];
    long[] b = new long[u.length];
    for (int i = 0; i < u.length; i++) {
      a[i] = Arrays.binarySearch(sortedIds, u[i]);
      b[i] = Arrays.binarySearch(sortedIds, v[i]);
      if (a[i] < 0 || b[i] < 0) {
        return null;
      }
    }
    return new EdgeStatistics(a, b, sum, count, min, max);
  }

  /**
   * The table with every minimum and maximum replaced by its image under {@code rising}, a
   * non-decreasing function (so the images are the minimum and maximum of the images of the
   * edges' values): statistics gathered over one quantity, reported over another.
   *
   * @throws IllegalArgumentException when an image is not finite or a row's minimum's image
   *     exceeds its maximum's
   */
  public EdgeStatistics withMinMax(DoubleUnaryOperator rising) {
    double[] lo = new double[u.length];
    double[] hi = new double[u.length];
    for (int i = 0; i < u.length; i++) {
      lo[i] = rising.applyAsDouble(min[i]);
      hi[i] = rising.applyAsDouble(max[i]);
      if (!(lo[i] <= hi[i]) || !Double.isFinite(lo[i]) || !Double.isFinite(hi[i])) {
        throw new IllegalArgumentException("row " + i + " (" + u[i] + ", " + v[i] + "): min "
            + min[i] + " and max " + max[i] + " map to " + lo[i] + " and " + hi[i]
            + "; expected finite, non-decreasing images");
      }
    }
    return new EdgeStatistics(u, v, sum, count, lo, hi);
  }

  private static long map(long id, long[] oldIds, long[] newIds) {
    int at = Arrays.binarySearch(oldIds, id);
    return at >= 0 ? newIds[at] : id;
  }

  /** Copies of the columns, for callers that need whole arrays. */
  public long[] copyU() {
    return u.clone();
  }

  public long[] copyV() {
    return v.clone();
  }

  public double[] copySum() {
    return sum.clone();
  }

  public long[] copyCount() {
    return count.clone();
  }

  public double[] copyMin() {
    return min.clone();
  }

  public double[] copyMax() {
    return max.clone();
  }

  private static int compare(long a, long b, long x, long y) {
    int c = Long.compare(a, x);
    return c != 0 ? c : Long.compare(b, y);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof EdgeStatistics s && Arrays.equals(u, s.u) && Arrays.equals(v, s.v)
        && Arrays.equals(sum, s.sum) && Arrays.equals(count, s.count)
        && Arrays.equals(min, s.min) && Arrays.equals(max, s.max);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(u) * 31 + Arrays.hashCode(v) * 17 + Arrays.hashCode(sum);
  }

  @Override
  public String toString() {
    return "EdgeStatistics[" + size() + " pairs, " + edgeCount() + " edges]";
  }

  /**
   * Accumulates single edges or partial statistics in any order, hashed by pair; {@link #build}
   * sorts into canonical order. Expected {@code O(1)} per add, {@code O(p log p)} to build for
   * {@code p} pairs. A run of adds of one pair (neighbouring voxels along a boundary) finds its
   * row without hashing. The statistics live in the hash table itself, a slot of six longs
   * beside its pair (open addressing, linear probing, doubling at 1/2 load; 0 marks an empty
   * slot, so a fresh table needs no filling): on a block of millions of pairs an add that has to
   * hash reads one or two cache lines, where a table of row numbers beside columns of
   * statistics read five. Not thread-safe.
   */
  public static final class Accumulator {
    /** Slot: first, second, count plus one (0: empty), then sum, min, max as raw bits. */
    private static final int SLOT = 6;
    private long[] table;
    private int mask;
    private int size;
    private long lastX;
    private long lastY;
    /** Where the last pair added sits in {@link #table}, or -1. */
    private int lastAt = -1;

    public Accumulator(int expectedPairs) {
      allocate(Integer.highestOneBit(Math.max(4, expectedPairs) * 2 - 1) << 1);
    }

    /** Adds one edge of weight {@code w} between {@code a} and {@code b} ({@code a != b}). */
    public void add(long a, long b, double w) {
      add(a, b, w, 1, w, w);
    }

    /** Adds partial statistics ({@code count >= 0}) of the pair {@code (a, b)}. */
    public void add(long a, long b, double sum, long count, double min, double max) {
      long x = Math.min(a, b);
      long y = Math.max(a, b);
      if (x == y) {
        throw new IllegalArgumentException("edge from " + a + " to itself");
      }
      if (count < 0 || count == Long.MAX_VALUE) {
        throw new IllegalArgumentException("count " + count + " of pair (" + x + ", " + y
            + "); expected 0 .. 2^63 - 2");
      }
      int at = lastAt >= 0 && x == lastX && y == lastY ? lastAt : find(x, y);
      long[] t = table;
      if (t[at + 2] == 0) {
        t[at] = x;
        t[at + 1] = y;
        t[at + 2] = count + 1;
        t[at + 3] = Double.doubleToRawLongBits(sum);
        t[at + 4] = Double.doubleToRawLongBits(min);
        t[at + 5] = Double.doubleToRawLongBits(max);
        if (2 * ++size > mask + 1) {
          grow();
          at = find(x, y);
        }
      } else {
        t[at + 2] += count;
        t[at + 3] = Double.doubleToRawLongBits(Double.longBitsToDouble(t[at + 3]) + sum);
        t[at + 4] = Double.doubleToRawLongBits(
            Math.min(Double.longBitsToDouble(t[at + 4]), min));
        t[at + 5] = Double.doubleToRawLongBits(
            Math.max(Double.longBitsToDouble(t[at + 5]), max));
      }
      lastX = x;
      lastY = y;
      lastAt = at;
    }

    /** Number of distinct pairs so far. */
    public int size() {
      return size;
    }

    /**
     * Adds everything accumulated here to {@code target} and empties this one (its table keeps
     * its capacity): one pass over the table.
     */
    public void drainInto(Accumulator target) {
      long[] t = table;
      for (int at = 0; at < t.length && size > 0; at += SLOT) {
        if (t[at + 2] != 0) {
          target.add(t[at], t[at + 1], Double.longBitsToDouble(t[at + 3]), t[at + 2] - 1,
              Double.longBitsToDouble(t[at + 4]), Double.longBitsToDouble(t[at + 5]));
          t[at + 2] = 0;
          size--;
        }
      }
      lastAt = -1;
    }

    /**
     * The canonical table of everything added: the occupied slots in order of their pairs, then
     * each slot's row read once (a cache line or two). When every id lies in {@code [0, 2^32)}
     * (block labels, pieces) a pair's two ids make one key for one radix sort; otherwise the
     * slots are ordered by their two ids in turn.
     */
    public EdgeStatistics build() {
      long[] t = table;
      int[] slots = new int[size];
      long[] keys = new long[size];
      long ids = 0;
      int r = 0;
      for (int at = 0; at < t.length; at += SLOT) {
        if (t[at + 2] != 0) {
          ids |= t[at] | t[at + 1];
          keys[r] = t[at] << 32 | t[at + 1];
          slots[r++] = at;
        }
      }
      if (ids >>> 32 == 0) {
        RadixSort.sortByKeyUnsigned(keys, slots);
      } else {
        int[] unordered = slots;
        int[] order = RadixSort.order(size, i -> RadixSort.signedKey(t[unordered[i]]),
            i -> RadixSort.signedKey(t[unordered[i] + 1]));
        slots = new int[size];
        for (int i = 0; i < size; i++) {
          slots[i] = unordered[order[i]];
        }
      }
      long[] u = new long[size];
      long[] v = new long[size];
      double[] sum = new double[size];
      long[] count = new long[size];
      double[] min = new double[size];
      double[] max = new double[size];
      for (int i = 0; i < size; i++) {
        int at = slots[i];
        u[i] = t[at];
        v[i] = t[at + 1];
        count[i] = t[at + 2] - 1;
        sum[i] = Double.longBitsToDouble(t[at + 3]);
        min[i] = Double.longBitsToDouble(t[at + 4]);
        max[i] = Double.longBitsToDouble(t[at + 5]);
      }
      return new EdgeStatistics(u, v, sum, count, min, max);
    }

    /** The slot of {@code (x, y)} in {@link #table}, or the empty slot where it would go. */
    private int find(long x, long y) {
      long[] t = table;
      for (int i = slot(x, y); ; i = (i + 1) & mask) {
        int at = SLOT * i;
        if (t[at + 2] == 0 || t[at] == x && t[at + 1] == y) {
          return at;
        }
      }
    }

    private int slot(long a, long b) {
      long h = a * 0x9E3779B97F4A7C15L + b;
      h ^= h >>> 32;
      h *= 0xBF58476D1CE4E5B9L;
      h ^= h >>> 29;
      return (int) h & mask;
    }

    private void allocate(int capacity) {
      if (capacity <= 0 || capacity > (Integer.MAX_VALUE - 8) / SLOT) {
        throw new IllegalStateException("EdgeStatistics.Accumulator: " + size + " pairs need"
            + " more slots than one array holds");
      }
      table = new long[SLOT * capacity];
      mask = capacity - 1;
    }

    private void grow() {
      long[] old = table;
      allocate(2 * (mask + 1));
      for (int from = 0; from < old.length; from += SLOT) {
        if (old[from + 2] != 0) {
          System.arraycopy(old, from, table, find(old[from], old[from + 1]), SLOT);
        }
      }
      lastAt = -1;
    }
  }

  /** Appends rows in sorted order, combining consecutive rows of one pair. */
  private static final class Builder {
    long[] u;
    long[] v;
    double[] sum;
    long[] count;
    double[] min;
    double[] max;
    int size;

    Builder(int capacity) {
      int c = Math.max(4, capacity);
      u = new long[c];
      v = new long[c];
      sum = new double[c];
      count = new long[c];
      min = new double[c];
      max = new double[c];
    }

    void append(long a, long b, double s, long n, double lo, double hi) {
      if (size > 0 && u[size - 1] == a && v[size - 1] == b) {
        combine(size - 1, s, n, lo, hi);
        return;
      }
      if (size == u.length) {
        int c = size * 2;
        u = Arrays.copyOf(u, c);
        v = Arrays.copyOf(v, c);
        sum = Arrays.copyOf(sum, c);
        count = Arrays.copyOf(count, c);
        min = Arrays.copyOf(min, c);
        max = Arrays.copyOf(max, c);
      }
      u[size] = a;
      v[size] = b;
      sum[size] = s;
      count[size] = n;
      min[size] = lo;
      max[size] = hi;
      size++;
    }

    void combine(int row, double s, long n, double lo, double hi) {
      sum[row] += s;
      count[row] += n;
      min[row] = Math.min(min[row], lo);
      max[row] = Math.max(max[row], hi);
    }

    EdgeStatistics build() {
      return new EdgeStatistics(Arrays.copyOf(u, size), Arrays.copyOf(v, size),
          Arrays.copyOf(sum, size), Arrays.copyOf(count, size), Arrays.copyOf(min, size),
          Arrays.copyOf(max, size));
    }
  }
}
