package org.sunder.stitching.solve;

import java.io.Serializable;

/**
 * Figures of one global solve.
 *
 * @param method the solve method (e.g. {@code "agglomeration mean"})
 * @param segmentCount provisional segments over all blocks
 * @param nodeCount reduced graph nodes (boundary segments)
 * @param edgeCount reduced graph edges (segment pairs)
 * @param finalIdCount final ids assigned
 * @param solveSeconds wall time of assembling and solving the reduced graph
 */
public record SolveReport(String method, long segmentCount, int nodeCount, int edgeCount,
    long finalIdCount, double solveSeconds) implements Serializable {}
