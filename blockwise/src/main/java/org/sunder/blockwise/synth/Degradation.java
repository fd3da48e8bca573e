package org.sunder.blockwise.synth;

import java.util.LinkedHashMap;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * How to spoil exact affinities the way an imperfect network does. Each kind has one strength;
 * 0 turns it off. Applied in this order, each from its own random stream derived from
 * {@code seed} (so switching one kind on or off leaves the draws of the others alone):
 *
 * <ol>
 *   <li>gaps: each boundary voxel (a labelled voxel with a 6-neighbour of another non-zero
 *       label) becomes, with probability {@code gapRate}, the centre of a ball of radius
 *       {@value #GAP_RADIUS_VOXELS} finest voxels in which every edge between two different
 *       non-zero labels, both ends in the ball, gets a high affinity in [0.85, 1): a false
 *       merge waiting to happen;
 *   <li>false boundaries: each object voxel becomes, with probability
 *       {@code falseBoundaryRate}, the centre of a disc (radius
 *       {@value #FALSE_BOUNDARY_RADIUS_VOXELS} finest voxels, random orientation); edges inside
 *       one object whose ends lie on both sides of the disc's plane, both within the radius,
 *       get a low affinity in [0, 0.15);
 *   <li>blur: a separable Gaussian per channel, {@code blurSigma} in finest voxels (scaled per
 *       axis by the voxel size, so it is isotropic in physical space), borders replicated;
 *   <li>noise: additive Gaussian, standard deviation {@code noiseSigma}, clamped to [0, 1];
 *   <li>corrupted slices: each z slice, with probability {@code corruptSliceProbability},
 *       gets uniform random values in [0, 1) on every channel.
 * </ol>
 *
 * <p>Ground truth is never touched; background stays as the exact affinities have it except
 * for blur, noise and corrupted slices, which act everywhere.
 *
 * @param seed random streams derive from it
 * @param blurSigma Gaussian sigma in voxels of the finest axis, {@code >= 0}
 * @param noiseSigma noise standard deviation, {@code >= 0}
 * @param gapRate probability per boundary voxel of a gap centre, in [0, 1]
 * @param falseBoundaryRate probability per object voxel of a false-boundary centre, in [0, 1]
 * @param corruptSliceProbability probability per z slice, in [0, 1]
 */
public record Degradation(long seed, double blurSigma, double noiseSigma, double gapRate,
    double falseBoundaryRate, double corruptSliceProbability) {

  /** Gap ball radius, in voxels of the finest axis. */
  public static final double GAP_RADIUS_VOXELS = 2.0;
  /** False-boundary disc radius, in voxels of the finest axis. */
  public static final double FALSE_BOUNDARY_RADIUS_VOXELS = 4.0;

  public Degradation {
    check("blurSigma", blurSigma, 50);
    check("noiseSigma", noiseSigma, 10);
    check("gapRate", gapRate, 1);
    check("falseBoundaryRate", falseBoundaryRate, 1);
    check("corruptSliceProbability", corruptSliceProbability, 1);
  }

  /** No degradation: {@link #apply} returns a copy of its input. */
  public static Degradation none() {
    return new Degradation(0, 0, 0, 0, 0, 0);
  }

  /** A moderate mix of every kind, for demos. */
  public static Degradation moderate(long seed) {
    return new Degradation(seed, 0.7, 0.08, 0.01, 0.0005, 0.05);
  }

  /** True when every strength is 0. */
  public boolean isNone() {
    return blurSigma == 0 && noiseSigma == 0 && gapRate == 0 && falseBoundaryRate == 0
        && corruptSliceProbability == 0;
  }

  /**
   * Returns degraded copies of exact affinities (layout of {@link ExactAffinities}); inputs are
   * not modified. {@code O(n * channels * (1 + kernel length))}.
   */
  public float[] apply(long[] labels, long[] shape, double[] voxelSize, int[][] offsets,
      float[] affinities) {
    return new AffinityDegrader(this, labels, shape, voxelSize, offsets).degrade(affinities);
  }

  /** The strengths as JSON-ready attributes. */
  public Map<String, Object> toAttributes() {
    Map<String, Object> m = new LinkedHashMap<>();
    m.put("seed", seed);
    m.put("blurSigma", blurSigma);
    m.put("noiseSigma", noiseSigma);
    m.put("gapRate", gapRate);
    m.put("falseBoundaryRate", falseBoundaryRate);
    m.put("corruptSliceProbability", corruptSliceProbability);
    return m;
  }

  /**
   * Reads what {@link #toAttributes()} wrote.
   *
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} naming a missing or malformed key
   */
  public static Degradation fromAttributes(Map<String, ?> m) {
    AttributeReader r = new AttributeReader("degradation attributes", m);
    return new Degradation(r.longValue("seed"), r.doubleValue("blurSigma"),
        r.doubleValue("noiseSigma"), r.doubleValue("gapRate"),
        r.doubleValue("falseBoundaryRate"), r.doubleValue("corruptSliceProbability"));
  }

  private static void check(String key, double value, double max) {
    if (!(value >= 0 && value <= max)) {
      throw new SunderException(ErrorKind.INVALID_CONFIG,
          "degradation: " + key + " must be in [0, " + max + "], got " + value);
    }
  }
}
