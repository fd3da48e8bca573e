package org.sunder.spark.report;

import org.sunder.blockwise.grid.Face;
import org.sunder.stitching.solve.SolveDecision;

/**
 * Where on its face a decision of the solve lies in the final segmentation: the middle of the
 * voxel pairs across the face (one voxel on each side, nearest neighbours along the face's axis)
 * that carry the decision's final ids: {@code (A, B)} or {@code (B, A)} for a cut, {@code (A, A)}
 * for a join. Reads the two voxel layers at the face; O(face area).
 */
final class DecisionPositions {
  private DecisionPositions() {}

  /**
   * The position (memory order) of the upper-side voxel nearest to the pairs' mean, or the
   * face's centre when no pair carries the ids (e.g. a size filter moved them).
   */
  static long[] of(Face face, SolveDecision decision, String container, String dataset) {
    int axis = face.axis();
    long[] min = face.lateralMin();
    long[] max = face.lateralMax();
    min[axis] = face.position() - 1;
    max[axis] = face.position();
    long[] labels = Plane.labelsOfBox(container, dataset, min, max);
    return of(labels, min, max, axis, decision.finalA(), decision.finalB());
  }

  /** The same over labels already read: the box {@code [min, max]} two voxels deep along {@code axis}. */
  static long[] of(long[] labels, long[] min, long[] max, int axis, long a, long b) {
    int n = min.length;
    int[] shape = new int[n];
    for (int d = 0; d < n; d++) {
      shape[d] = (int) (max[d] - min[d] + 1);
    }
    int stride = 1;
    for (int d = 0; d < axis; d++) {
      stride *= shape[d];
    }
    double[] sum = new double[n];
    long count = 0;
    int[] p = new int[n];
    for (int i = 0; i < labels.length; i++) {
      int rest = i;
      for (int d = 0; d < n; d++) {
        p[d] = rest % shape[d];
        rest /= shape[d];
      }
      if (p[axis] != 0) {
        continue;
      }
      long lower = labels[i];
      long upper = labels[i + stride];
      boolean match = a == b ? lower == a && upper == a
          : (lower == a && upper == b) || (lower == b && upper == a);
      if (match) {
        for (int d = 0; d < n; d++) {
          sum[d] += p[d];
        }
        count++;
      }
    }
    long[] at = new long[n];
    for (int d = 0; d < n; d++) {
      at[d] = count == 0 ? min[d] + shape[d] / 2 : min[d] + Math.round(sum[d] / count);
    }
    at[axis] = max[axis];
    return at;
  }
}
