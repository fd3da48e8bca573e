package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.function.IntToLongFunction;
import java.util.function.LongPredicate;
import org.sunder.blockwise.collections.RadixSort;

/**
 * The nodes of one part of a hierarchical solve level and where the ends of its edges lie among
 * them; what every {@link PartSolver} starts from. One radix sort of the inside ends
 * ({@link RadixSort}), {@code O(m)} per varying byte of the node ids for m edges; 48 bytes per
 * edge while it runs.
 *
 * @param nodes the edge ends inside the part, ascending, each once
 * @param iu per edge, the index of its first end in {@code nodes}, -1 when outside
 * @param iv per edge, the index of its second end in {@code nodes}, -1 when outside
 */
record PartNodes(long[] nodes, int[] iu, int[] iv) {

  /** The part's nodes among the ends {@code u(e)}, {@code v(e)} of edges {@code 0..m-1}. */
  static PartNodes of(int m, IntToLongFunction u, IntToLongFunction v, LongPredicate inside) {
    long[] keys = new long[2 * m];
    int[] ends = new int[2 * m];
    int count = 0;
    for (int e = 0; e < m; e++) {
      long a = u.applyAsLong(e);
      if (inside.test(a)) {
        keys[count] = RadixSort.signedKey(a);
        ends[count++] = 2 * e;
      }
      long b = v.applyAsLong(e);
      if (inside.test(b)) {
        keys[count] = RadixSort.signedKey(b);
        ends[count++] = 2 * e + 1;
      }
    }
    RadixSort.sortByKeyUnsigned(keys, ends, count);
    int[] iu = new int[m];
    int[] iv = new int[m];
    Arrays.fill(iu, -1);
    Arrays.fill(iv, -1);
    int unique = 0;
    for (int i = 0; i < count; i++) {
      if (unique == 0 || keys[unique - 1] != keys[i]) {
        keys[unique++] = keys[i];
      }
      int end = ends[i];
      if (end % 2 == 0) {
        iu[end / 2] = unique - 1;
      } else {
        iv[end / 2] = unique - 1;
      }
    }
    long[] nodes = new long[unique];
    for (int i = 0; i < unique; i++) {
      nodes[i] = RadixSort.signedKey(keys[i]);
    }
    return new PartNodes(nodes, iu, iv);
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
