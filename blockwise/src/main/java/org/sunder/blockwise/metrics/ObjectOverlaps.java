package org.sunder.blockwise.metrics;

import java.util.Arrays;
import java.util.Objects;

/**
 * One object of a worst-split or worst-merge list: a ground-truth object and the segments it
 * was broken into (a split), or a segment and the ground-truth objects it covers (a merge).
 *
 * @param label the object's label (ground truth for a split, segment for a merge)
 * @param voxels the object's evaluated voxels
 * @param overlapCount how many labels of the other side it overlaps
 * @param overlapLabels the largest overlaps' labels, largest first (at most
 *     {@link ScoreOptions#overlapsListed()}); ties by unsigned label
 * @param overlapVoxels the voxels of each listed overlap
 */
public record ObjectOverlaps(long label, long voxels, int overlapCount, long[] overlapLabels,
    long[] overlapVoxels) {

  public ObjectOverlaps {
    Objects.requireNonNull(overlapLabels, "overlapLabels");
    Objects.requireNonNull(overlapVoxels, "overlapVoxels");
    if (overlapLabels.length != overlapVoxels.length || overlapLabels.length > overlapCount) {
      throw new IllegalArgumentException("overlap arrays do not match overlapCount "
          + overlapCount);
    }
    overlapLabels = overlapLabels.clone();
    overlapVoxels = overlapVoxels.clone();
  }

  /** Voxels outside the largest overlap: what it would take to repair this object. */
  public long misassignedVoxels() {
    return overlapVoxels.length == 0 ? 0 : voxels - overlapVoxels[0];
  }

  @Override
  public long[] overlapLabels() {
    return overlapLabels.clone();
  }

  @Override
  public long[] overlapVoxels() {
    return overlapVoxels.clone();
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof ObjectOverlaps x && x.label == label && x.voxels == voxels
        && x.overlapCount == overlapCount && Arrays.equals(x.overlapLabels, overlapLabels)
        && Arrays.equals(x.overlapVoxels, overlapVoxels);
  }

  @Override
  public int hashCode() {
    return Objects.hash(label, voxels, overlapCount, Arrays.hashCode(overlapLabels),
        Arrays.hashCode(overlapVoxels));
  }

  @Override
  public String toString() {
    return "ObjectOverlaps[label=" + Long.toUnsignedString(label) + ", voxels=" + voxels
        + ", overlaps=" + overlapCount + ", largest=" + Arrays.toString(overlapLabels)
        + " " + Arrays.toString(overlapVoxels) + "]";
  }
}
