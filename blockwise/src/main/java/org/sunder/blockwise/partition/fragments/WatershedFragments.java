package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import java.util.Objects;

/**
 * Fragments (an over-segmentation) of a box by seeded watershed on a boundary map.
 *
 * <ol>
 *   <li>interior = in-mask voxels whose boundary value is below the threshold;</li>
 *   <li>{@link DistanceTransform} of the interior (exact Euclidean, voxel size honoured),
 *       optionally smoothed by a Gaussian;</li>
 *   <li>seeds = {@link RegionalMaxima} of that distance inside the interior;</li>
 *   <li>{@link SeededWatershed} flood of the boundary map, rounded to {@value #LEVELS} levels,
 *       from the seeds.</li>
 * </ol>
 * With {@link FragmentOptions#perSlice()} every step stays inside the planes of the slowest
 * axis. Labels are 1..count (consecutive, in order of first voxel), 0 for masked voxels.
 * Time {@code O(n)} apart from the {@code O(n · 3^d)} maxima search (the rounded map lets the
 * flood use a bucket queue); working memory about 30 bytes per voxel (boundary copy, distance
 * map, seeds, labels, queue links).
 */
public final class WatershedFragments {
  private final FragmentOptions options;

  public WatershedFragments(FragmentOptions options) {
    this.options = Objects.requireNonNull(options, "options");
  }

  /** Fragment labels of {@code boundary} (values in [0, 1]); {@code mask} may be null. */
  public int[] label(float[] boundary, int[] shape, byte[] mask) {
    FragmentOptions fitted = options.forDimension(shape.length);
    int[] seeds = seeds(boundary, shape, mask);
    int[] labels = SeededWatershed.flood(rounded(boundary), shape, seeds, mask,
        fitted.sliceAxis());
    return consecutive(labels);
  }

  /** The seed labels the flood starts from (see class javadoc, steps 1–3). */
  public int[] seeds(float[] boundary, int[] shape, byte[] mask) {
    FragmentOptions options = this.options.forDimension(shape.length);
    int n = VoxelBox.size(shape);
    if (boundary.length != n || (mask != null && mask.length != n)) {
      throw new IllegalArgumentException("arrays do not match the box " + Arrays.toString(shape));
    }
    byte[] interior = new byte[n];
    double threshold = options.boundaryThreshold();
    for (int i = 0; i < n; i++) {
      interior[i] = (byte) (boundary[i] < threshold && (mask == null || mask[i] != 0) ? 1 : 0);
    }
    double[] spacing = options.voxelSize();
    boolean[] included = new boolean[shape.length];
    Arrays.fill(included, true);
    int sliceAxis = options.sliceAxis();
    if (sliceAxis >= 0) {
      included[sliceAxis] = false;
    }
    double[] distance = DistanceTransform.of(spacing, included).distances(interior, shape);
    double beyond = 1;
    for (int d = 0; d < shape.length; d++) {
      beyond += shape[d] * spacing[d];
    }
    for (int i = 0; i < n; i++) {
      if (distance[i] == Double.POSITIVE_INFINITY) {
        distance[i] = beyond;
      }
    }
    if (options.seedSmoothing() > 0) {
      // an interior voxel lies at least one voxel step from the boundary, or at `beyond`
      double nearest = beyond;
      for (int d = 0; d < shape.length; d++) {
        nearest = included[d] ? Math.min(nearest, spacing[d]) : nearest;
      }
      double[] sigma = new double[shape.length];
      boolean changes = false;
      for (int d = 0; d < shape.length; d++) {
        sigma[d] = included[d] ? options.seedSmoothing() / spacing[d] : 0;
        changes |= !GaussianSmoothing.changesNothing(sigma[d], nearest, beyond);
      }
      // a smoothing that cannot change an interior distance (σ of a tenth of a voxel, as the
      // default's 1 nm gives 10 nm voxels) is skipped: the seeds only read interior voxels
      if (changes) {
        GaussianSmoothing.smooth(distance, shape, sigma);
      }
    }
    return RegionalMaxima.label(distance, interior, shape, sliceAxis);
  }

  /**
   * The boundary map rounded to multiples of {@code 1 / (LEVELS − 1)}: fragments need no finer
   * order, and with few distinct values the flood runs on a linear-time bucket queue. Values of
   * 8-bit affinities ({@code k / 255}) are far apart and keep their order.
   */
  static float[] rounded(float[] boundary) {
    float[] out = new float[boundary.length];
    float scale = LEVELS - 1;
    for (int i = 0; i < boundary.length; i++) {
      out[i] = Math.round(boundary[i] * scale) / scale;
    }
    return out;
  }

  /** Number of boundary levels the flood distinguishes. */
  static final int LEVELS = 4096;

  /** Renumbers positive labels 1..k in order of first appearance; keeps 0. */
  static int[] consecutive(int[] labels) {
    int largest = 0;
    for (int l : labels) {
      largest = Math.max(largest, l);
    }
    int[] map = new int[largest + 1];
    int next = 0;
    for (int i = 0; i < labels.length; i++) {
      int l = labels[i];
      if (l > 0) {
        if (map[l] == 0) {
          map[l] = ++next;
        }
        labels[i] = map[l];
      }
    }
    return labels;
  }
}
