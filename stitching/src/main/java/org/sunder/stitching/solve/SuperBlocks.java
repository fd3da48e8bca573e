package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;

/**
 * The super-blocks of each level of a hierarchical solve: at level {@code l >= 1} a super-block
 * is a box of {@code factor^l} blocks per axis (cut off at the grid's upper border), numbered
 * with dimension 0 fastest. Level {@code l + 1}'s super-blocks are unions of level {@code l}'s,
 * so a node stays in one part per level. An immutable value.
 */
public final class SuperBlocks implements Serializable {
  private static final long serialVersionUID = 1L;
  private final long[] gridShape;
  private final long[][] blockPositions;
  private final int factor;
  private final IdLayout layout;
  /**
   * Per level, {@link #partsOfBlocks} of it, made on first use (null until then); replaced, not
   * written, when a level is added, so a thread that reads the field sees whole arrays.
   */
  private transient volatile int[][] partsByLevel;

  public SuperBlocks(BlockGrid grid, IdLayout layout, int factor) {
    if (factor < 2) {
      throw new IllegalArgumentException("super-block factor " + factor
          + " blocks per axis; expected at least 2");
    }
    this.gridShape = grid.gridShape();
    this.blockPositions = new long[grid.blockCount()][];
    for (int b = 0; b < grid.blockCount(); b++) {
      blockPositions[b] = grid.gridPosition(b);
    }
    this.factor = factor;
    this.layout = layout;
  }

  public int factor() {
    return factor;
  }

  public IdLayout layout() {
    return layout;
  }

  /** Blocks per axis in one super-block of {@code level}. */
  private long span(int level) {
    long span = 1;
    for (int l = 0; l < level; l++) {
      span = Math.min(span * factor, Long.MAX_VALUE / factor);
    }
    return span;
  }

  /** The number of super-blocks at {@code level}. */
  public int partCount(int level) {
    long span = span(level);
    long count = 1;
    for (long s : gridShape) {
      count *= (s + span - 1) / span;
    }
    return Math.toIntExact(count);
  }

  /** The super-block of {@code level} holding block {@code block}. */
  public int partOfBlock(int block, int level) {
    long span = span(level);
    long index = 0;
    long stride = 1;
    long[] position = blockPositions[block];
    for (int d = 0; d < gridShape.length; d++) {
      index += position[d] / span * stride;
      stride *= (gridShape[d] + span - 1) / span;
    }
    return (int) index;
  }

  /**
   * The super-block of {@code level} holding the segment with provisional id {@code node}: one
   * array read, the level's table of blocks' super-blocks made on first use (O(blocks), 4 bytes
   * per block and level).
   */
  public int partOfNode(long node, int level) {
    return partsOf(level)[layout.blockOf(node)];
  }

  /** {@link #partsOfBlocks} of {@code level}, kept; the caller must not write it. */
  private int[] partsOf(int level) {
    int[][] table = partsByLevel;
    if (table != null && level < table.length && table[level] != null) {
      return table[level];
    }
    if (level < 0) {
      throw new IllegalArgumentException("level " + level + ": levels start at 0 (the blocks)");
    }
    synchronized (this) {
      table = partsByLevel;
      int[][] grown = table == null ? new int[level + 1][]
          : Arrays.copyOf(table, Math.max(table.length, level + 1));
      if (grown[level] == null) {
        grown[level] = partsOfBlocks(level);
      }
      partsByLevel = grown;
      return grown[level];
    }
  }

  /**
   * The super-blocks of {@code level - 1} inside super-block {@code part} of {@code level}
   * ({@code level >= 2}), ascending. O(factor^n), from the grid's shape alone.
   */
  public int[] subParts(int level, int part) {
    if (level < 2) {
      throw new IllegalArgumentException("level " + level + ": sub-parts exist from level 2");
    }
    int n = gridShape.length;
    long span = span(level);
    long below = span(level - 1);
    long[] subCounts = new long[n];
    long[] first = new long[n];
    long[] end = new long[n];
    long rest = part;
    int total = 1;
    for (int d = 0; d < n; d++) {
      long counts = (gridShape[d] + span - 1) / span;
      subCounts[d] = (gridShape[d] + below - 1) / below;
      first[d] = rest % counts * factor;
      rest /= counts;
      end[d] = Math.min(first[d] + factor, subCounts[d]);
      total *= (int) (end[d] - first[d]);
    }
    int[] out = new int[total];
    long[] at = first.clone();
    for (int i = 0; i < total; i++) {
      long index = 0;
      for (int d = n - 1; d >= 0; d--) {
        index = index * subCounts[d] + at[d];
      }
      out[i] = (int) index;
      for (int d = 0; d < n; d++) {
        if (++at[d] < end[d]) {
          break;
        }
        at[d] = first[d];
      }
    }
    return out;
  }

  /** Per block, its super-block at {@code level}. */
  public int[] partsOfBlocks(int level) {
    int[] parts = new int[blockPositions.length];
    for (int b = 0; b < parts.length; b++) {
      parts[b] = partOfBlock(b, level);
    }
    return parts;
  }
}
