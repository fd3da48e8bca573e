package org.sunder.blockwise.partition.multicut;

import java.util.Arrays;
import org.sunder.blockwise.collections.IntList;
import org.sunder.blockwise.collections.MaxHeap;

/**
 * Kernighan–Lin-style improvement of a multicut ("An Efficient Heuristic Procedure for
 * Partitioning Graphs", 1970, generalised from two sets to any number of clusters).
 *
 * <p>A pass visits every pair of adjacent clusters (A, B) of which one changed in the previous
 * pass, and every changed cluster A paired with a new empty cluster. For a pair it runs one
 * Kernighan–Lin sequence: starting from the nodes on the A–B boundary, repeatedly move the
 * unlocked node of largest gain (even a negative one) to the other side and lock it, updating
 * its neighbours' gains; afterwards keep the prefix of moves with the largest total gain. It
 * also weighs joining A and B outright (gain = the weight between them) and applies whichever
 * is larger, when positive. A sequence stops after {@value #PATIENCE} moves without a new best.
 * Passes repeat until one improves nothing (at most {@value #MAX_PASSES}). The objective never
 * increases: a change is applied only with a positive gain. A pass visits the pairs in order of
 * the summed weight between them and the changed clusters in order of the summed weight inside
 * them (largest first), so the result does not depend on how the nodes are numbered: a
 * blockwise run's reduced graph, numbered block by block, takes the path the one-block run's
 * graph takes.
 *
 * <p>Cost of one pair: {@code O(vol(S) + k·δ·log k)} for the smaller cluster's volume
 * {@code vol(S)}, {@code k} moves and degree {@code δ}. Not thread-safe; one instance per call.
 */
final class KernighanLinRefinement {
  static final int PATIENCE = 64;
  static final int MAX_PASSES = 100;

  private static final byte FREE = 0;
  private static final byte CANDIDATE = 1;
  private static final byte LOCKED = 2;

  private final int n;
  private final int[] offsets;
  private final int[] neighbours;
  private final double[] weights;
  private final double epsilon;

  private int[] label;
  private final int[] head;
  private final int[] next;
  private final int[] prev;
  private final int[] size;

  private final double[] toOwn;
  private final double[] toOther;
  private final int[] version;
  private final byte[] state;
  private final IntList touched = new IntList(64);
  private final IntList moved = new IntList(64);
  private final MaxHeap heap = new MaxHeap(64);

  KernighanLinRefinement(int nodeCount, int[] u, int[] v, double[] w) {
    n = nodeCount;
    offsets = new int[n + 1];
    double total = 0;
    for (int e = 0; e < u.length; e++) {
      if (u[e] != v[e]) {
        offsets[u[e] + 1]++;
        offsets[v[e] + 1]++;
        total += Math.abs(w[e]);
      }
    }
    for (int i = 0; i < n; i++) {
      offsets[i + 1] += offsets[i];
    }
    neighbours = new int[offsets[n]];
    weights = new double[offsets[n]];
    int[] fill = Arrays.copyOf(offsets, n);
    for (int e = 0; e < u.length; e++) {
      if (u[e] != v[e]) {
        neighbours[fill[u[e]]] = v[e];
        weights[fill[u[e]]++] = w[e];
        neighbours[fill[v[e]]] = u[e];
        weights[fill[v[e]]++] = w[e];
      }
    }
    epsilon = 1e-12 * (1 + total);
    head = new int[n];
    next = new int[n];
    prev = new int[n];
    size = new int[n];
    toOwn = new double[n];
    toOther = new double[n];
    version = new int[n];
    state = new byte[n];
  }

  /** Improves {@code labels} (values in 0..n−1) in place. */
  void improve(int[] labels) {
    this.label = labels;
    Arrays.fill(head, -1);
    for (int i = n - 1; i >= 0; i--) {
      link(i, labels[i]);
    }
    boolean[] changed = new boolean[n];
    Arrays.fill(changed, true);
    for (int pass = 0; pass < MAX_PASSES; pass++) {
      boolean[] changedNow = new boolean[n];
      boolean improved = false;
      for (long pair : adjacentPairs(changed)) {
        int a = (int) (pair >>> 32);
        int b = (int) pair;
        if (size[a] > 0 && size[b] > 0 && improvePair(a, b) > 0) {
          changedNow[a] = changedNow[b] = improved = true;
        }
      }
      IntList free = emptyClusters();
      for (int a : byInternalWeight(changed)) {
        if (size[a] >= 2) {
          if (free.size() == 0) {
            free = emptyClusters();
          }
          int fresh = free.get(free.size() - 1);
          if (improvePair(a, fresh) > 0) {
            changedNow[a] = changedNow[fresh] = improved = true;
          }
          if (size[fresh] > 0) {
            free.truncate(free.size() - 1);
          }
        }
      }
      if (!improved) {
        return;
      }
      changed = changedNow;
    }
  }

  private long[] adjacentPairs(boolean[] changed) {
    long[] pairs = new long[16];
    int count = 0;
    for (int x = 0; x < n; x++) {
      for (int p = offsets[x]; p < offsets[x + 1]; p++) {
        int y = neighbours[p];
        int a = label[x];
        int b = label[y];
        if (a < b && (changed[a] || changed[b])) {
          if (count == pairs.length) {
            pairs = Arrays.copyOf(pairs, count * 2);
          }
          pairs[count++] = ((long) a << 32) | b;
        }
      }
    }
    long[] sorted = Arrays.copyOf(pairs, count);
    Arrays.sort(sorted);
    int distinct = 0;
    for (int i = 0; i < count; i++) {
      if (i == 0 || sorted[i] != sorted[i - 1]) {
        sorted[distinct++] = sorted[i];
      }
    }
    return byWeightBetween(Arrays.copyOf(sorted, distinct));
  }

  /**
   * {@code pairs} (ascending) ordered by the summed weight between their two clusters, largest
   * first; equal weights keep their order. The order depends on the graph's weights, not on how
   * its nodes are numbered, so the same graph numbered otherwise (a blockwise run's reduced
   * graph against the one-block fragment graph) takes the same path. O(m + k log k) for m
   * edges and k pairs.
   */
  private long[] byWeightBetween(long[] pairs) {
    double[] between = new double[pairs.length];
    for (int x = 0; x < n; x++) {
      for (int p = offsets[x]; p < offsets[x + 1]; p++) {
        int a = label[x];
        int b = label[neighbours[p]];
        if (a < b) {
          int at = Arrays.binarySearch(pairs, ((long) a << 32) | b);
          if (at >= 0) {
            between[at] += weights[p];
          }
        }
      }
    }
    return sortedBy(pairs, between);
  }

  /**
   * The changed clusters ordered by the summed weight inside them, largest first (equal sums by
   * id); see {@link #byWeightBetween}. O(m + k log k).
   */
  private int[] byInternalWeight(boolean[] changed) {
    double[] inside = new double[n];
    for (int x = 0; x < n; x++) {
      for (int p = offsets[x]; p < offsets[x + 1]; p++) {
        if (label[x] == label[neighbours[p]]) {
          inside[label[x]] += weights[p];
        }
      }
    }
    int count = 0;
    for (int a = 0; a < n; a++) {
      count += changed[a] ? 1 : 0;
    }
    long[] ids = new long[count];
    double[] key = new double[count];
    count = 0;
    for (int a = 0; a < n; a++) {
      if (changed[a]) {
        key[count] = inside[a];
        ids[count++] = a;
      }
    }
    long[] sorted = sortedBy(ids, key);
    int[] out = new int[sorted.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = (int) sorted[i];
    }
    return out;
  }

  /** {@code items} ordered by {@code key} descending, equal keys in their given order. */
  private static long[] sortedBy(long[] items, double[] key) {
    Integer[] order = new Integer[items.length];
    for (int i = 0; i < order.length; i++) {
      order[i] = i;
    }
    Arrays.sort(order, (i, j) -> Double.compare(key[j], key[i]));
    long[] out = new long[items.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = items[order[i]];
    }
    return out;
  }

  /** Ids of the empty clusters, smallest last; one exists while a cluster has two nodes. */
  private IntList emptyClusters() {
    IntList free = new IntList(16);
    for (int c = n - 1; c >= 0; c--) {
      if (size[c] == 0) {
        free.add(c);
      }
    }
    return free;
  }

  /** One Kernighan–Lin sequence or a join between clusters a and b; returns the gain applied. */
  private double improvePair(int a, int b) {
    double between = size[b] == 0 ? seedAll(a, b) : seedBoundary(a, b);
    double best = 0;
    int bestLength = 0;
    double cumulative = 0;
    int sinceBest = 0;
    while (!heap.isEmpty()) {
      double gain = heap.topKey();
      long tie = heap.topTie();
      heap.pop();
      int x = (int) (tie >>> 32);
      if (state[x] != CANDIDATE || version[x] != (int) tie) {
        continue;
      }
      int from = label[x];
      int to = from == a ? b : a;
      label[x] = to;
      state[x] = LOCKED;
      moved.add(x);
      cumulative += gain;
      if (cumulative > best + epsilon) {
        best = cumulative;
        bestLength = moved.size();
        sinceBest = 0;
      } else if (++sinceBest > PATIENCE) {
        break;
      }
      updateNeighbours(x, from, a, b);
    }
    double applied = 0;
    if (between > epsilon && between >= best) {
      undoMoves(0, a, b);
      join(a, b);
      applied = between;
    } else if (best > epsilon) {
      undoMoves(bestLength, a, b);
      commitMoves(a, b);
      applied = best;
    } else {
      undoMoves(0, a, b);
    }
    reset();
    return applied;
  }

  /** Candidates on the a–b boundary; returns the total weight between a and b. */
  private double seedBoundary(int a, int b) {
    int small = size[a] <= size[b] ? a : b;
    int large = small == a ? b : a;
    double between = 0;
    for (int x = head[small]; x >= 0; x = next[x]) {
      for (int p = offsets[x]; p < offsets[x + 1]; p++) {
        int y = neighbours[p];
        if (label[y] == large) {
          between += weights[p];
          addCandidate(x, a, b);
          addCandidate(y, a, b);
        }
      }
    }
    return between;
  }

  /** Every node of a is a candidate to start the new cluster b; joining is meaningless. */
  private double seedAll(int a, int b) {
    for (int x = head[a]; x >= 0; x = next[x]) {
      addCandidate(x, a, b);
    }
    return 0;
  }

  private void addCandidate(int x, int a, int b) {
    if (state[x] != FREE) {
      return;
    }
    int own = label[x];
    int other = own == a ? b : a;
    double inside = 0;
    double across = 0;
    for (int p = offsets[x]; p < offsets[x + 1]; p++) {
      int l = label[neighbours[p]];
      if (l == own) {
        inside += weights[p];
      } else if (l == other) {
        across += weights[p];
      }
    }
    toOwn[x] = inside;
    toOther[x] = across;
    state[x] = CANDIDATE;
    touched.add(x);
    push(x);
  }

  private void push(int x) {
    version[x]++;
    heap.push(toOther[x] - toOwn[x], ((long) x << 32) | (version[x] & 0xffffffffL), x);
  }

  private void updateNeighbours(int x, int from, int a, int b) {
    for (int p = offsets[x]; p < offsets[x + 1]; p++) {
      int y = neighbours[p];
      int l = label[y];
      if ((l != a && l != b) || state[y] == LOCKED) {
        continue;
      }
      if (state[y] == FREE) {
        addCandidate(y, a, b);
      } else {
        double w = weights[p];
        if (l == from) {
          toOwn[y] -= w;
          toOther[y] += w;
        } else {
          toOwn[y] += w;
          toOther[y] -= w;
        }
        push(y);
      }
    }
  }

  /** Takes back the moves after the first {@code keep}. */
  private void undoMoves(int keep, int a, int b) {
    for (int i = moved.size() - 1; i >= keep; i--) {
      int x = moved.get(i);
      label[x] = label[x] == a ? b : a;
    }
    moved.truncate(keep);
  }

  /** Moves the kept nodes between the clusters' member lists (labels already say where). */
  private void commitMoves(int a, int b) {
    for (int i = 0; i < moved.size(); i++) {
      int x = moved.get(i);
      int to = label[x];
      unlink(x, to == a ? b : a);
      link(x, to);
    }
  }

  private void join(int a, int b) {
    int small = size[a] <= size[b] ? a : b;
    int large = small == a ? b : a;
    int x = head[small];
    while (x >= 0) {
      int following = next[x];
      unlink(x, small);
      label[x] = large;
      link(x, large);
      x = following;
    }
  }

  private void reset() {
    for (int i = 0; i < touched.size(); i++) {
      state[touched.get(i)] = FREE;
    }
    touched.clear();
    moved.clear();
    heap.clear();
  }

  private void link(int x, int cluster) {
    prev[x] = -1;
    next[x] = head[cluster];
    if (head[cluster] >= 0) {
      prev[head[cluster]] = x;
    }
    head[cluster] = x;
    size[cluster]++;
  }

  private void unlink(int x, int cluster) {
    if (prev[x] >= 0) {
      next[prev[x]] = next[x];
    } else {
      head[cluster] = next[x];
    }
    if (next[x] >= 0) {
      prev[next[x]] = prev[x];
    }
    size[cluster]--;
  }
}
