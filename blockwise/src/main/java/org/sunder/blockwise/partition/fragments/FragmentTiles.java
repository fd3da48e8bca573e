package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;

/**
 * Fragments confined to the tiles of a fixed grid over the volume (tile {@code k} along axis
 * {@code d} covers {@code [k·tile[d], (k+1)·tile[d])}): the watershed runs on each tile's part of
 * a box on its own, so no fragment crosses a tile face. A tile lying wholly inside a box, and
 * with neighbours in the box wherever the volume has them, gets the same fragments from every
 * box that holds it: with tiles on the block grid, each block's core is such a tile, and a
 * blockwise run's fragments are those of every other blockwise run on the same grid.
 * O(box voxels) beyond the watershed of the pieces.
 */
final class FragmentTiles {
  private FragmentTiles() {}

  /**
   * Fragment labels of the box at {@code globalMin} ({@code boundary} and {@code mask} over
   * {@code shape}, memory order; mask may be null): consecutive from 1 in order of first voxel,
   * 0 for masked voxels.
   */
  static int[] label(WatershedFragments watershed, float[] boundary, int[] shape, byte[] mask,
      long[] globalMin, int[] tileShape, int[] margin) {
    int n = shape.length;
    if (tileShape.length != n || globalMin.length != n) {
      throw new IllegalArgumentException("tile shape " + Arrays.toString(tileShape)
          + " or box origin " + Arrays.toString(globalMin) + " does not match the box "
          + Arrays.toString(shape));
    }
    int[][] starts = new int[n][];
    for (int d = 0; d < n; d++) {
      starts[d] = pieceStarts(globalMin[d], shape[d], tileShape[d]);
    }
    int[] labels = new int[VoxelBox.size(shape)];
    int[] strides = VoxelBox.strides(shape);
    int[] piece = new int[n];
    int[] pieceMin = new int[n];
    int[] pieceShape = new int[n];
    int[] contextMin = new int[n];
    int[] contextShape = new int[n];
    int[] inContext = new int[n];
    int used = 0;
    while (true) {
      for (int d = 0; d < n; d++) {
        pieceMin[d] = starts[d][piece[d]];
        int end = piece[d] + 1 < starts[d].length ? starts[d][piece[d] + 1] : shape[d];
        pieceShape[d] = end - pieceMin[d];
        contextMin[d] = Math.max(0, pieceMin[d] - margin[d]);
        contextShape[d] = Math.min(shape[d], end + margin[d]) - contextMin[d];
        inContext[d] = pieceMin[d] - contextMin[d];
      }
      float[] contextBoundary = new float[VoxelBox.size(contextShape)];
      byte[] contextMask = mask == null ? null : new byte[contextBoundary.length];
      copy(contextMin, contextShape, strides, (from, to, length) -> {
        System.arraycopy(boundary, from, contextBoundary, to, length);
        if (mask != null) {
          System.arraycopy(mask, from, contextMask, to, length);
        }
      });
      int[] contextLabels = watershed.label(contextBoundary, contextShape, contextMask);
      int[] pieceLabels = new int[VoxelBox.size(pieceShape)];
      copy(inContext, pieceShape, VoxelBox.strides(contextShape), (from, to, length) ->
          System.arraycopy(contextLabels, from, pieceLabels, to, length));
      WatershedFragments.consecutive(pieceLabels);
      int base = used;
      int largest = 0;
      for (int l : pieceLabels) {
        largest = Math.max(largest, l);
      }
      used += largest;
      copy(pieceMin, pieceShape, strides, (from, to, length) -> {
        for (int i = 0; i < length; i++) {
          int l = pieceLabels[to + i];
          labels[from + i] = l == 0 ? 0 : l + base;
        }
      });
      int d = 0;
      while (d < n && ++piece[d] == starts[d].length) {
        piece[d++] = 0;
      }
      if (d == n) {
        break;
      }
    }
    return WatershedFragments.consecutive(labels);
  }

  /** Where the pieces of an axis start, box coordinates: 0 and every tile face inside it. */
  static int[] pieceStarts(long globalMin, int size, int tile) {
    if (tile <= 0) {
      throw new IllegalArgumentException("tile size " + tile + "; expected > 0");
    }
    int first = (int) (Math.floorMod(-globalMin, (long) tile));
    int count = 1;
    for (int p = first == 0 ? tile : first; p < size; p += tile) {
      count++;
    }
    int[] starts = new int[count];
    int k = 1;
    for (int p = first == 0 ? tile : first; p < size; p += tile) {
      starts[k++] = p;
    }
    return starts;
  }

  /** A run of {@code length} voxels: index {@code from} in the box, {@code to} in the piece. */
  private interface RowCopy {
    void copy(int from, int to, int length);
  }

  /** Calls {@code row} for every row (axis 0) of the piece, in memory order. */
  private static void copy(int[] pieceMin, int[] pieceShape, int[] strides, RowCopy row) {
    int n = pieceShape.length;
    int[] p = new int[n];
    int rows = VoxelBox.size(pieceShape) / pieceShape[0];
    for (int r = 0; r < rows; r++) {
      int from = pieceMin[0];
      for (int d = 1; d < n; d++) {
        from += (pieceMin[d] + p[d]) * strides[d];
      }
      row.copy(from, r * pieceShape[0], pieceShape[0]);
      for (int d = 1; d < n; d++) {
        if (++p[d] < pieceShape[d]) {
          break;
        }
        p[d] = 0;
      }
    }
  }
}
