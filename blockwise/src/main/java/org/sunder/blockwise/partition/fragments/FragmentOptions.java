package org.sunder.blockwise.partition.fragments;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonIgnore;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.partition.PartitionConfigException;

/**
 * How {@link WatershedFragments} over-segments a block. In JSON (key {@code "fragments"} of the
 * partition configuration), every key optional:
 * <pre>{@code {"boundaryThreshold": 0.5, "seedSmoothing": 1.0, "voxelSize": [40, 4, 4],
 *  "perSlice": false}}</pre>
 * where {@code voxelSize} is in <b>zyx</b> order, as configuration files are.
 *
 * <ul>
 *   <li>{@code boundaryThreshold}: voxels whose boundary value is below it are object interior;
 *       seeds lie at the maxima of their distance to the rest. In (0, 1]; default 0.5;</li>
 *   <li>{@code seedSmoothing}: σ of a Gaussian applied to the distance transform before its
 *       maxima are taken, in the physical units of {@code voxelSize}; 0 for none; default 1;</li>
 *   <li>{@code voxelSize}: physical voxel size per axis (in Java: memory order x, y, z); absent
 *       means isotropic unit voxels of whatever dimension the block has;</li>
 *   <li>{@code perSlice}: fragments per plane of the slowest axis (z), for anisotropic data:
 *       the distance transform, the seeds and the flood stay inside each slice; default
 *       false.</li>
 * </ul>
 * Immutable (arrays copied), serializable.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public final class FragmentOptions implements Serializable {
  private static final long serialVersionUID = 1L;

  private final double boundaryThreshold;
  private final double seedSmoothing;
  private final double[] voxelSize;
  private final boolean perSlice;

  /**
   * Options with {@code voxelSize} in memory order (copied; null = isotropic).
   *
   * @throws PartitionConfigException (INVALID_CONFIG) naming the key of a value out of range
   */
  public FragmentOptions(double boundaryThreshold, double seedSmoothing, double[] voxelSize,
      boolean perSlice) {
    if (!(boundaryThreshold > 0 && boundaryThreshold <= 1)) {
      throw invalid("fragments.boundaryThreshold: " + boundaryThreshold
          + "; expected a number in (0, 1]");
    }
    if (!(seedSmoothing >= 0) || Double.isInfinite(seedSmoothing)) {
      throw invalid("fragments.seedSmoothing: " + seedSmoothing
          + "; expected a finite number >= 0");
    }
    if (voxelSize != null) {
      voxelSize = voxelSize.clone();
      for (double s : voxelSize) {
        if (!(s > 0) || Double.isInfinite(s)) {
          throw invalid("fragments.voxelSize: " + Arrays.toString(voxelSize)
              + " (memory order); expected finite numbers > 0");
        }
      }
      if (voxelSize.length == 0) {
        throw invalid("fragments.voxelSize: empty; expected one value per axis");
      }
    }
    this.boundaryThreshold = boundaryThreshold;
    this.seedSmoothing = seedSmoothing;
    this.voxelSize = voxelSize;
    this.perSlice = perSlice;
  }

  /** Reads the JSON form; {@code voxelSize} in zyx order; missing keys take their defaults. */
  @JsonCreator
  public static FragmentOptions fromJson(
      @JsonProperty("boundaryThreshold") Double boundaryThreshold,
      @JsonProperty("seedSmoothing") Double seedSmoothing,
      @JsonProperty("voxelSize") double[] voxelSizeZyx,
      @JsonProperty("perSlice") Boolean perSlice) {
    return new FragmentOptions(boundaryThreshold != null ? boundaryThreshold : 0.5,
        seedSmoothing != null ? seedSmoothing : 1.0,
        voxelSizeZyx == null ? null : reversed(voxelSizeZyx), perSlice != null && perSlice);
  }

  /** Threshold 0.5, smoothing σ = 1, isotropic unit voxels, 3D flooding. */
  public static FragmentOptions defaults() {
    return new FragmentOptions(0.5, 1.0, null, false);
  }

  /**
   * The defaults fitted to data of this voxel size (memory order): the voxel size is used for
   * the distance transform, and 3D data is made into fragments per slice of the slowest axis
   * when that axis is at least {@value #SLICE_ANISOTROPY} times coarser than the finest other
   * axis (sections cut thicker than the in-plane resolution, where 3D flooding leaks between
   * sections).
   */
  public static FragmentOptions fittedTo(double[] voxelSize) {
    FragmentOptions checked = new FragmentOptions(0.5, 1.0, voxelSize, false);
    return new FragmentOptions(0.5, 1.0, voxelSize, isSliced(checked.voxelSize));
  }

  /** {@link #fittedTo} for a voxel size written slowest axis first, as configuration is. */
  public static FragmentOptions fittedToZyx(double[] voxelSizeZyx) {
    return fittedTo(reversed(voxelSizeZyx));
  }

  /** Slowest axis over finest other axis at which {@link #fittedTo} floods per slice. */
  public static final double SLICE_ANISOTROPY = 2.0;

  /** Whether voxels of this size (fastest axis first) are sections cut thicker than wide. */
  static boolean isSliced(double[] voxelSize) {
    int slow = voxelSize.length - 1;
    double finestOther = Double.POSITIVE_INFINITY;
    for (int d = 0; d < slow; d++) {
      finestOther = Math.min(finestOther, voxelSize[d]);
    }
    return slow >= 2 && voxelSize[slow] >= SLICE_ANISOTROPY * finestOther;
  }

  /** The same options with an explicit voxel size for {@code dims} axes. */
  public FragmentOptions forDimension(int dims) {
    if (voxelSize == null) {
      double[] unit = new double[dims];
      Arrays.fill(unit, 1.0);
      return new FragmentOptions(boundaryThreshold, seedSmoothing, unit, perSlice);
    }
    if (voxelSize.length != dims) {
      throw invalid("fragments.voxelSize: " + voxelSize.length + " values but the data has "
          + dims + " spatial axes");
    }
    return this;
  }

  /** The axis whose planes are processed apart ({@code dims − 1}), or −1. */
  @JsonIgnore
  public int sliceAxis() {
    if (!perSlice) {
      return -1;
    }
    if (voxelSize == null) {
      throw new IllegalStateException("slice axis of options without a dimension");
    }
    return voxelSize.length - 1;
  }

  @JsonProperty("boundaryThreshold")
  public double boundaryThreshold() {
    return boundaryThreshold;
  }

  @JsonProperty("seedSmoothing")
  public double seedSmoothing() {
    return seedSmoothing;
  }

  /** A copy of the voxel size in memory order, or null for isotropic. */
  @JsonIgnore
  public double[] voxelSize() {
    return voxelSize == null ? null : voxelSize.clone();
  }

  /** The voxel size in zyx order (as written in configuration), or null. */
  @JsonProperty("voxelSize")
  public double[] voxelSizeZyx() {
    return voxelSize == null ? null : reversed(voxelSize);
  }

  @JsonProperty("perSlice")
  public boolean perSlice() {
    return perSlice;
  }

  private static double[] reversed(double[] values) {
    double[] r = new double[values.length];
    for (int i = 0; i < values.length; i++) {
      r[i] = values[values.length - 1 - i];
    }
    return r;
  }

  private static PartitionConfigException invalid(String message) {
    return new PartitionConfigException(ErrorKind.INVALID_CONFIG, message);
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof FragmentOptions o && o.boundaryThreshold == boundaryThreshold
        && o.seedSmoothing == seedSmoothing && Arrays.equals(o.voxelSize, voxelSize)
        && o.perSlice == perSlice;
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(new double[] {boundaryThreshold, seedSmoothing}) * 961
        + Arrays.hashCode(voxelSize) * 31 + Boolean.hashCode(perSlice);
  }

  @Override
  public String toString() {
    return "FragmentOptions[boundaryThreshold=" + boundaryThreshold + ", seedSmoothing="
        + seedSmoothing + ", voxelSize(xyz)=" + Arrays.toString(voxelSize) + ", perSlice="
        + perSlice + "]";
  }
}
