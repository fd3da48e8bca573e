package org.sunder.spark.report;

import java.awt.image.BufferedImage;

/**
 * Draws one {@link Plane}: the boundary map in grey (white inside objects, dark on predicted
 * boundaries), labels blended over it in distinct colours (label 0 left grey), and the block
 * faces as thin lines. Each voxel becomes {@code scale} pixels across and {@code rowScale} down
 * (more down than across for sections cut thicker than the in-plane resolution). O(pixels).
 */
final class SlicePicture {
  /** Share of a label's colour in a voxel's pixel. */
  static final double OVERLAY = 0.5;
  private static final int FACE_RGB = 0xffd21e;

  private SlicePicture() {}

  /**
   * @param boundary boundary map in box order (values in [0, 1])
   * @param labels labels in box order, coloured where non-zero and where {@code shown} allows
   * @param shown labels in box order that decide where colour is drawn (colour only where
   *     {@code shown[i] == shownLabel}), or {@code null} to colour every non-zero label
   * @param blockShape block core shape (memory order) for the face lines, or {@code null}
   */
  static BufferedImage render(Plane plane, float[] boundary, long[] labels, long[] shown,
      long shownLabel, int[] blockShape, int scale) {
    return render(plane, boundary, labels, shown, shownLabel, blockShape, scale, scale);
  }

  /** As {@link #render(Plane, float[], long[], long[], long, int[], int)}, rows {@code rowScale} pixels high. */
  static BufferedImage render(Plane plane, float[] boundary, long[] labels, long[] shown,
      long shownLabel, int[] blockShape, int scale, int rowScale) {
    int w = plane.width();
    int h = plane.height();
    BufferedImage image = new BufferedImage(w * scale, h * rowScale, BufferedImage.TYPE_INT_RGB);
    int ca = plane.columnAxis();
    int ra = plane.rowAxis();
    for (int r = 0; r < h; r++) {
      boolean faceRow = blockShape != null && isFace(plane.min()[ra] + r, blockShape[ra]);
      for (int c = 0; c < w; c++) {
        int i = plane.index(c, r);
        int grey = (int) Math.round(255 * (1 - Math.min(1f, Math.max(0f, boundary[i]))));
        int rgb = grey << 16 | grey << 8 | grey;
        boolean coloured = labels[i] != 0 && (shown == null || shown[i] == shownLabel);
        if (coloured) {
          rgb = blend(rgb, colour(labels[i]), OVERLAY);
        }
        boolean faceColumn = blockShape != null && isFace(plane.min()[ca] + c, blockShape[ca]);
        for (int dy = 0; dy < rowScale; dy++) {
          for (int dx = 0; dx < scale; dx++) {
            boolean line = (faceColumn && dx == 0) || (faceRow && dy == 0);
            image.setRGB(c * scale + dx, r * rowScale + dy, line ? FACE_RGB : rgb);
          }
        }
      }
    }
    return image;
  }

  /** Whether a block face lies just before voxel {@code x} (blocks start at 0). */
  static boolean isFace(long x, int blockSide) {
    return x > 0 && x % blockSide == 0;
  }

  /**
   * A colour for {@code label}: hue from a mixing hash of the label (neighbouring labels get
   * unrelated hues), saturation and brightness high enough to stand out from the grey.
   */
  static int colour(long label) {
    long h = label * 0x9E3779B97F4A7C15L;
    h ^= h >>> 31;
    h *= 0xBF58476D1CE4E5B9L;
    h ^= h >>> 29;
    float hue = (h >>> 40) / (float) (1L << 24);
    float saturation = 0.65f + 0.35f * ((h >>> 8) & 0xff) / 255f;
    float brightness = 0.75f + 0.25f * ((h >>> 16) & 0xff) / 255f;
    return java.awt.Color.HSBtoRGB(hue, saturation, brightness) & 0xffffff;
  }

  static int blend(int base, int over, double share) {
    int r = (int) Math.round(((base >> 16) & 0xff) * (1 - share) + ((over >> 16) & 0xff) * share);
    int g = (int) Math.round(((base >> 8) & 0xff) * (1 - share) + ((over >> 8) & 0xff) * share);
    int b = (int) Math.round((base & 0xff) * (1 - share) + (over & 0xff) * share);
    return r << 16 | g << 8 | b;
  }

  /** The integer scale that makes {@code side} voxels at least {@code pixels} wide (at most 8). */
  static int scaleFor(int side, int pixels) {
    return Math.max(1, Math.min(8, (pixels + side - 1) / side));
  }
}
