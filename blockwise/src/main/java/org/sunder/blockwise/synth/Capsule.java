package org.sunder.blockwise.synth;

/**
 * A piece of a fibre: the round-ended cone between two points (physical coordinates, nm,
 * memory order) with a radius at each end; {@code arm} numbers the unbranched run it belongs
 * to.
 */
record Capsule(int object, int arm, double ax, double ay, double az, double ra, double bx, double by,
    double bz, double rb) {}
