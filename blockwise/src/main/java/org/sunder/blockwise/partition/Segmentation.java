package org.sunder.blockwise.partition;

import java.util.Arrays;

/**
 * A partition of the voxels of a box: {@code labels[i]} is the segment of voxel {@code i}
 * (memory order), {@code 1..segmentCount}, numbered in order of each segment's first voxel;
 * 0 marks masked voxels. The array is wrapped, not copied.
 */
public record Segmentation(int[] labels, int segmentCount) {

  public Segmentation {
    if (segmentCount < 0) {
      throw new IllegalArgumentException("segmentCount " + segmentCount + " is negative");
    }
  }

  /**
   * Labels from any node-to-cluster map (cluster ids in {@code [0, nodeCount)}, e.g. union-find
   * roots): clusters renumbered from 1 in order of first voxel; voxels outside the mask get 0.
   * {@code O(n)}; reuses no input array.
   */
  public static Segmentation fromClusters(int[] clusterOfVoxel, byte[] maskOrNull) {
    int n = clusterOfVoxel.length;
    int[] labelOfCluster = new int[n];
    int[] labels = new int[n];
    int next = 0;
    for (int i = 0; i < n; i++) {
      if (maskOrNull != null && maskOrNull[i] == 0) {
        continue;
      }
      int c = clusterOfVoxel[i];
      if (labelOfCluster[c] == 0) {
        labelOfCluster[c] = ++next;
      }
      labels[i] = labelOfCluster[c];
    }
    return new Segmentation(labels, next);
  }

  /** Number of voxels. */
  public int voxelCount() {
    return labels.length;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Segmentation s && segmentCount == s.segmentCount
        && Arrays.equals(labels, s.labels);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(labels) * 31 + segmentCount;
  }

  @Override
  public String toString() {
    return "Segmentation[" + labels.length + " voxels, " + segmentCount + " segments]";
  }
}
