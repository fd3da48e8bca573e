package org.sunder.blockwise.partition.fragments;

/**
 * Neighbouring lines of a box along one axis, copied out side by side: a tile holds
 * {@code width} lines of {@code length} values, value {@code q} of line {@code w} at
 * {@code q * width + w}. Lines along a strided axis read one value per cache line, and a
 * power-of-two stride maps all of a line's values to one cache set, so line by line every read
 * missed; a tile reads and writes the box a row of {@code width} values at a time, and its own
 * values lie within {@code length * width} doubles.
 */
final class LineTiles {
  /** Lines per tile: two cache lines of doubles per row of the box. */
  static final int WIDTH = 16;

  private LineTiles() {}

  /**
   * Copies the lines starting at {@code start .. start + width − 1}, {@code stride} apart along
   * the axis, into {@code tile}.
   */
  static void gather(double[] values, int start, int stride, int length, int width,
      double[] tile) {
    for (int q = 0, i = start, at = 0; q < length; q++, i += stride, at += width) {
      for (int w = 0; w < width; w++) {
        tile[at + w] = values[i + w];
      }
    }
  }

  /** The inverse of {@link #gather}: writes the tile's lines back into {@code values}. */
  static void scatter(double[] tile, double[] values, int start, int stride, int length,
      int width) {
    for (int q = 0, i = start, at = 0; q < length; q++, i += stride, at += width) {
      for (int w = 0; w < width; w++) {
        values[i + w] = tile[at + w];
      }
    }
  }
}
