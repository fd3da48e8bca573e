package org.sunder.blockwise.synth;

/**
 * A cell or body: centre (nm, memory order), three orthonormal axes (row-wise, 3 x 3) and the
 * semi-axis lengths along them (nm).
 */
record Ellipsoid(int object, double[] centre, double[][] axes, double[] radii) {

  double largestRadius() {
    return Math.max(radii[0], Math.max(radii[1], radii[2]));
  }

  double smallestRadius() {
    return Math.min(radii[0], Math.min(radii[1], radii[2]));
  }
}
