package org.sunder.blockwise.synth;

import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * Parameters of a synthetic ground-truth volume ({@link SyntheticVolume}). Lengths are physical
 * (nanometres), so the same spec gives the same tissue at another voxel size. Arrays are in
 * memory order (x, y, z); {@link #toAttributes()} writes them slowest axis first (z, y, x).
 *
 * @param seed everything random derives from it
 * @param shape voxels along x, y, z; at most {@code 2^31 - 1} voxels in all (built in memory)
 * @param voxelSize nanometres per voxel along x, y, z (anisotropic allowed)
 * @param fibreCount how many branching fibres (neurite-like tubes) start in the volume
 * @param fibreRadiusMin smallest base radius of a fibre, nm
 * @param fibreRadiusMax largest base radius of a fibre, nm
 * @param tortuosity standard deviation of the direction change per step (about radians)
 * @param branchProbability chance per step that a fibre grows a side branch
 * @param cellCount how many compact cells (ellipsoids)
 * @param cellRadiusMin smallest cell radius, nm
 * @param cellRadiusMax largest cell radius, nm
 * @param bodyCount how many large bodies (spheres the fibres wrap around)
 * @param bodyRadiusMin smallest body radius, nm
 * @param bodyRadiusMax largest body radius, nm
 * @param background if true, voxels farther than {@code fillDistance} from every object stay
 *     label 0; if false, every voxel belongs to an object
 * @param fillDistance how far, nm, objects grow into the space between them before the
 *     remainder is background (or filled by growth when there is no background)
 * @param minObjectVoxels connected pieces smaller than this join their most-touching neighbour
 */
public record SynthSpec(long seed, long[] shape, double[] voxelSize, int fibreCount,
    double fibreRadiusMin, double fibreRadiusMax, double tortuosity, double branchProbability,
    int cellCount, double cellRadiusMin, double cellRadiusMax, int bodyCount,
    double bodyRadiusMin, double bodyRadiusMax, boolean background, double fillDistance,
    int minObjectVoxels) {

  public SynthSpec {
    shape = Objects.requireNonNull(shape, "shape").clone();
    voxelSize = Objects.requireNonNull(voxelSize, "voxelSize").clone();
    validate(shape, voxelSize, fibreCount, fibreRadiusMin, fibreRadiusMax, tortuosity,
        branchProbability, cellCount, cellRadiusMin, cellRadiusMax, bodyCount, bodyRadiusMin,
        bodyRadiusMax, fillDistance, minObjectVoxels);
  }

  /**
   * A small dense volume (64 x 56 x 20 voxels of 8 x 8 x 24 nm, x y z): 40 fibres, 4 cells,
   * 1 body, no background (with background on, about 8% of voxels are background). Generates
   * in well under a second.
   */
  public static SynthSpec small(long seed) {
    return new SynthSpec(seed, new long[] {64, 56, 20}, new double[] {8, 8, 24}, 40, 18, 36,
        0.35, 0.03, 4, 55, 80, 1, 120, 150, false, 32, 30);
  }

  /**
   * The same tissue at another shape (memory order): cell and body counts scale with the
   * physical volume, fibre counts with its two-thirds power (fibres cross the whole volume, so
   * their number per cross-section stays the same), keeping the packing as dense.
   */
  public SynthSpec scaledTo(long... newShape) {
    SynthSpec resized = withShape(newShape);
    double ratio = (double) resized.voxelCount() / voxelCount();
    return resized.withCounts((int) Math.max(1, Math.round(fibreCount * Math.pow(ratio, 2.0 / 3))),
        (int) Math.round(cellCount * ratio), (int) Math.round(bodyCount * ratio));
  }

  /** The same spec with another shape (memory order). */
  public SynthSpec withShape(long... newShape) {
    return new SynthSpec(seed, newShape, voxelSize, fibreCount, fibreRadiusMin, fibreRadiusMax,
        tortuosity, branchProbability, cellCount, cellRadiusMin, cellRadiusMax, bodyCount,
        bodyRadiusMin, bodyRadiusMax, background, fillDistance, minObjectVoxels);
  }

  /** The same spec with background on or off. */
  public SynthSpec withBackground(boolean on) {
    return new SynthSpec(seed, shape, voxelSize, fibreCount, fibreRadiusMin, fibreRadiusMax,
        tortuosity, branchProbability, cellCount, cellRadiusMin, cellRadiusMax, bodyCount,
        bodyRadiusMin, bodyRadiusMax, on, fillDistance, minObjectVoxels);
  }

  /** The same spec with other object counts. */
  public SynthSpec withCounts(int fibres, int cells, int bodies) {
    return new SynthSpec(seed, shape, voxelSize, fibres, fibreRadiusMin, fibreRadiusMax,
        tortuosity, branchProbability, cells, cellRadiusMin, cellRadiusMax, bodies,
        bodyRadiusMin, bodyRadiusMax, background, fillDistance, minObjectVoxels);
  }

  /** The same spec with another seed. */
  public SynthSpec withSeed(long newSeed) {
    return new SynthSpec(newSeed, shape, voxelSize, fibreCount, fibreRadiusMin, fibreRadiusMax,
        tortuosity, branchProbability, cellCount, cellRadiusMin, cellRadiusMax, bodyCount,
        bodyRadiusMin, bodyRadiusMax, background, fillDistance, minObjectVoxels);
  }

  @Override
  public long[] shape() {
    return shape.clone();
  }

  @Override
  public double[] voxelSize() {
    return voxelSize.clone();
  }

  /** The number of voxels. */
  public int voxelCount() {
    return (int) (shape[0] * shape[1] * shape[2]);
  }

  /**
   * The spec as dataset attributes: JSON-ready values, shape and voxel size in z, y, x order
   * (key {@code "axes": "zyx"}), lengths in nm ({@code "unit": "nm"}).
   */
  public Map<String, Object> toAttributes() {
    Map<String, Object> m = new LinkedHashMap<>();
    m.put("axes", "zyx");
    m.put("unit", "nm");
    m.put("seed", seed);
    m.put("shape", List.of(shape[2], shape[1], shape[0]));
    m.put("voxelSize", List.of(voxelSize[2], voxelSize[1], voxelSize[0]));
    m.put("fibreCount", fibreCount);
    m.put("fibreRadiusMin", fibreRadiusMin);
    m.put("fibreRadiusMax", fibreRadiusMax);
    m.put("tortuosity", tortuosity);
    m.put("branchProbability", branchProbability);
    m.put("cellCount", cellCount);
    m.put("cellRadiusMin", cellRadiusMin);
    m.put("cellRadiusMax", cellRadiusMax);
    m.put("bodyCount", bodyCount);
    m.put("bodyRadiusMin", bodyRadiusMin);
    m.put("bodyRadiusMax", bodyRadiusMax);
    m.put("background", background);
    m.put("fillDistance", fillDistance);
    m.put("minObjectVoxels", minObjectVoxels);
    return m;
  }

  /**
   * Reads what {@link #toAttributes()} wrote (also after a JSON round trip).
   *
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} naming a missing or malformed key
   */
  public static SynthSpec fromAttributes(Map<String, ?> m) {
    AttributeReader r = new AttributeReader("synthetic volume attributes", m);
    if (!"zyx".equals(m.get("axes"))) {
      throw new SunderException(ErrorKind.INVALID_INPUT,
          "synthetic volume attributes: key \"axes\" must be \"zyx\", got " + m.get("axes"));
    }
    long[] zyx = r.longs("shape", 3);
    double[] sizeZyx = r.doubles("voxelSize", 3);
    return new SynthSpec(r.longValue("seed"), new long[] {zyx[2], zyx[1], zyx[0]},
        new double[] {sizeZyx[2], sizeZyx[1], sizeZyx[0]}, r.intValue("fibreCount"),
        r.doubleValue("fibreRadiusMin"), r.doubleValue("fibreRadiusMax"),
        r.doubleValue("tortuosity"), r.doubleValue("branchProbability"),
        r.intValue("cellCount"), r.doubleValue("cellRadiusMin"),
        r.doubleValue("cellRadiusMax"), r.intValue("bodyCount"),
        r.doubleValue("bodyRadiusMin"), r.doubleValue("bodyRadiusMax"),
        r.booleanValue("background"), r.doubleValue("fillDistance"),
        r.intValue("minObjectVoxels"));
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof SynthSpec s && s.seed == seed && Arrays.equals(s.shape, shape)
        && Arrays.equals(s.voxelSize, voxelSize) && s.fibreCount == fibreCount
        && s.fibreRadiusMin == fibreRadiusMin && s.fibreRadiusMax == fibreRadiusMax
        && s.tortuosity == tortuosity && s.branchProbability == branchProbability
        && s.cellCount == cellCount && s.cellRadiusMin == cellRadiusMin
        && s.cellRadiusMax == cellRadiusMax && s.bodyCount == bodyCount
        && s.bodyRadiusMin == bodyRadiusMin && s.bodyRadiusMax == bodyRadiusMax
        && s.background == background && s.fillDistance == fillDistance
        && s.minObjectVoxels == minObjectVoxels;
  }

  @Override
  public int hashCode() {
    return Objects.hash(seed, Arrays.hashCode(shape), Arrays.hashCode(voxelSize), fibreCount,
        fibreRadiusMin, fibreRadiusMax, cellCount, bodyCount, background, fillDistance);
  }

  @Override
  public String toString() {
    return "SynthSpec" + toAttributes();
  }

  private static void validate(long[] shape, double[] voxelSize, int fibreCount,
      double fibreRadiusMin, double fibreRadiusMax, double tortuosity, double branchProbability,
      int cellCount, double cellRadiusMin, double cellRadiusMax, int bodyCount,
      double bodyRadiusMin, double bodyRadiusMax, double fillDistance, int minObjectVoxels) {
    require(shape.length == 3, "shape", "3 sizes (x, y, z)", Arrays.toString(shape));
    require(voxelSize.length == 3, "voxelSize", "3 sizes (x, y, z)",
        Arrays.toString(voxelSize));
    long voxels = 1;
    for (int d = 0; d < 3; d++) {
      require(shape[d] >= 1 && shape[d] <= Integer.MAX_VALUE, "shape", "sizes >= 1",
          Arrays.toString(shape));
      require(voxelSize[d] > 0 && Double.isFinite(voxelSize[d]), "voxelSize",
          "finite sizes > 0", Arrays.toString(voxelSize));
      voxels *= shape[d];
      require(voxels <= Integer.MAX_VALUE, "shape", "at most 2^31 - 1 voxels",
          Arrays.toString(shape));
    }
    require(fibreCount >= 0 && cellCount >= 0 && bodyCount >= 0, "fibreCount/cellCount/bodyCount",
        "counts >= 0", fibreCount + "/" + cellCount + "/" + bodyCount);
    require(fibreCount + cellCount + bodyCount >= 1, "fibreCount/cellCount/bodyCount",
        "at least one object", "none");
    radii("fibreRadius", fibreRadiusMin, fibreRadiusMax);
    radii("cellRadius", cellRadiusMin, cellRadiusMax);
    radii("bodyRadius", bodyRadiusMin, bodyRadiusMax);
    require(tortuosity >= 0 && tortuosity <= 10, "tortuosity", "a value in [0, 10]",
        "" + tortuosity);
    require(branchProbability >= 0 && branchProbability <= 0.5, "branchProbability",
        "a probability in [0, 0.5]", "" + branchProbability);
    require(fillDistance >= 0 && Double.isFinite(fillDistance), "fillDistance",
        "a finite distance >= 0", "" + fillDistance);
    require(minObjectVoxels >= 1, "minObjectVoxels", "a count >= 1", "" + minObjectVoxels);
  }

  private static void radii(String key, double min, double max) {
    require(min > 0 && max >= min && Double.isFinite(max), key + "Min/" + key + "Max",
        "0 < min <= max", min + "/" + max);
  }

  private static void require(boolean ok, String key, String expected, String got) {
    if (!ok) {
      throw new SunderException(ErrorKind.INVALID_CONFIG,
          "synthetic spec: " + key + " must be " + expected + ", got " + got);
    }
  }
}
