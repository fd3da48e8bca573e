package org.sunder.stitching.task;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The viewer metadata of a label pyramid, after the OME-NGFF 0.4 specification ("Next-generation
 * file formats for bioimaging", 2021; version 0.4): a {@code multiscales} entry whose axes are
 * the arrays' dimensions as Zarr lists them (slowest first: z, y, x, type {@code space}, with a
 * unit when known) and whose datasets carry one {@code scale} transformation each (the level's
 * voxel size), plus {@code image-label} (version 0.4). Written on the group that holds the
 * levels; N5 containers get the same description in their attributes.
 */
public final class MultiscaleMetadata {
  /** The specification version written. */
  public static final String VERSION = "0.4";

  private MultiscaleMetadata() {}

  /**
   * The attributes to merge into the group's.
   *
   * @param name the multiscale image's name (the segmentation dataset's)
   * @param levelPaths per level, the dataset's path relative to the group
   * @param unit the voxel size's unit as the input names it ({@code "nm"}, {@code "nanometer"},
   *     ...), or {@code null}; a unit the specification does not name is left out
   */
  public static Map<String, Object> attributes(LabelPyramid pyramid, List<String> levelPaths,
      String name, String unit) {
    int n = pyramid.chunkShape().length;
    String ucum = unitName(unit);
    List<Object> axes = new ArrayList<>();
    for (int i = 0; i < n; i++) {
      Map<String, Object> axis = new LinkedHashMap<>();
      axis.put("name", String.valueOf("xyzw".charAt(n - 1 - i)));
      axis.put("type", "space");
      if (ucum != null) {
        axis.put("unit", ucum);
      }
      axes.add(axis);
    }
    List<Object> datasets = new ArrayList<>();
    for (int level = 0; level < pyramid.levelCount(); level++) {
      List<Double> scale = new ArrayList<>();
      double[] size = pyramid.voxelSizes()[level];
      for (int i = 0; i < n; i++) {
        scale.add(size[n - 1 - i]);
      }
      Map<String, Object> transformation = new LinkedHashMap<>();
      transformation.put("type", "scale");
      transformation.put("scale", scale);
      Map<String, Object> dataset = new LinkedHashMap<>();
      dataset.put("path", levelPaths.get(level));
      dataset.put("coordinateTransformations", List.of(transformation));
      datasets.add(dataset);
    }
    Map<String, Object> multiscale = new LinkedHashMap<>();
    multiscale.put("version", VERSION);
    multiscale.put("name", name);
    multiscale.put("axes", axes);
    multiscale.put("datasets", datasets);
    multiscale.put("type", "mode");
    multiscale.put("metadata", Map.of("description", "each voxel of a coarser level takes the most"
        + " frequent label of the voxels it covers (ties to the smallest)"));
    Map<String, Object> attributes = new LinkedHashMap<>();
    attributes.put("multiscales", List.of(multiscale));
    attributes.put("image-label", Map.of("version", VERSION));
    return attributes;
  }

  /**
   * The specification's name for a length unit ({@code "nm"} -> {@code "nanometer"}), the name
   * itself when the specification lists it, else {@code null}.
   */
  static String unitName(String unit) {
    if (unit == null) {
      return null;
    }
    String u = unit.strip();
    return switch (u) {
      case "nm" -> "nanometer";
      case "um", "µm", "μm" -> "micrometer";
      case "mm" -> "millimeter";
      case "cm" -> "centimeter";
      case "m" -> "meter";
      case "pm" -> "picometer";
      case "A", "Å" -> "angstrom";
      default -> LENGTH_UNITS.contains(u.toLowerCase(Locale.ROOT)) ? u.toLowerCase(Locale.ROOT)
          : null;
    };
  }

  /** The space units the specification lists (UDUNITS-2 names). */
  static final List<String> LENGTH_UNITS = List.of("angstrom", "attometer", "centimeter",
      "decimeter", "exameter", "femtometer", "foot", "gigameter", "hectometer", "inch",
      "kilometer", "megameter", "meter", "micrometer", "mile", "millimeter", "nanometer",
      "parsec", "petameter", "picometer", "terameter", "yard", "yoctometer", "yottameter",
      "zeptometer", "zettameter");
}
