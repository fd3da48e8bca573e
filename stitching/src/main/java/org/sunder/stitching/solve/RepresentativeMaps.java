package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.Arrays;
import java.util.List;

/**
 * The merges of every level of a hierarchical solve, level by level: level {@code l} maps the
 * nodes it merged (the representatives level {@code l - 1} left) to their new representative.
 * A segment's final representative is its id passed through every level in turn.
 *
 * <p>This holds every level's merges in one place, which suits the in-process level driver
 * ({@link HierarchicalSolve}) and tests; the solve of a run resolves the same chain part by part
 * from files, on the way down ({@link LevelTasks#down}). Lookup O(L log k) for L
 * levels of k merges. An immutable value.
 */
public final class RepresentativeMaps implements Serializable {
  private static final long serialVersionUID = 1L;
  private final long[][] merged;
  private final long[][] representative;

  /** One level's merges, from its parts' results in any order. */
  public static long[][] levelOf(List<PartResult> parts) {
    int total = 0;
    for (PartResult p : parts) {
      total += p.merged().length;
    }
    long[] nodes = new long[total];
    long[] reps = new long[total];
    int at = 0;
    for (PartResult p : parts) {
      System.arraycopy(p.merged(), 0, nodes, at, p.merged().length);
      System.arraycopy(p.representative(), 0, reps, at, p.merged().length);
      at += p.merged().length;
    }
    int[] order = EdgeSort.byValue(nodes);
    long[] sortedNodes = new long[total];
    long[] sortedReps = new long[total];
    for (int i = 0; i < total; i++) {
      sortedNodes[i] = nodes[order[i]];
      sortedReps[i] = reps[order[i]];
      if (i > 0 && sortedNodes[i] == sortedNodes[i - 1]) {
        throw new IllegalArgumentException("node " + sortedNodes[i]
            + " was merged by two parts of one level");
      }
    }
    return new long[][] {sortedNodes, sortedReps};
  }

  /** @param levels per level, {@code {merged ascending, representative}} (see {@link #levelOf}) */
  public RepresentativeMaps(List<long[][]> levels) {
    merged = new long[levels.size()][];
    representative = new long[levels.size()][];
    for (int l = 0; l < levels.size(); l++) {
      merged[l] = levels.get(l)[0];
      representative[l] = levels.get(l)[1];
    }
  }

  public int levelCount() {
    return merged.length;
  }

  /** The final representative of {@code node}. */
  public long resolve(long node) {
    long x = node;
    for (int l = 0; l < merged.length; l++) {
      int at = Arrays.binarySearch(merged[l], x);
      if (at >= 0) {
        x = representative[l][at];
      }
    }
    return x;
  }

  /** The final representatives of {@code nodes} (allocates). */
  public long[] resolve(long[] nodes) {
    long[] out = new long[nodes.length];
    for (int i = 0; i < nodes.length; i++) {
      out[i] = resolve(nodes[i]);
    }
    return out;
  }
}
