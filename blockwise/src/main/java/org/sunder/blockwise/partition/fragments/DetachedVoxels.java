package org.sunder.blockwise.partition.fragments;

import org.sunder.blockwise.graph.AffinityBlock;

/**
 * Voxels that belong to no object by the prediction's own account: a voxel is <em>detached</em>
 * when none of its nearest-neighbour edges (either direction, along every axis) attracts
 * ({@code a >= }{@value #ATTRACTS}), and the same holds for each of its face neighbours. Such
 * voxels are background between objects (a network answers low affinities everywhere there,
 * and an exact prediction answers 0), yet the seeded watershed floods each of them into some
 * fragment, and every one of their edges, long-range ones included, then reads as repulsion
 * between that fragment and whatever the edge reaches. On the tissue presets those edges are
 * what keeps the pieces of a split object apart ({@code SplitSurvey}); the fragment methods
 * leave them out of their costs, as they leave out a defective section's.
 *
 * <p>The one-voxel erosion keeps voxels that merely lie on a predicted boundary (whose
 * neighbours along the boundary attract them, or whose neighbours do) out of the set: a
 * voxel is judged by its neighbourhood of radius {@value #REACH}, so any box that holds that
 * neighbourhood judges it the same way. Edges leaving the box do not count, so voxels within
 * {@value #REACH} of a cut face may be judged differently by another box. O(voxels ·
 * nearest-neighbour channels); allocates one byte per voxel twice.
 */
public final class DetachedVoxels {
  /** The affinity from which an edge attracts. */
  public static final double ATTRACTS = 0.5;
  /** How far from a voxel the judgement looks, in voxels along any axis. */
  public static final int REACH = 2;

  private DetachedVoxels() {}

  /** Per voxel of {@code block}, 1 when detached, else 0. */
  public static byte[] find(AffinityBlock block) {
    int[] shape = block.shape();
    int n = block.voxelCount();
    int[][] offsets = block.offsets().vectors();
    byte[] attached = new byte[n];
    for (int k = 0; k < offsets.length; k++) {
      int axis = nearestAxis(offsets[k]);
      if (axis >= 0) {
        markAttached(block, k, axis, offsets[k][axis], attached);
      }
    }
    byte[] detached = new byte[n];
    for (int i = 0; i < n; i++) {
      detached[i] = (byte) (1 - attached[i]);
    }
    // the erosion: a voxel beside an attached one is not detached
    int stride = 1;
    for (int axis = 0; axis < shape.length; axis++) {
      int extent = shape[axis];
      int outer = n / (stride * extent);
      for (int hi = 0; hi < outer; hi++) {
        for (int c = 0; c < extent; c++) {
          int base = stride * (c + extent * hi);
          for (int i = base; i < base + stride; i++) {
            if (c > 0 && attached[i - stride] != 0
                || c + 1 < extent && attached[i + stride] != 0) {
              detached[i] = 0;
            }
          }
        }
      }
      stride *= extent;
    }
    return detached;
  }

  /**
   * Marks both ends of every edge of channel {@code k} (a nearest-neighbour offset of
   * {@code sign} along {@code axis}) whose affinity attracts; rows in memory order, no division
   * per voxel.
   */
  private static void markAttached(AffinityBlock block, int k, int axis, int sign,
      byte[] attached) {
    int[] shape = block.shape();
    int stride = 1;
    for (int d = 0; d < axis; d++) {
      stride *= shape[d];
    }
    int extent = shape[axis];
    int outer = block.voxelCount() / (stride * extent);
    int step = sign * stride;
    for (int hi = 0; hi < outer; hi++) {
      for (int c = Math.max(0, -sign); c < Math.min(extent, extent - sign); c++) {
        int base = stride * (c + extent * hi);
        for (int i = base; i < base + stride; i++) {
          if (block.affinity(i, k) >= ATTRACTS) {
            attached[i] = 1;
            attached[i + step] = 1;
          }
        }
      }
    }
  }

  /** The axis of a nearest-neighbour offset (one component of magnitude 1), else -1. */
  private static int nearestAxis(int[] offset) {
    int axis = -1;
    for (int d = 0; d < offset.length; d++) {
      if (offset[d] != 0) {
        if (axis >= 0 || Math.abs(offset[d]) != 1) {
          return -1;
        }
        axis = d;
      }
    }
    return axis;
  }
}
