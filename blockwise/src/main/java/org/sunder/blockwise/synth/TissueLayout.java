package org.sunder.blockwise.synth;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * Places the objects of a {@link SynthSpec} in physical space: bodies first (spheres kept
 * apart), then cells (ellipsoids kept off bodies and each other), then fibres as persistent
 * random walks that start inside the volume, run both ways until they leave it, slide around
 * bodies and cells they would enter, vary their radius along their length and branch now and
 * then (side branches of the two main arms, at most {@value #MAX_BRANCHES_PER_FIBRE} per fibre,
 * each up to 0.6 of the volume's longest extent). Steps are 1.5 local radii long. Object ids
 * are 1.., in that order. Deterministic from the spec's seed.
 */
final class TissueLayout {
  private static final int PLACEMENT_TRIES = 60;
  private static final int MAX_BRANCHES_PER_FIBRE = 4;

  final List<Ellipsoid> ellipsoids = new ArrayList<>();
  final List<Capsule> capsules = new ArrayList<>();
  final List<ObjectKind> kinds = new ArrayList<>();
  /** The branch depth of each arm of a fibre (0: a main arm); capsules name their arm. */
  final List<Integer> armDepths = new ArrayList<>();

  private final SynthSpec spec;
  private final Random random;
  private final double[] extent = new double[3];
  private int branchesLeft;

  TissueLayout(SynthSpec spec) {
    this.spec = spec;
    this.random = new Random(spec.seed());
    for (int d = 0; d < 3; d++) {
      extent[d] = spec.shape()[d] * spec.voxelSize()[d];
    }
    for (int i = 0; i < spec.bodyCount(); i++) {
      placeEllipsoid(ObjectKind.BODY, spec.bodyRadiusMin(), spec.bodyRadiusMax(), 0);
    }
    for (int i = 0; i < spec.cellCount(); i++) {
      placeEllipsoid(ObjectKind.CELL, spec.cellRadiusMin(), spec.cellRadiusMax(), 0.3);
    }
    for (int i = 0; i < spec.fibreCount(); i++) {
      placeFibre();
    }
  }

  /** Object ids run 1..objectCount(). */
  int objectCount() {
    return kinds.size();
  }

  private void placeEllipsoid(ObjectKind kind, double rMin, double rMax, double elongation) {
    double radius = uniform(rMin, rMax);
    double[] radii = new double[3];
    for (int d = 0; d < 3; d++) {
      radii[d] = radius * (1 + elongation * (2 * random.nextDouble() - 1));
    }
    double bound = Math.max(radii[0], Math.max(radii[1], radii[2]));
    double[] centre = new double[3];
    for (int attempt = 0; attempt < PLACEMENT_TRIES; attempt++) {
      for (int d = 0; d < 3; d++) {
        double inset = Math.min(bound, extent[d] / 2);
        centre[d] = inset + random.nextDouble() * (extent[d] - 2 * inset);
      }
      if (clearOfEllipsoids(centre, bound)) {
        break;
      }
    }
    kinds.add(kind);
    ellipsoids.add(new Ellipsoid(kinds.size(), centre.clone(), randomFrame(), radii));
  }

  private boolean clearOfEllipsoids(double[] p, double radius) {
    for (Ellipsoid e : ellipsoids) {
      if (distance(p, e.centre()) < 0.9 * (radius + e.largestRadius())) {
        return false;
      }
    }
    return true;
  }

  private void placeFibre() {
    kinds.add(ObjectKind.FIBRE);
    int id = kinds.size();
    double baseRadius = uniform(spec.fibreRadiusMin(), spec.fibreRadiusMax());
    double[] start = new double[3];
    for (int attempt = 0; attempt < PLACEMENT_TRIES; attempt++) {
      for (int d = 0; d < 3; d++) {
        start[d] = random.nextDouble() * extent[d];
      }
      if (clearOfEllipsoids(start, baseRadius)) {
        break;
      }
    }
    double[] direction = randomUnit();
    double phase = random.nextDouble() * 2 * Math.PI;
    branchesLeft = MAX_BRANCHES_PER_FIBRE;
    walk(id, start, direction, baseRadius, phase, 0);
    walk(id, start, scale(direction, -1), baseRadius, phase + Math.PI, 0);
  }

  /** One arm of a fibre, from {@code start} along {@code direction} until it leaves the volume. */
  private void walk(int id, double[] start, double[] direction, double baseRadius,
      double phase, int depth) {
    double[] p = start.clone();
    double[] dir = direction.clone();
    double wavelength = 10 * baseRadius;
    double travelled = 0;
    double radius = radiusAt(baseRadius, phase, 0, wavelength);
    double longest = Math.max(extent[0], Math.max(extent[1], extent[2]));
    double maxLength = depth == 0 ? 3 * (extent[0] + extent[1] + extent[2]) : 0.6 * longest;
    int arm = armDepths.size();
    armDepths.add(depth);
    while (inside(p, radius) && travelled < maxLength) {
      double step = Math.max(1.5 * radius, 0.5 * minVoxelSize());
      for (int d = 0; d < 3; d++) {
        dir[d] += spec.tortuosity() * random.nextGaussian();
      }
      dir = normalized(dir);
      double[] next = add(p, scale(dir, step));
      double nextRadius = radiusAt(baseRadius, phase, travelled + step, wavelength);
      slideAround(next, nextRadius);
      dir = normalized(subtract(next, p), dir);
      capsules.add(new Capsule(id, arm, p[0], p[1], p[2], radius, next[0], next[1], next[2],
          nextRadius));
      travelled += step;
      p = next;
      radius = nextRadius;
      if (depth == 0 && branchesLeft > 0 && random.nextDouble() < spec.branchProbability()) {
        branchesLeft--;
        double[] side = normalized(add(dir, scale(randomUnit(), 1.2)));
        walk(id, p, side, Math.max(0.7 * radius, 0.6 * spec.fibreRadiusMin()),
            random.nextDouble() * 2 * Math.PI, depth + 1);
      }
    }
  }

  /** Pushes a point out of every ellipsoid's bounding sphere, inflated by the fibre radius. */
  private void slideAround(double[] p, double radius) {
    for (Ellipsoid e : ellipsoids) {
      double keep = e.largestRadius() + radius;
      double[] away = subtract(p, e.centre());
      double dist = norm(away);
      if (dist < keep && dist > 0) {
        for (int d = 0; d < 3; d++) {
          p[d] = e.centre()[d] + away[d] * keep / dist;
        }
      }
    }
  }

  private double radiusAt(double base, double phase, double arc, double wavelength) {
    return base * (1 + 0.3 * Math.sin(phase + 2 * Math.PI * arc / wavelength));
  }

  private boolean inside(double[] p, double margin) {
    for (int d = 0; d < 3; d++) {
      if (p[d] < -margin || p[d] > extent[d] + margin) {
        return false;
      }
    }
    return true;
  }

  private double minVoxelSize() {
    double[] v = spec.voxelSize();
    return Math.min(v[0], Math.min(v[1], v[2]));
  }

  private double uniform(double lo, double hi) {
    return lo + (hi - lo) * random.nextDouble();
  }

  private double[] randomUnit() {
    return normalized(new double[] {random.nextGaussian(), random.nextGaussian(),
        random.nextGaussian()}, new double[] {1, 0, 0});
  }

  private double[][] randomFrame() {
    double[] u = randomUnit();
    double[] v = randomUnit();
    double along = dot(u, v);
    v = normalized(subtract(v, scale(u, along)), perpendicular(u));
    double[] w = {u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]};
    return new double[][] {u, v, w};
  }

  private static double[] perpendicular(double[] u) {
    return Math.abs(u[0]) < 0.9 ? normalized(new double[] {0, -u[2], u[1]})
        : normalized(new double[] {-u[2], 0, u[0]});
  }

  static double[] normalized(double[] v) {
    return normalized(v, new double[] {1, 0, 0});
  }

  static double[] normalized(double[] v, double[] fallback) {
    double n = norm(v);
    return n < 1e-12 ? fallback.clone() : scale(v, 1 / n);
  }

  static double norm(double[] v) {
    return Math.sqrt(dot(v, v));
  }

  static double dot(double[] a, double[] b) {
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
  }

  static double distance(double[] a, double[] b) {
    return norm(subtract(a, b));
  }

  static double[] add(double[] a, double[] b) {
    return new double[] {a[0] + b[0], a[1] + b[1], a[2] + b[2]};
  }

  static double[] subtract(double[] a, double[] b) {
    return new double[] {a[0] - b[0], a[1] - b[1], a[2] - b[2]};
  }

  static double[] scale(double[] a, double s) {
    return new double[] {a[0] * s, a[1] * s, a[2] * s};
  }
}
