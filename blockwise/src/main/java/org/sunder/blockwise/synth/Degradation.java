package org.sunder.blockwise.synth;

import java.util.LinkedHashMap;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * How to spoil exact affinities the way an imperfect network does. Each kind has one strength;
 * 0 turns it off (the factors {@code gapLongRangeStrength} and {@code longRangeNoiseFactor} are
 * neutral at 1). Applied in this order, each from its own random stream derived from
 * {@code seed} (so switching one kind on or off leaves the draws of the others alone):
 *
 * <ol>
 *   <li>wide boundaries: every nearest-neighbour edge inside one object with an end fewer
 *       than {@code boundaryWidening} steps from the object's surface gets a low affinity in
 *       [0, 0.2): the network predicts the boundary too thick, and thin objects lose their
 *       interior. Surface and steps are taken along the axes of the finest voxel size only (a
 *       surface voxel has a neighbour of another label, background included, along such an
 *       axis), so anisotropic data widen in-plane;
 *   <li>gaps: each boundary voxel (a labelled voxel with a 6-neighbour of another non-zero
 *       label) becomes, with probability {@code gapRate}, the centre of a ball of radius
 *       {@value #GAP_RADIUS_VOXELS} finest voxels where the network saw no boundary: every
 *       edge between two different labels, both ends in the ball, gets a high affinity in
 *       [0.85, 1) (times {@code gapLongRangeStrength} on the long-range channels), and an edge
 *       inside one object is raised to such a value where widening lowered it: a false merge
 *       waiting to happen, which context sees less of;
 *   <li>false boundaries: each object voxel becomes, with probability
 *       {@code falseBoundaryRate}, the centre of a disc (radius
 *       {@value #FALSE_BOUNDARY_RADIUS_VOXELS} finest voxels, random orientation); edges inside
 *       one object whose ends lie on both sides of the disc's plane, both within the radius,
 *       get a low affinity in [0, 0.15);
 *   <li>blur: a separable Gaussian per channel, {@code blurSigma} in finest voxels (scaled per
 *       axis by the voxel size, so it is isotropic in physical space), borders replicated;
 *   <li>noise: additive Gaussian, standard deviation {@code noiseSigma} independent per value,
 *       plus {@code correlatedNoiseSigma} times one smooth unit-variance field shared by all
 *       channels (white noise blurred with σ = {@value #NOISE_CORRELATION_VOXELS} finest
 *       voxels: a local smudge that spoils every prediction there); on the long-range channels
 *       both are multiplied by {@code longRangeNoiseFactor}; clamped to [0, 1];
 *   <li>corrupted slices: each z slice, with probability {@code corruptSliceProbability},
 *       gets uniform random values in [0, 1) on every channel (a garbage section);
 *   <li>missing slices: each z slice, with probability {@code missingSliceProbability}, is a
 *       section the network never saw: every edge with an end in it, on every channel, gets an
 *       uncertain value in [0.3, 0.5).
 * </ol>
 *
 * <p>A channel is nearest-neighbour when its offset has one non-zero component of magnitude 1,
 * long-range otherwise. Ground truth is never touched; background stays as the exact affinities
 * have it except for blur, noise and defective slices, which act everywhere.
 *
 * @param seed random streams derive from it
 * @param blurSigma Gaussian sigma in voxels of the finest axis, {@code >= 0}
 * @param noiseSigma noise standard deviation, {@code >= 0}
 * @param gapRate probability per boundary voxel of a gap centre, in [0, 1]
 * @param falseBoundaryRate probability per object voxel of a false-boundary centre, in [0, 1]
 * @param corruptSliceProbability probability per z slice of a garbage section, in [0, 1]
 * @param boundaryWidening surface steps of predicted boundary inside each object, 0 to 3
 * @param gapLongRangeStrength how much of a gap the long-range channels see, in [0, 1]
 * @param longRangeNoiseFactor noise multiplier on the long-range channels, in [0, 10]
 * @param correlatedNoiseSigma strength of the shared smooth noise field, {@code >= 0}
 * @param missingSliceProbability probability per z slice of a missing section, in [0, 1]
 */
public record Degradation(long seed, double blurSigma, double noiseSigma, double gapRate,
    double falseBoundaryRate, double corruptSliceProbability, int boundaryWidening,
    double gapLongRangeStrength, double longRangeNoiseFactor, double correlatedNoiseSigma,
    double missingSliceProbability) {

  /** Gap ball radius, in voxels of the finest axis. */
  public static final double GAP_RADIUS_VOXELS = 2.0;
  /** False-boundary disc radius, in voxels of the finest axis. */
  public static final double FALSE_BOUNDARY_RADIUS_VOXELS = 4.0;
  /** Correlation length (Gaussian sigma) of the shared noise field, in finest voxels. */
  public static final double NOISE_CORRELATION_VOXELS = 3.0;

  public Degradation {
    check("blurSigma", blurSigma, 50);
    check("noiseSigma", noiseSigma, 10);
    check("gapRate", gapRate, 1);
    check("falseBoundaryRate", falseBoundaryRate, 1);
    check("corruptSliceProbability", corruptSliceProbability, 1);
    check("boundaryWidening", boundaryWidening, 3);
    check("gapLongRangeStrength", gapLongRangeStrength, 1);
    check("longRangeNoiseFactor", longRangeNoiseFactor, 10);
    check("correlatedNoiseSigma", correlatedNoiseSigma, 10);
    check("missingSliceProbability", missingSliceProbability, 1);
  }

  /** The classic kinds only: no wide boundaries, no channel-dependent strengths, no missing
   * slices. */
  public Degradation(long seed, double blurSigma, double noiseSigma, double gapRate,
      double falseBoundaryRate, double corruptSliceProbability) {
    this(seed, blurSigma, noiseSigma, gapRate, falseBoundaryRate, corruptSliceProbability, 0, 1,
        1, 0, 0);
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
        && corruptSliceProbability == 0 && boundaryWidening == 0 && correlatedNoiseSigma == 0
        && missingSliceProbability == 0;
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
    m.put("boundaryWidening", boundaryWidening);
    m.put("gapLongRangeStrength", gapLongRangeStrength);
    m.put("longRangeNoiseFactor", longRangeNoiseFactor);
    m.put("correlatedNoiseSigma", correlatedNoiseSigma);
    m.put("missingSliceProbability", missingSliceProbability);
    return m;
  }

  /**
   * Reads what {@link #toAttributes()} wrote; the keys after {@code corruptSliceProbability}
   * may be absent (datasets written before they existed) and then take their neutral values.
   *
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} naming a missing or malformed key
   */
  public static Degradation fromAttributes(Map<String, ?> m) {
    AttributeReader r = new AttributeReader("degradation attributes", m);
    return new Degradation(r.longValue("seed"), r.doubleValue("blurSigma"),
        r.doubleValue("noiseSigma"), r.doubleValue("gapRate"),
        r.doubleValue("falseBoundaryRate"), r.doubleValue("corruptSliceProbability"),
        r.intValueOr("boundaryWidening", 0), r.doubleValueOr("gapLongRangeStrength", 1),
        r.doubleValueOr("longRangeNoiseFactor", 1), r.doubleValueOr("correlatedNoiseSigma", 0),
        r.doubleValueOr("missingSliceProbability", 0));
  }

  private static void check(String key, double value, double max) {
    if (!(value >= 0 && value <= max)) {
      throw new SunderException(ErrorKind.INVALID_CONFIG,
          "degradation: " + key + " must be in [0, " + max + "], got " + value);
    }
  }
}
