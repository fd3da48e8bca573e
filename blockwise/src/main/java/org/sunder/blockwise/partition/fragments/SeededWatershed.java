package org.sunder.blockwise.partition.fragments;

import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.collections.FloodQueue;
import org.sunder.blockwise.collections.LevelQueue;
import org.sunder.blockwise.collections.VoxelQueue;

/**
 * Seeded watershed by priority flood on a boundary map (low values inside objects, high on
 * boundaries), over face neighbours ({@code 2·d}-connectivity), optionally inside each slice
 * plane only.
 *
 * <p>Procedure (marker-based flooding as in "Topographic distance and watershed lines",
 * Signal Processing, 1994): every seed voxel enters a queue with its boundary value; the queue repeatedly yields the voxel
 * of least value, and each unlabelled in-mask face neighbour takes that voxel's label and enters
 * the queue with its own value. <b>Ties</b> are broken by insertion order: seeds enter in voxel
 * index order, neighbours in axis order (−x, +x, −y, +y, −z, +z), so the result is a function of
 * the inputs alone. In-mask voxels that no seed reaches (cut off by the mask) are flooded from
 * new seeds placed at their first voxel in index order, numbered after the largest given label.
 * Masked voxels get 0. Time {@code O(n log n)} with a binary heap; {@code O(n + L)} with a
 * bucket queue when the map has at most {@value #MAX_LEVELS} distinct values {@code L} (as 8-bit
 * affinities give), in the same order. Memory {@code O(n)}.
 */
public final class SeededWatershed {
  /** Up to this many distinct boundary values, a bucket queue replaces the heap. */
  static final int MAX_LEVELS = 4096;

  private SeededWatershed() {}

  /**
   * Floods {@code boundary} from {@code markers} ({@code > 0} = seed label, 0 = none).
   *
   * @param mask {@code null} or 1 = inside; markers outside the mask are ignored
   * @param sliceAxis {@code -1} for full 3D flooding, else the axis whose planes flood apart
   * @return labels, {@code > 0} inside the mask
   */
  public static int[] flood(float[] boundary, int[] shape, int[] markers, byte[] mask,
      int sliceAxis) {
    return flood(boundary, shape, markers, mask, sliceAxis, true);
  }

  /** As above; {@code buckets = false} forces the binary heap (for tests). */
  static int[] flood(float[] boundary, int[] shape, int[] markers, byte[] mask, int sliceAxis,
      boolean buckets) {
    Objects.requireNonNull(boundary, "boundary");
    Objects.requireNonNull(markers, "markers");
    int n = VoxelBox.size(shape);
    if (boundary.length != n || markers.length != n || (mask != null && mask.length != n)) {
      throw new IllegalArgumentException("arrays do not match the box " + Arrays.toString(shape));
    }
    LevelQueue levels = buckets ? LevelQueue.forPriorities(boundary, MAX_LEVELS) : null;
    FloodQueue queue = levels != null ? levels : VoxelQueue.inArrivalOrder(boundary, n / 4);
    // one array for what a visit reads: a label (> 0), 0 outside the mask, or -1 - the
    // voxel's level in the queue while it waits to be reached
    int[] labels = new int[n];
    for (int i = 0; i < n; i++) {
      labels[i] = mask == null || mask[i] != 0 ? -1 - (levels != null ? levels.level(i) : 0) : 0;
    }
    Flood flood = new Flood(shape, sliceAxis, labels);
    // planes along the last axis lie apart in memory and flood apart: one after another keeps
    // the queue's working set to one plane, with the same pops per plane as all at once
    int run = sliceAxis == shape.length - 1 ? n / Math.max(1, shape[sliceAxis]) : n;
    int largest = 0;
    for (int start = 0; start < n; start += run) {
      for (int i = start; i < start + run; i++) {
        int waiting = labels[i];
        if (markers[i] > 0 && waiting < 0) {
          labels[i] = markers[i];
          largest = Math.max(largest, markers[i]);
          queue.push(i, -1 - waiting);
        }
      }
      flood.run(queue);
    }
    for (int i = 0; i < n; i++) {
      int waiting = labels[i];
      if (waiting < 0) {
        labels[i] = ++largest;
        queue.push(i, -1 - waiting);
        flood.run(queue);
      }
    }
    return labels;
  }

  /** One flood over a box; {@code labels} (the state array above) is updated in place. */
  private static final class Flood {
    private final int[] shape;
    private final int sliceAxis;
    private final int[] labels;
    private final int[] strides;
    private final int[] coordinate;

    Flood(int[] shape, int sliceAxis, int[] labels) {
      this.shape = shape;
      this.sliceAxis = sliceAxis;
      this.labels = labels;
      this.strides = VoxelBox.strides(shape);
      this.coordinate = new int[shape.length];
    }

    void run(FloodQueue queue) {
      int dims = shape.length;
      while (!queue.isEmpty()) {
        int i = queue.pop();
        int label = labels[i];
        int rest = i;
        for (int d = dims - 1; d >= 0; d--) {
          coordinate[d] = rest / strides[d];
          rest -= coordinate[d] * strides[d];
        }
        for (int d = 0; d < dims; d++) {
          if (d == sliceAxis) {
            continue;
          }
          if (coordinate[d] > 0) {
            visit(queue, i - strides[d], label);
          }
          if (coordinate[d] < shape[d] - 1) {
            visit(queue, i + strides[d], label);
          }
        }
      }
    }

    private void visit(FloodQueue queue, int j, int label) {
      int waiting = labels[j];
      if (waiting < 0) {
        labels[j] = label;
        queue.push(j, -1 - waiting);
      }
    }
  }
}
