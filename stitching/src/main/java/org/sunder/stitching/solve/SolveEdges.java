package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.Arrays;
import java.util.List;

/**
 * The signed edges of one part of a hierarchical solve, struct of arrays. Each edge joins two
 * nodes named by provisional ids ({@code u}, {@code v}: the current representatives of the
 * clusters at its ends, or an end not yet relabelled by the part that holds it), has a weight,
 * and carries its <em>key</em> {@code (keyU, keyV, kind)}: the reduced-graph pair it came from
 * and which of that pair's edges it is ({@link #MAX}, {@link #MIN}, {@link #SEPARATED}; or one of
 * a pair's statistics, see {@link LinkagePartSolver}). The key
 * never changes: it names the edge across levels and breaks ties in the global order (see
 * {@link MutexOrder}).
 *
 * <p>Growable while built ({@link #add}); treat as immutable afterwards. 33 bytes per edge.
 */
public final class SolveEdges implements Serializable {
  private static final long serialVersionUID = 1L;
  /** The edge holding a pair's largest weight (attractive). */
  public static final byte MAX = 0;
  /** The edge holding a pair's smallest weight (repulsive). */
  public static final byte MIN = 1;
  /** A pair a block kept apart; its weight is {@link #APART}. */
  public static final byte SEPARATED = 2;
  /** The weight of a separated pair: stronger than any edge weight, repulsive. */
  public static final double APART = -1e300;

  private long[] u;
  private long[] v;
  private double[] weight;
  private long[] keyU;
  private long[] keyV;
  private byte[] kind;
  private int size;

  public SolveEdges(int expected) {
    int m = Math.max(4, expected);
    u = new long[m];
    v = new long[m];
    weight = new double[m];
    keyU = new long[m];
    keyV = new long[m];
    kind = new byte[m];
  }

  /** Appends an edge; O(1) amortised. */
  public void add(long a, long b, double w, long ka, long kb, byte k) {
    if (size == u.length) {
      reserve(1);
    }
    u[size] = a;
    v[size] = b;
    weight[size] = w;
    keyU[size] = ka;
    keyV[size] = kb;
    kind[size] = k;
    size++;
  }

  /**
   * The edges of the given columns, which the list takes over (not copied; the caller no longer
   * writes them); all of one length.
   */
  static SolveEdges wrap(long[] u, long[] v, double[] weight, long[] keyU, long[] keyV,
      byte[] kind) {
    return wrap(u, v, weight, keyU, keyV, kind, u.length);
  }

  /**
   * The first {@code size} edges of the given columns, which the list takes over (as
   * {@link #wrap(long[], long[], double[], long[], long[], byte[])}); all of one length, at
   * least {@code size}.
   */
  static SolveEdges wrap(long[] u, long[] v, double[] weight, long[] keyU, long[] keyV,
      byte[] kind, int size) {
    int m = u.length;
    if (v.length != m || weight.length != m || keyU.length != m || keyV.length != m
        || kind.length != m || size < 0 || size > m) {
      throw new IllegalArgumentException(size + " edges in columns of lengths " + m + ", "
          + v.length + ", " + weight.length + ", " + keyU.length + ", " + keyV.length + ", "
          + kind.length);
    }
    SolveEdges edges = new SolveEdges(0);
    edges.u = u;
    edges.v = v;
    edges.weight = weight;
    edges.keyU = keyU;
    edges.keyV = keyV;
    edges.kind = kind;
    edges.size = size;
    return edges;
  }

  /**
   * Edges {@code indices[0..count)} of {@code source}, in that order, with their ends replaced
   * by {@code u[i]}, {@code v[i]} (copied when longer than {@code count}, else taken over).
   * Each column is
   * read in one loop of its own (independent reads at random the processor overlaps, where
   * appending edge by edge reads every column per edge). O(count).
   */
  static SolveEdges gathered(SolveEdges source, int[] indices, int count, long[] u, long[] v) {
    if (count > indices.length || count > u.length || count > v.length) {
      throw new IllegalArgumentException(count + " edges from " + indices.length + " indices, "
          + u.length + " and " + v.length + " ends");
    }
    double[] weight = new double[count];
    long[] keyU = new long[count];
    long[] keyV = new long[count];
    byte[] kind = new byte[count];
    for (int i = 0; i < count; i++) {
      weight[i] = source.weight[indices[i]];
    }
    for (int i = 0; i < count; i++) {
      keyU[i] = source.keyU[indices[i]];
    }
    for (int i = 0; i < count; i++) {
      keyV[i] = source.keyV[indices[i]];
    }
    for (int i = 0; i < count; i++) {
      kind[i] = source.kind[indices[i]];
    }
    return wrap(u.length == count ? u : Arrays.copyOf(u, count),
        v.length == count ? v : Arrays.copyOf(v, count), weight, keyU, keyV, kind);
  }

  /** Room for {@code more} further edges without growing again. */
  private void reserve(int more) {
    int needed = Math.addExact(size, more);
    if (needed > u.length) {
      int m = Math.max(needed, size * 2);
      u = Arrays.copyOf(u, m);
      v = Arrays.copyOf(v, m);
      weight = Arrays.copyOf(weight, m);
      keyU = Arrays.copyOf(keyU, m);
      keyV = Arrays.copyOf(keyV, m);
      kind = Arrays.copyOf(kind, m);
    }
  }

  /** Appends edge {@code e} of {@code other} with its ends replaced by {@code a}, {@code b}. */
  public void add(SolveEdges other, int e, long a, long b) {
    add(a, b, other.weight[e], other.keyU[e], other.keyV[e], other.kind[e]);
  }

  /** The edges of {@code lists}, one after another. O(m). */
  static SolveEdges concatenation(List<SolveEdges> lists) {
    int total = 0;
    for (SolveEdges list : lists) {
      total = Math.addExact(total, list.size());
    }
    SolveEdges all = new SolveEdges(total);
    for (SolveEdges list : lists) {
      all.addAll(list);
    }
    return all;
  }

  /** Appends every edge of {@code other}. */
  public void addAll(SolveEdges other) {
    int n = other.size;
    reserve(n);
    System.arraycopy(other.u, 0, u, size, n);
    System.arraycopy(other.v, 0, v, size, n);
    System.arraycopy(other.weight, 0, weight, size, n);
    System.arraycopy(other.keyU, 0, keyU, size, n);
    System.arraycopy(other.keyV, 0, keyV, size, n);
    System.arraycopy(other.kind, 0, kind, size, n);
    size += n;
  }

  /** The first ends, a column of at least {@link #size} entries; read only. */
  long[] uColumn() {
    return u;
  }

  /** The second ends, a column of at least {@link #size} entries; read only. */
  long[] vColumn() {
    return v;
  }

  /** The weights, a column of at least {@link #size} entries; read only. */
  double[] weightColumn() {
    return weight;
  }

  /** The keys' first ids, a column of at least {@link #size} entries; read only. */
  long[] keyUColumn() {
    return keyU;
  }

  /** The keys' second ids, a column of at least {@link #size} entries; read only. */
  long[] keyVColumn() {
    return keyV;
  }

  /** The kinds, a column of at least {@link #size} entries; read only. */
  byte[] kindColumn() {
    return kind;
  }

  public int size() {
    return size;
  }

  public long u(int e) {
    return u[e];
  }

  public long v(int e) {
    return v[e];
  }

  public double weight(int e) {
    return weight[e];
  }

  public long keyU(int e) {
    return keyU[e];
  }

  public long keyV(int e) {
    return keyV[e];
  }

  public byte kind(int e) {
    return kind[e];
  }

  /** Compares the keys of edges {@code a} and {@code b} of this list. */
  int compareKeys(int a, int b) {
    return compareKeys(this, a, this, b);
  }

  static int compareKeys(SolveEdges x, int a, SolveEdges y, int b) {
    int c = Long.compare(x.keyU[a], y.keyU[b]);
    if (c != 0) {
      return c;
    }
    c = Long.compare(x.keyV[a], y.keyV[b]);
    return c != 0 ? c : Byte.compare(x.kind[a], y.kind[b]);
  }

  /**
   * Joins the copies of one edge: the parts on both sides of a crossing edge each hand up a
   * copy with their own end relabelled to its representative, the smallest provisional id of
   * its cluster, and the other end as they received it. Representatives only decrease, so the
   * joined edge takes the smaller value at each end. Returns a new list sorted by key, one edge
   * per key. O(m) per varying key byte (a radix sort, {@link EdgeSort#byKey}).
   */
  public SolveEdges joinCopies() {
    return joinCopies(EdgeSort.byKey(this));
  }

  /**
   * {@link #joinCopies()} in another order: the edges in {@code order}, a permutation of the
   * indices that puts the copies of each edge side by side, each edge's copies joined into its
   * first. O(m).
   */
  SolveEdges joinCopies(int[] order) {
    if (order.length != size) {
      throw new IllegalArgumentException("an order of " + order.length + " indices for "
          + size + " edges");
    }
    // the columns in that order, one column at a time (independent reads the processor
    // overlaps), then one pass in order that keeps the first copy of each key
    long[] su = gather(u, order);
    long[] sv = gather(v, order);
    long[] ku = gather(keyU, order);
    long[] kv = gather(keyV, order);
    double[] w = new double[size];
    byte[] k = new byte[size];
    for (int i = 0; i < size; i++) {
      w[i] = weight[order[i]];
      k[i] = kind[order[i]];
    }
    int joined = 0;
    int i = 0;
    while (i < size) {
      long a = su[i];
      long b = sv[i];
      int j = i + 1;
      for (; j < size && ku[j] == ku[i] && kv[j] == kv[i] && k[j] == k[i]; j++) {
        a = Math.min(a, su[j]);
        b = Math.min(b, sv[j]);
      }
      su[joined] = a;
      sv[joined] = b;
      w[joined] = w[i];
      ku[joined] = ku[i];
      kv[joined] = kv[i];
      k[joined] = k[i];
      joined++;
      i = j;
    }
    return wrap(su, sv, w, ku, kv, k, joined);
  }

  private long[] gather(long[] column, int[] order) {
    long[] out = new long[size];
    for (int i = 0; i < size; i++) {
      out[i] = column[order[i]];
    }
    return out;
  }

  @Override
  public boolean equals(Object o) {
    if (!(o instanceof SolveEdges s) || s.size != size) {
      return false;
    }
    return Arrays.equals(u, 0, size, s.u, 0, size) && Arrays.equals(v, 0, size, s.v, 0, size)
        && Arrays.equals(weight, 0, size, s.weight, 0, size)
        && Arrays.equals(keyU, 0, size, s.keyU, 0, size)
        && Arrays.equals(keyV, 0, size, s.keyV, 0, size)
        && Arrays.equals(kind, 0, size, s.kind, 0, size);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(Arrays.copyOf(keyU, size)) * 31 + size;
  }

  @Override
  public String toString() {
    return "SolveEdges[" + size + " edges]";
  }
}
