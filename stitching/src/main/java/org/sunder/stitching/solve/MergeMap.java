package org.sunder.stitching.solve;

import java.util.Arrays;

/**
 * Nodes whose representative is not themselves, with that representative: one part's merges at
 * one level of a hierarchical solve, or the final representatives of one part's (or block's)
 * nodes. A node absent from the map is its own representative. Lookup O(log n). An immutable
 * value (the arrays are wrapped, not copied; do not change them).
 *
 * @param nodes provisional ids, strictly ascending
 * @param representatives per node, its representative (another provisional id)
 */
public record MergeMap(long[] nodes, long[] representatives) {
  public static final MergeMap EMPTY = new MergeMap(new long[0], new long[0]);

  public MergeMap {
    if (nodes.length != representatives.length) {
      throw new IllegalArgumentException(nodes.length + " nodes but " + representatives.length
          + " representatives");
    }
    for (int i = 1; i < nodes.length; i++) {
      if (nodes[i] <= nodes[i - 1]) {
        throw new IllegalArgumentException("node " + Long.toUnsignedString(nodes[i]) + " at "
            + i + " is not above the one before it");
      }
    }
  }

  /** The map of a part's result (its merged nodes, already ascending). */
  public static MergeMap of(PartResult result) {
    return new MergeMap(result.merged(), result.representative());
  }

  public int size() {
    return nodes.length;
  }

  /** The representative of {@code node} ({@code node} itself when absent). O(log n). */
  public long apply(long node) {
    int at = Arrays.binarySearch(nodes, node);
    return at >= 0 ? representatives[at] : node;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof MergeMap m && Arrays.equals(nodes, m.nodes)
        && Arrays.equals(representatives, m.representatives);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(nodes) * 31 + Arrays.hashCode(representatives);
  }

  @Override
  public String toString() {
    return "MergeMap[" + nodes.length + " nodes]";
  }
}
