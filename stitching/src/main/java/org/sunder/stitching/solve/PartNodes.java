package org.sunder.stitching.solve;

import it.unimi.dsi.fastutil.longs.Long2IntOpenHashMap;
import java.util.Arrays;
import java.util.function.IntToLongFunction;
import java.util.function.LongPredicate;
import org.sunder.blockwise.collections.RadixSort;

/**
 * The nodes of one part of a hierarchical solve level and where the ends of its edges lie among
 * them; what every {@link PartSolver} starts from. Each end is looked up once in a hash map of
 * the ends seen (inside or not, so {@code inside} is asked once per distinct end), then only the
 * distinct inside nodes are sorted ({@link RadixSort}): {@code O(m)} expected for m edges plus
 * {@code O(n)} per varying byte of the n node ids, reading the edges in order and writing the
 * end indices in order. About 8 bytes per edge plus 40 per distinct end while it runs.
 *
 * @param nodes the edge ends inside the part, ascending, each once
 * @param iu per edge, the index of its first end in {@code nodes}, -1 when outside
 * @param iv per edge, the index of its second end in {@code nodes}, -1 when outside
 */
record PartNodes(long[] nodes, int[] iu, int[] iv) {
  /** Map value of an end outside the part. */
  private static final int OUTSIDE = -1;
  /** Map value of an end not seen yet. */
  private static final int UNSEEN = -2;

  /** The part's nodes among the ends {@code u(e)}, {@code v(e)} of edges {@code 0..m-1}. */
  static PartNodes of(int m, IntToLongFunction u, IntToLongFunction v, LongPredicate inside) {
    Ends ends = new Ends(m, inside);
    int[] iu = new int[m];
    int[] iv = new int[m];
    for (int e = 0; e < m; e++) {
      iu[e] = ends.indexOf(u.applyAsLong(e));
      iv[e] = ends.indexOf(v.applyAsLong(e));
    }
    // number the inside nodes in ascending order instead of first-seen order
    int n = ends.count;
    long[] keys = new long[n];
    int[] seen = new int[n];
    for (int i = 0; i < n; i++) {
      keys[i] = RadixSort.signedKey(ends.nodes[i]);
      seen[i] = i;
    }
    RadixSort.sortByKeyUnsigned(keys, seen, n);
    long[] nodes = new long[n];
    int[] rank = new int[n];
    for (int i = 0; i < n; i++) {
      nodes[i] = ends.nodes[seen[i]];
      rank[seen[i]] = i;
    }
    for (int e = 0; e < m; e++) {
      if (iu[e] >= 0) {
        iu[e] = rank[iu[e]];
      }
      if (iv[e] >= 0) {
        iv[e] = rank[iv[e]];
      }
    }
    return new PartNodes(nodes, iu, iv);
  }

  /** The distinct ends seen so far: inside ones numbered in first-seen order. */
  private static final class Ends {
    private final Long2IntOpenHashMap index;
    private final LongPredicate inside;
    long[] nodes;
    int count;

    Ends(int m, LongPredicate inside) {
      // a part's graph has a few edges per node; the map grows if it has fewer
      index = new Long2IntOpenHashMap(Math.max(16, m / 2), 0.5f);
      index.defaultReturnValue(UNSEEN);
      this.inside = inside;
      nodes = new long[Math.max(16, m / 2)];
    }

    /** The first-seen index of {@code end} among the inside ends, or -1 when outside. */
    int indexOf(long end) {
      int i = index.get(end);
      if (i != UNSEEN) {
        return i;
      }
      if (!inside.test(end)) {
        index.put(end, OUTSIDE);
        return OUTSIDE;
      }
      if (count == nodes.length) {
        nodes = Arrays.copyOf(nodes, 2 * count);
      }
      nodes[count] = end;
      index.put(end, count);
      return count++;
    }
  }

  /** Whether both ends of every edge lie inside the part (the part is the whole graph). */
  boolean whole() {
    for (int e = 0; e < iu.length; e++) {
      if (iu[e] < 0 || iv[e] < 0) {
        return false;
      }
    }
    return true;
  }
}
