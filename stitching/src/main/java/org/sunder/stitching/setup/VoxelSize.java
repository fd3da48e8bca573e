package org.sunder.stitching.setup;

import java.util.List;
import java.util.Map;

/**
 * The physical size of the input's voxels, read from its affinity dataset's attributes, in
 * memory order (x first). The default configuration fits its fragments to it (per-slice
 * flooding of anisotropic data, the size filter's ball), and the pyramid and the report keep
 * the voxels' proportions. Accepted, first match wins:
 *
 * <ul>
 *   <li>{@code "voxelSize"}: slowest axis first, in the order of the dataset's {@code "axes"}
 *       letters (for example {@code "zyx"}), else in the configuration's axis order (what this
 *       tool's own containers and synthetic volumes write);
 *   <li>{@code "resolution"}: memory order, x first (the N5 convention);
 *   <li>{@code "pixelResolution": {"dimensions": [...]}}: memory order, x first (the older N5
 *       convention).
 * </ul>
 * A list with another number of entries than spatial axes, or an entry that is not a positive
 * finite number, does not count.
 */
public final class VoxelSize {
  private static final String MEMORY_LETTERS = "xyz";

  private VoxelSize() {}

  /**
   * The voxel size in memory order, or null when no attribute gives one.
   *
   * @param spatialAxes 2 or 3
   * @param configAxes the configuration's axis letters, slowest first (e.g. {@code "zyx"})
   */
  public static double[] fromAttributes(Map<String, Object> attributes, int spatialAxes,
      String configAxes) {
    double[] own = slowestFirstList(attributes.get("voxelSize"), spatialAxes,
        attributes.get("axes") instanceof String a ? a : configAxes);
    if (own != null) {
      return own;
    }
    double[] n5 = positive(attributes.get("resolution"), spatialAxes);
    if (n5 != null) {
      return n5;
    }
    return attributes.get("pixelResolution") instanceof Map<?, ?> pixel
        ? positive(pixel.get("dimensions"), spatialAxes) : null;
  }

  private static double[] slowestFirstList(Object value, int spatialAxes, String letters) {
    double[] listed = positive(value, spatialAxes);
    if (listed == null || letters.length() != spatialAxes) {
      return null;
    }
    double[] memory = new double[spatialAxes];
    for (int d = 0; d < spatialAxes; d++) {
      int at = letters.indexOf(MEMORY_LETTERS.charAt(d));
      if (at < 0) {
        return null;
      }
      memory[d] = listed[at];
    }
    return memory;
  }

  private static double[] positive(Object value, int count) {
    if (!(value instanceof List<?> list) || list.size() != count) {
      return null;
    }
    double[] out = new double[count];
    for (int i = 0; i < count; i++) {
      if (!(list.get(i) instanceof Number n) || !(n.doubleValue() > 0)
          || Double.isInfinite(n.doubleValue())) {
        return null;
      }
      out[i] = n.doubleValue();
    }
    return out;
  }
}
