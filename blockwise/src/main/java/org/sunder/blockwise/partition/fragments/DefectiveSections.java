package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import org.sunder.blockwise.graph.AffinityBlock;

/**
 * Defective sections of serial-section data: planes of the slowest axis (z) where the network's
 * prediction is no prediction, and how the fragment methods step over them. Serial-section
 * microscopy loses or spoils whole sections; a network then answers noise (a <em>garbage</em>
 * section) or doubt everywhere (a <em>missing</em> section), and fragments that flood through
 * such a plane bridge objects that never touch.
 *
 * <p>Judged per plane of a box, from its in-plane nearest-neighbour channels only:
 * <ul>
 *   <li><b>incoherent</b>: the mean difference between a channel's affinity at a voxel and at its
 *       neighbour along the other in-plane axis exceeds {@value #MAX_INCOHERENCE} and
 *       {@value #INCOHERENCE_OVER_MEDIAN} times the median plane's. Predictions
 *       of tissue are smooth inside objects and jump only at boundaries; independent uniform
 *       values differ by 1/3 on average (the mean of {@code |U - V|} for two independent
 *       uniforms on [0, 1], a fact of probability).
 *   <li><b>starved</b>: the share of its in-plane edges that attract ({@code a >= 0.5}) is below
 *       {@value #MIN_ATTRACTION_SHARE} of the median plane's share, while the planes next to it
 *       (those the box holds) are above that: a section where the network joins almost
 *       nothing between sections that it joins. A run of such planes (an empty stretch at the
 *       end of the tissue, say) is not a defect.
 * </ul>
 * Only for anisotropic voxels (the slowest axis at least
 * {@value FragmentOptions#SLICE_ANISOTROPY} times the finest other), where planes are physical
 * sections; planes with fewer than {@value #MIN_PAIRS} judged pairs are never defective, and
 * when more than half the judged planes fail the rules, none is defective (the rules then
 * misread the data: defects are exceptions). O(n) per in-plane channel.
 */
public final class DefectiveSections {
  /** Mean in-plane affinity difference between neighbours above which a plane is noise. */
  static final double MAX_INCOHERENCE = 0.2;
  /** How many times the median plane's incoherence a noisy plane also exceeds. */
  static final double INCOHERENCE_OVER_MEDIAN = 2;
  /** Share of the median plane's attractive in-plane edges below which a plane is missing. */
  static final double MIN_ATTRACTION_SHARE = 0.25;
  /** Fewest judged voxel pairs of a plane. */
  static final int MIN_PAIRS = 64;

  private DefectiveSections() {}

  /**
   * Per plane of the slowest axis, whether it is defective; null when none is or the voxels are
   * not anisotropic ({@code voxelSize} in the box's axis order, fastest first, or null).
   */
  public static boolean[] find(AffinityBlock block, double[] voxelSize) {
    if (block.shape().length != 3 || voxelSize == null
        || !FragmentOptions.isSliced(voxelSize)) {
      return null;
    }
    PlaneFigures figures = measure(block);
    int planes = figures.pairs().length;
    double[] attraction = figures.attraction();
    double[] incoherence = figures.incoherence();
    int judged = 0;
    for (int p = 0; p < planes; p++) {
      judged += figures.pairs()[p] >= MIN_PAIRS ? 1 : 0;
    }
    if (judged == 0) {
      return null;
    }
    double starvedBelow = MIN_ATTRACTION_SHARE * median(attraction, figures.pairs());
    double incoherentAbove = Math.max(MAX_INCOHERENCE,
        INCOHERENCE_OVER_MEDIAN * median(incoherence, figures.pairs()));
    boolean[] defective = new boolean[planes];
    int count = 0;
    for (int p = 0; p < planes; p++) {
      boolean starved = attraction[p] < starvedBelow
          && (p == 0 || attraction[p - 1] >= starvedBelow)
          && (p == planes - 1 || attraction[p + 1] >= starvedBelow);
      defective[p] = figures.pairs()[p] >= MIN_PAIRS
          && (incoherence[p] > incoherentAbove || starved);
      count += defective[p] ? 1 : 0;
    }
    // defects are exceptions: when most planes fail, the rules misread this data
    return count == 0 || 2 * count > judged ? null : defective;
  }

  /** The median of {@code values} over the planes with at least {@link #MIN_PAIRS} pairs. */
  private static double median(double[] values, long[] pairs) {
    double[] judged = new double[values.length];
    int count = 0;
    for (int p = 0; p < values.length; p++) {
      if (pairs[p] >= MIN_PAIRS) {
        judged[count++] = values[p];
      }
    }
    Arrays.sort(judged, 0, count);
    return judged[count / 2];
  }

  /**
   * What the rules read, per plane of a 3D box's slowest axis.
   *
   * @param incoherence mean {@code |a(v) - a(v')|} of an in-plane channel between neighbours
   *     {@code v, v'} along the other in-plane axis
   * @param attraction share of the in-plane edges with {@code a >= 0.5}
   * @param pairs neighbour pairs behind {@code incoherence}
   */
  record PlaneFigures(double[] incoherence, double[] attraction, long[] pairs) {}

  /** The figures of every plane of a 3D box. O(n) per in-plane channel. */
  static PlaneFigures measure(AffinityBlock block) {
    int[] shape = block.shape();
    int nx = shape[0];
    int ny = shape[1];
    int planes = shape[2];
    double[] difference = new double[planes];
    long[] pairs = new long[planes];
    long[] attractive = new long[planes];
    long[] edges = new long[planes];
    int[][] offsets = block.offsets().vectors();
    for (int k = 0; k < offsets.length; k++) {
      if (!BoundaryMap.isNearestNeighbour(offsets[k], 2)) {
        continue;
      }
      // the edge runs along x or y; its neighbour pair lies along the other in-plane axis
      int dx = offsets[k][0];
      int dy = offsets[k][1];
      int delta = dx + dy * nx;
      int acrossStep = dx != 0 ? nx : 1;
      for (int z = 0, v = 0; z < planes; z++) {
        for (int y = 0; y < ny; y++) {
          for (int x = 0; x < nx; x++, v++) {
            int tx = x + dx;
            int ty = y + dy;
            if (tx < 0 || tx >= nx || ty < 0 || ty >= ny || !block.inside(v)
                || !block.inside(v + delta)) {
              continue;
            }
            float a = block.affinity(v, k);
            edges[z]++;
            if (a >= 0.5f) {
              attractive[z]++;
            }
            boolean nextInBox = dx != 0 ? ty + 1 < ny : tx + 1 < nx;
            int next = v + acrossStep;
            if (nextInBox && block.inside(next) && block.inside(next + delta)) {
              difference[z] += Math.abs(a - block.affinity(next, k));
              pairs[z]++;
            }
          }
        }
      }
    }
    double[] incoherence = new double[planes];
    double[] attraction = new double[planes];
    for (int p = 0; p < planes; p++) {
      incoherence[p] = pairs[p] == 0 ? 0 : difference[p] / pairs[p];
      attraction[p] = edges[p] == 0 ? 0 : attractive[p] / (double) edges[p];
    }
    return new PlaneFigures(incoherence, attraction, pairs);
  }

  /**
   * The plane a defective plane borrows from: the nearest plane that is not defective (the lower
   * one at equal distance), or -1 when every plane is.
   */
  static int source(boolean[] defective, int plane) {
    for (int distance = 1; distance < defective.length; distance++) {
      if (plane - distance >= 0 && !defective[plane - distance]) {
        return plane - distance;
      }
      if (plane + distance < defective.length && !defective[plane + distance]) {
        return plane + distance;
      }
    }
    return -1;
  }

  /**
   * Gives every defective plane of {@code boundary} (a 3D box's boundary map, fastest axis
   * first) the values of its {@link #source} plane, so that fragments run through it as they
   * run through the sections beside it. O(n).
   */
  static void bridge(float[] boundary, int[] shape, boolean[] defective) {
    int planeSize = shape[0] * shape[1];
    for (int p = 0; p < defective.length; p++) {
      int q = defective[p] ? source(defective, p) : -1;
      if (q >= 0) {
        System.arraycopy(boundary, q * planeSize, boundary, p * planeSize, planeSize);
      }
    }
  }

  /**
   * Gives every voxel of a defective plane the fragment of the voxel beside it in the
   * {@link #source} plane (where both are labelled), then renumbers the labels 1..k in order of
   * first voxel: no fragment lives in a defective plane alone. O(n).
   */
  static int[] adopt(int[] labels, int[] shape, boolean[] defective) {
    int planeSize = shape[0] * shape[1];
    for (int p = 0; p < defective.length; p++) {
      int q = defective[p] ? source(defective, p) : -1;
      if (q < 0) {
        continue;
      }
      for (int i = 0; i < planeSize; i++) {
        int from = labels[q * planeSize + i];
        int at = p * planeSize + i;
        if (from != 0 && labels[at] != 0) {
          labels[at] = from;
        }
      }
    }
    return WatershedFragments.consecutive(labels);
  }

  /** 1 for every voxel of a defective plane, else 0: the voxels whose edges say nothing. */
  static byte[] voxels(boolean[] defective, int[] shape) {
    int planeSize = shape[0] * shape[1];
    byte[] flags = new byte[planeSize * shape[2]];
    for (int p = 0; p < defective.length; p++) {
      if (defective[p]) {
        Arrays.fill(flags, p * planeSize, (p + 1) * planeSize, (byte) 1);
      }
    }
    return flags;
  }
}
