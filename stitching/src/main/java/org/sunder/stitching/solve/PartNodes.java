package org.sunder.stitching.solve;

import java.util.Arrays;
import java.util.function.IntToLongFunction;
import java.util.function.LongPredicate;

/**
 * The nodes of one part of a hierarchical solve level and where the ends of its edges lie among
 * them; what every {@link PartSolver} starts from. O(m log m) for m edges.
 *
 * @param nodes the edge ends inside the part, ascending, each once
 * @param iu per edge, the index of its first end in {@code nodes}, negative when outside
 * @param iv per edge, the index of its second end in {@code nodes}, negative when outside
 */
record PartNodes(long[] nodes, int[] iu, int[] iv) {

  /** The part's nodes among the ends {@code u(e)}, {@code v(e)} of edges {@code 0..m-1}. */
  static PartNodes of(int m, IntToLongFunction u, IntToLongFunction v, LongPredicate inside) {
    long[] ends = new long[2 * m];
    int count = 0;
    for (int e = 0; e < m; e++) {
      if (inside.test(u.applyAsLong(e))) {
        ends[count++] = u.applyAsLong(e);
      }
      if (inside.test(v.applyAsLong(e))) {
        ends[count++] = v.applyAsLong(e);
      }
    }
    Arrays.sort(ends, 0, count);
    int unique = 0;
    for (int i = 0; i < count; i++) {
      if (unique == 0 || ends[unique - 1] != ends[i]) {
        ends[unique++] = ends[i];
      }
    }
    long[] nodes = Arrays.copyOf(ends, unique);
    int[] iu = new int[m];
    int[] iv = new int[m];
    for (int e = 0; e < m; e++) {
      iu[e] = Arrays.binarySearch(nodes, u.applyAsLong(e));
      iv[e] = Arrays.binarySearch(nodes, v.applyAsLong(e));
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
