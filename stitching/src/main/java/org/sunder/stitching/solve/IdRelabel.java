package org.sunder.stitching.solve;

import org.sunder.blockwise.grid.IdLayout;

/** Replaces provisional ids by final ids in an array of labels, leaving other values as they are. */
public interface IdRelabel {
  /** The final id of a provisional id; a typed error for an id this map does not know. */
  long apply(long provisional);

  /** Relabels {@code labels} in place; returns how many values changed. O(labels). */
  default int applyInPlace(long[] labels) {
    int changed = 0;
    for (int i = 0; i < labels.length; i++) {
      long value = labels[i];
      if (IdLayout.isProvisional(value)) {
        labels[i] = apply(value);
        changed++;
      }
    }
    return changed;
  }
}
