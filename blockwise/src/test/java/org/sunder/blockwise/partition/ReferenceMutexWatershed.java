package org.sunder.blockwise.partition;

import java.util.Arrays;
import java.util.HashSet;
import java.util.Set;
import org.sunder.blockwise.graph.SignedGraph;

/**
 * A plain transcription of the Mutex Watershed's pseudo-code (TPAMI 2020, Algorithm 1) for tests:
 * boxed sort, hash sets of constrained cluster roots, relabelling by full scans. Slow on purpose.
 */
public final class ReferenceMutexWatershed {
  private ReferenceMutexWatershed() {}

  public static Clustering partition(SignedGraph g) {
    Integer[] order = new Integer[g.edgeCount()];
    for (int e = 0; e < order.length; e++) {
      order[e] = e;
    }
    Arrays.sort(order, (x, y) -> {
      int c = Double.compare(Math.abs(g.weight(y)), Math.abs(g.weight(x)));
      if (c != 0) {
        return c;
      }
      c = Boolean.compare(g.weight(y) > 0, g.weight(x) > 0);
      return c != 0 ? c : Integer.compare(x, y);
    });
    int n = g.nodeCount();
    int[] cluster = new int[n];
    for (int i = 0; i < n; i++) {
      cluster[i] = i;
    }
    Set<Long> mutex = new HashSet<>();
    for (int e : order) {
      double w = g.weight(e);
      int a = cluster[g.edgeU(e)];
      int b = cluster[g.edgeV(e)];
      if (w == 0 || a == b) {
        continue;
      }
      if (w < 0) {
        mutex.add(key(a, b));
      } else if (!mutex.contains(key(a, b))) {
        for (int i = 0; i < n; i++) {
          if (cluster[i] == b) {
            cluster[i] = a;
          }
        }
        Set<Long> renamed = new HashSet<>();
        for (long k : mutex) {
          int x = (int) (k >>> 32);
          int y = (int) k;
          renamed.add(key(x == b ? a : x, y == b ? a : y));
        }
        mutex = renamed;
      }
    }
    return Clustering.fromRepresentatives(cluster);
  }

  private static long key(int a, int b) {
    return (long) Math.min(a, b) << 32 | Math.max(a, b);
  }
}
