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
 * at or below the target; when it cannot get there it keeps the lowest overhead it passed
 * (a step may raise the overhead when it leaves a thin last block). Then it looks for a shape that
 * keeps the cores busier at no cost in halo or memory ({@link #evenRounds}). The result depends
 * only on its arguments.
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
   * @param cores tasks that run at once
   */
  public static BlockShapeChoice choose(long[] volume, int[] chunks, int[] halo,
      long bytesPerExtendedVoxel, long memoryPerTask, long minBlocks, int cores) {
    BlockShapeChoice grown =
        grow(volume, chunks, halo, bytesPerExtendedVoxel, memoryPerTask, minBlocks);
    return evenRounds(volume, chunks, halo, grown, memoryPerTask / bytesPerExtendedVoxel,
        Math.min(minBlocks, blockCount(volume, chunks)), cores);
  }

  /** The greedy growth alone (see the class comment). */
  static BlockShapeChoice grow(long[] volume, int[] chunks, int[] halo,
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

  /** The largest extended box {@link #evenRounds} accepts, relative to the grown choice's. */
  static final double EVEN_ROUNDS_MEMORY_SLACK = 1.25;

  /**
   * {@code grown}, or the shape of whole chunks that wastes the least of the cores' time among
   * those that are no worse on the rest: halo overhead at most {@code grown}'s, largest extended
   * box at most {@value #EVEN_ROUNDS_MEMORY_SLACK} times {@code grown}'s and within
   * {@code budgetVoxels} (unless {@code grown}'s is not), at least {@code blockFloor} blocks.
   * A shape's cost is its overhead times its round waste, {@code ceil(blocks / cores) × cores /
   * blocks}: the tasks run in rounds of {@code cores}, and a last round that is not full leaves
   * cores idle (9 blocks on 2 cores waste 1/10 of the wall time; 8 blocks of a lower overhead
   * waste none). Keeps {@code grown}'s limit. Time: the product over axes of the chunks along
   * it, and nothing when that exceeds {@value #EVEN_ROUNDS_SEARCH_LIMIT}.
   */
  static BlockShapeChoice evenRounds(long[] volume, int[] chunks, int[] halo,
      BlockShapeChoice grown, long budgetVoxels, long blockFloor, int cores) {
    if (cores < 1) {
      throw new IllegalArgumentException("cores " + cores);
    }
    int n = volume.length;
    int[][] sizes = new int[n][];
    double[][] ratio = new double[n][];
    long[][] count = new long[n][];
    long[][] largest = new long[n][];
    long combinations = 1;
    for (int d = 0; d < n; d++) {
      int candidates = (int) ((volume[d] + chunks[d] - 1) / chunks[d]);
      combinations *= candidates;
      if (combinations > EVEN_ROUNDS_SEARCH_LIMIT) {
        return grown;
      }
      sizes[d] = new int[candidates];
      ratio[d] = new double[candidates];
      count[d] = new long[candidates];
      largest[d] = new long[candidates];
      for (int k = 0; k < candidates; k++) {
        int size = (k + 1) * chunks[d];
        sizes[d][k] = size;
        long[] axis = {volume[d]};
        ratio[d][k] = overhead(axis, new int[] {size}, new int[] {halo[d]});
        count[d][k] = (volume[d] + size - 1) / size;
        largest[d][k] = Math.min(volume[d], size + 2L * halo[d]);
      }
    }
    double maxLargest = Math.min(grown.largestExtendedVoxels() * EVEN_ROUNDS_MEMORY_SLACK,
        Math.max(budgetVoxels, grown.largestExtendedVoxels()));
    double bestCost = grown.overhead() * roundWaste(grown.blockCount(), cores) * (1 - 1e-9);
    int[] best = null;
    int[] k = new int[n];
    while (true) {
      double o = 1;
      long blocks = 1;
      double boxVoxels = 1;
      for (int d = 0; d < n; d++) {
        o *= ratio[d][k[d]];
        blocks *= count[d][k[d]];
        boxVoxels *= largest[d][k[d]];
      }
      if (o <= grown.overhead() && boxVoxels <= maxLargest && blocks >= blockFloor) {
        double cost = o * roundWaste(blocks, cores);
        if (cost < bestCost) {
          bestCost = cost;
          best = k.clone();
        }
      }
      int d = 0;
      while (d < n && ++k[d] == sizes[d].length) {
        k[d++] = 0;
      }
      if (d == n) {
        break;
      }
    }
    if (best == null) {
      return grown;
    }
    int[] shape = new int[n];
    for (int d = 0; d < n; d++) {
      shape[d] = sizes[d][best[d]];
    }
    return of(volume, shape, halo, grown.limitedBy());
  }

  /** Most shapes {@link #evenRounds} compares. */
  static final long EVEN_ROUNDS_SEARCH_LIMIT = 20_000_000;

  /** Core time over busy core time when {@code blocks} tasks run in rounds of {@code cores}. */
  static double roundWaste(long blocks, int cores) {
    long rounds = (blocks + cores - 1) / cores;
    return (double) (rounds * cores) / blocks;
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
