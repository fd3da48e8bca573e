package org.sunder.stitching.task;

import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.PairSums;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.grid.Shapes;

/**
 * The edges a face owns (see {@link SeamEdges} for the ownership rule), aggregated per pair of
 * provisional ids, from the labels and affinities of the face's slab. O(slab voxels * offsets).
 */
public final class SeamExtraction {
  private SeamExtraction() {}

  /** A box in global coordinates, inclusive maxima. */
  public record Box(long[] min, long[] max) {}

  /**
   * The slab of {@code face}: along the face's axis as deep on each side as the longest offset
   * component along it; across, the face's extent widened by the longest offset component
   * along each other axis (for edges to diagonal neighbours); clipped to the volume.
   */
  public static Box slab(BlockGrid grid, Face face, Offsets offsets) {
    int n = grid.numDimensions();
    long[] volume = grid.volumeShape();
    long[] min = face.lateralMin();
    long[] max = face.lateralMax();
    int[] longest = offsets.reach();
    for (int d = 0; d < n; d++) {
      int reach = longest[d];
      if (d == face.axis()) {
        min[d] = Math.max(0, face.position() - Math.max(1, reach));
        max[d] = Math.min(volume[d] - 1, face.position() + Math.max(1, reach) - 1);
      } else {
        min[d] = Math.max(0, min[d] - reach);
        max[d] = Math.min(volume[d] - 1, max[d] + reach);
      }
    }
    return new Box(min, max);
  }

  /**
   * The face's seam edges from {@code labels} (provisional ids over the slab, memory order) and
   * {@code slabGraph} (the grid graph of the slab's affinities).
   */
  public static SeamEdges extract(BlockGrid grid, Face face, long[] labels, GridGraph slabGraph) {
    return extract(grid, face, labels, null, null, slabGraph);
  }

  /**
   * As {@link #extract(BlockGrid, Face, long[], GridGraph)}, and with {@code continuations}
   * (the blocks' continuation flags over the slab, or null) the face's continued pairs; edges
   * with an end where {@code ignoredOrNull} (one flag per slab voxel, or null) is non-zero are
   * left out, as the blocks leave out a defective section's edges. Pairs are summed as a
   * block's region graph sums them ({@link PairSums}), so that the reduced graph's sums agree
   * with a one-block run's up to their last bits.
   */
  public static SeamEdges extract(BlockGrid grid, Face face, long[] labels, byte[] continuations,
      byte[] ignoredOrNull, GridGraph slabGraph) {
    long[] min = slabGraph.block().globalMin();
    int[] shape = slabGraph.block().shape();
    SlabBlocks blocks = new SlabBlocks(grid, min, shape);
    int[] blockOf = blocks.ofVoxels();
    int count = blocks.count();
    boolean[] owned = blocks.ownedBy(face);
    PairSums sums = new PairSums(slabGraph);
    sums.forEachValueAcross(labels, (s, t, k, value) -> {
      int bs = blockOf[s];
      int bt = blockOf[t];
      if (bs == bt) {
        return;
      }
      long ls = labels[s];
      long lt = labels[t];
      if (ls == 0 || lt == 0
          || ignoredOrNull != null && (ignoredOrNull[s] | ignoredOrNull[t]) != 0) {
        return;
      }
      if (owned[bs * count + bt]) {
        sums.add(ls, lt, value);
      }
    });
    EdgeStatistics continued = continuations == null ? EdgeStatistics.empty()
        : continued(face, labels, continuations, min, shape);
    return new SeamEdges(face.index(), sums.build(), continued);
  }

  /**
   * Counts, per pair of provisional ids, the voxel pairs across the face that both blocks
   * flagged as continuing (the lower voxel's upper-side bit and the upper voxel's lower-side
   * bit along the face's axis). O(face area).
   */
  private static EdgeStatistics continued(Face face, long[] labels, byte[] flags, long[] min,
      int[] shape) {
    int n = shape.length;
    int axis = face.axis();
    int upperBit = 1 << (2 * axis + 1);
    int lowerBit = 1 << (2 * axis);
    long[] lateralMin = face.lateralMin();
    long[] lateralMax = face.lateralMax();
    int[] from = new int[n];
    int[] to = new int[n];
    int[] stride = new int[n];
    int s = 1;
    for (int d = 0; d < n; d++) {
      stride[d] = s;
      s *= shape[d];
      from[d] = (int) (Math.max(lateralMin[d], min[d]) - min[d]);
      to[d] = (int) (Math.min(lateralMax[d], min[d] + shape[d] - 1) - min[d]);
    }
    from[axis] = (int) (face.position() - min[axis]);
    to[axis] = from[axis];
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(256);
    if (from[axis] < 1 || from[axis] >= shape[axis]) {
      return acc.build();
    }
    int[] p = from.clone();
    while (true) {
      int upper = 0;
      for (int d = 0; d < n; d++) {
        upper += p[d] * stride[d];
      }
      int lower = upper - stride[axis];
      long a = labels[lower];
      long b = labels[upper];
      if (a != 0 && b != 0 && a != b && (flags[lower] & upperBit) != 0
          && (flags[upper] & lowerBit) != 0) {
        acc.add(a, b, 1);
      }
      int d = 0;
      while (d < n && ++p[d] > to[d]) {
        p[d] = from[d];
        d++;
      }
      if (d == n) {
        return acc.build();
      }
    }
  }

  /**
   * The blocks a slab touches, numbered within the slab (dimension 0 fastest), so that an
   * edge's owner is one look-up in a table of block pairs instead of divisions per edge.
   */
  private static final class SlabBlocks {
    private final BlockGrid grid;
    private final long[] min;
    private final int[] shape;
    /** Per axis, the grid coordinate of the slab's first block and the blocks it spans. */
    private final long[] first;
    private final int[] extent;
    private final int count;

    SlabBlocks(BlockGrid grid, long[] min, int[] shape) {
      this.grid = grid;
      this.min = min;
      this.shape = shape;
      int n = shape.length;
      first = new long[n];
      extent = new int[n];
      int product = 1;
      for (int d = 0; d < n; d++) {
        first[d] = grid.blockCoordinate(d, min[d]);
        extent[d] = (int) (grid.blockCoordinate(d, min[d] + shape[d] - 1) - first[d] + 1);
        product *= extent[d];
      }
      count = product;
    }

    int count() {
      return count;
    }

    /** Per slab voxel (memory order), the slab number of its block. */
    int[] ofVoxels() {
      int n = shape.length;
      int[][] partial = new int[n][];
      int stride = 1;
      for (int d = 0; d < n; d++) {
        partial[d] = new int[shape[d]];
        for (int x = 0; x < shape[d]; x++) {
          partial[d][x] = (int) (grid.blockCoordinate(d, min[d] + x) - first[d]) * stride;
        }
        stride *= extent[d];
      }
      int[] blockOf = new int[Shapes.intElementCount(shape)];
      int[] p = new int[n];
      for (int i = 0; i < blockOf.length; i++) {
        int index = 0;
        for (int d = 0; d < n; d++) {
          index += partial[d][p[d]];
        }
        blockOf[i] = index;
        for (int d = 0; d < n; d++) {
          if (++p[d] < shape[d]) {
            break;
          }
          p[d] = 0;
        }
      }
      return blockOf;
    }

    /**
     * Per pair of slab blocks {@code (a, b)} at {@code a * count + b}, whether {@code face} owns
     * their edges: the first axis (dimension 0 first) along which the two blocks differ is the
     * face's, and the lower of the two along it is the face's lower block.
     */
    boolean[] ownedBy(Face face) {
      int n = shape.length;
      long[][] position = new long[count][n];
      int[] block = new int[count];
      for (int b = 0; b < count; b++) {
        int rest = b;
        for (int d = 0; d < n; d++) {
          position[b][d] = first[d] + rest % extent[d];
          rest /= extent[d];
        }
        block[b] = grid.blockIndex(position[b]);
      }
      boolean[] owned = new boolean[count * count];
      for (int a = 0; a < count; a++) {
        for (int b = 0; b < count; b++) {
          int d = 0;
          while (d < n && position[a][d] == position[b][d]) {
            d++;
          }
          int lowerOfTwo = d < n && position[a][d] < position[b][d] ? block[a] : block[b];
          owned[a * count + b] = d == face.axis() && lowerOfTwo == face.lowerBlock();
        }
      }
      return owned;
    }
  }
}
