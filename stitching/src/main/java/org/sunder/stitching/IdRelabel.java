package org.sunder.stitching;

/** Replaces provisional ids by final ids in an array of labels, leaving other values as they are. */
public interface IdRelabel {
  /** Relabels {@code labels} in place; returns how many values changed. O(labels). */
  int applyInPlace(long[] labels);
}
