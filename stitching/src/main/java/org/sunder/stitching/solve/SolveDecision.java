package org.sunder.stitching.solve;

/**
 * One decision of the global solve about a pair of segments that meet across a block face:
 * joined into one final segment, or kept apart.
 *
 * @param joined whether the two pieces got the same final id
 * @param face the face whose seam edges connect them
 * @param provisionalA the lower provisional id of the pair
 * @param provisionalB the higher provisional id of the pair
 * @param finalA the final id of {@code provisionalA}
 * @param finalB the final id of {@code provisionalB}
 * @param voxelEdges voxel edges between the two pieces across the face
 * @param meanWeight mean signed weight of those edges ({@code > 0} attractive)
 */
public record SolveDecision(boolean joined, int face, long provisionalA, long provisionalB,
    long finalA, long finalB, long voxelEdges, double meanWeight) {

  /**
   * How strongly the evidence agrees with the decision: the mean weight for a join, its negation
   * for a cut. Small or negative values are the decisions most likely to be wrong.
   */
  public double margin() {
    return joined ? meanWeight : -meanWeight;
  }
}
