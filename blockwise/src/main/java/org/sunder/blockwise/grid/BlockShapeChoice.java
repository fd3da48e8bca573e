package org.sunder.blockwise.grid;

import java.util.Arrays;

/**
 * A default block shape: whole chunks, large enough that little of each task is halo, small
 * enough that one task fits its memory and that there are enough tasks for the cores.
 *
 * <p>The cost of the halo is the <em>halo overhead</em>: the voxels all blocks read and partition
 * (their extended boxes, clipped to the volume) divided by the voxels of the volume. It is a
 * product over axes, so it is computed exactly in {@code O(dimensions × blocks per axis)}.
 *
 * <p>The choice is greedy: starting from one chunk, it grows, one chunk at a time, the axis whose
 * growth lowers the overhead most, while the largest extended box stays within the memory budget
 * and the grid keeps at least the requested number of blocks. It stops as soon as the overhead is
 * at or below the target; when it cannot get there it returns the lowest overhead it passed
 * (a step may raise the overhead when it leaves a thin last block). The result depends only on
 * its arguments.
 *
 * @param blockShape the chosen core shape, memory order, a multiple of the chunk shape
 * @param overhead extended voxels over volume voxels for this shape (1 = no halo cost)
 * @param largestExtendedVoxels voxels of the largest extended box (what one task holds)
 * @param blockCount number of blocks of the grid
 * @param limitedBy what stopped the growth: the target reached, the memory budget, the block
 *     count floor, or the volume (one block spans it)
 */
public record BlockShapeChoice(int[] blockShape, double overhead, long largestExtendedVoxels,
    long blockCount, Limit limitedBy) {

  /** Why the growth stopped. */
  public enum Limit {
    TARGET_REACHED, MEMORY_BUDGET, BLOCK_COUNT, VOLUME
  }

  /** The halo overhead the default aims for (issue target: at most 1.35). */
  public static final double TARGET_OVERHEAD = 1.35;

  public BlockShapeChoice {
    blockShape = blockShape.clone();
  }

  @Override
  public int[] blockShape() {
    return blockShape.clone();
  }

  /**
   * Chooses a block shape.
   *
   * @param volume voxels per axis, memory order
   * @param chunks the chunk shape the blocks are made of
   * @param halo context voxels on each side of a core, per axis
   * @param bytesPerExtendedVoxel what a task holds per voxel of its extended box
   * @param memoryPerTask the budget of one task in bytes
   * @param minBlocks the fewest blocks the grid may have (for example twice the cores), unless
   *     the volume holds fewer chunks
   */
  public static BlockShapeChoice choose(long[] volume, int[] chunks, int[] halo,
      long bytesPerExtendedVoxel, long memoryPerTask, long minBlocks) {
    int n = volume.length;
    if (chunks.length != n || halo.length != n || bytesPerExtendedVoxel <= 0 || memoryPerTask <= 0) {
      throw new IllegalArgumentException("volume " + Arrays.toString(volume) + ", chunks "
          + Arrays.toString(chunks) + ", halo " + Arrays.toString(halo) + ", bytes per voxel "
          + bytesPerExtendedVoxel + ", memory " + memoryPerTask);
    }
    int[] shape = chunks.clone();
    long blockFloor = Math.min(minBlocks, blockCount(volume, shape));
    int[] bestShape = shape.clone();
    while (overhead(volume, shape, halo) > TARGET_OVERHEAD) {
      int best = -1;
      double bestOverhead = Double.POSITIVE_INFINITY;
      boolean memoryStopped = false;
      boolean countStopped = false;
      for (int d = 0; d < n; d++) {
        if (shape[d] >= volume[d]) {
          continue;
        }
        int[] grown = shape.clone();
        grown[d] += chunks[d];
        if (largestExtendedVoxels(volume, grown, halo) > memoryPerTask / bytesPerExtendedVoxel) {
          memoryStopped = true;
          continue;
        }
        if (blockCount(volume, grown) < blockFloor) {
          countStopped = true;
          continue;
        }
        double o = overhead(volume, grown, halo);
        if (o < bestOverhead) {
          bestOverhead = o;
          best = d;
        }
      }
      if (best < 0) {
        return of(volume, bestShape, halo, memoryStopped ? Limit.MEMORY_BUDGET
            : countStopped ? Limit.BLOCK_COUNT : Limit.VOLUME);
      }
      shape[best] += chunks[best];
      if (bestOverhead < overhead(volume, bestShape, halo)) {
        bestShape = shape.clone();
      }
    }
    return of(volume, shape, halo, Limit.TARGET_REACHED);
  }

  private static BlockShapeChoice of(long[] volume, int[] shape, int[] halo, Limit limit) {
    return new BlockShapeChoice(shape, overhead(volume, shape, halo),
        largestExtendedVoxels(volume, shape, halo), blockCount(volume, shape), limit);
  }

  /** Voxels of all extended boxes (clipped to the volume) over the voxels of the volume. */
  public static double overhead(long[] volume, int[] blockShape, int[] halo) {
    double ratio = 1;
    for (int d = 0; d < volume.length; d++) {
      long extended = 0;
      for (long start = 0; start < volume[d]; start += blockShape[d]) {
        long end = Math.min(volume[d], start + blockShape[d]);
        extended += Math.min(volume[d], end + halo[d]) - Math.max(0, start - halo[d]);
      }
      ratio *= (double) extended / volume[d];
    }
    return ratio;
  }

  /** Voxels of the largest extended box (clipped to the volume). */
  public static long largestExtendedVoxels(long[] volume, int[] blockShape, int[] halo) {
    long voxels = 1;
    for (int d = 0; d < volume.length; d++) {
      voxels = Math.multiplyExact(voxels, Math.min(volume[d], blockShape[d] + 2L * halo[d]));
    }
    return voxels;
  }

  private static long blockCount(long[] volume, int[] blockShape) {
    long count = 1;
    for (int d = 0; d < volume.length; d++) {
      count = Math.multiplyExact(count, (volume[d] + blockShape[d] - 1) / blockShape[d]);
    }
    return count;
  }
}
