package org.sunder.stitching;

import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;

/**
 * The edges a face owns (see {@link SeamEdges} for the ownership rule), aggregated per pair of
 * provisional ids, from the labels and affinities of the face's slab. O(slab voxels * offsets).
 */
final class SeamExtraction {
  private SeamExtraction() {}

  /** A box in global coordinates, inclusive maxima. */
  record Box(long[] min, long[] max) {}

  /**
   * The slab of {@code face}: along the face's axis as deep on each side as the longest offset
   * component along it; across, the face's extent widened by the longest offset component
   * along each other axis (for edges to diagonal neighbours); clipped to the volume.
   */
  static Box slab(BlockGrid grid, Face face, Offsets offsets) {
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
  static SeamEdges extract(BlockGrid grid, Face face, long[] labels, GridGraph slabGraph) {
    int n = grid.numDimensions();
    long[] min = slabGraph.block().globalMin();
    int[] shape = slabGraph.block().shape();
    int[] blockOf = blockIndices(grid, min, shape);
    long[] gridShape = grid.gridShape();
    int axis = face.axis();
    int lower = face.lowerBlock();
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(1024);
    slabGraph.forEachEdge((s, t, k, w) -> {
      int bs = blockOf[s];
      int bt = blockOf[t];
      if (bs == bt) {
        return;
      }
      long ls = labels[s];
      long lt = labels[t];
      if (ls == 0 || lt == 0 || ls == lt) {
        return;
      }
      if (owner(bs, bt, gridShape, n, axis) == lower) {
        acc.add(ls, lt, w);
      }
    });
    return new SeamEdges(face.index(), acc.build());
  }

  /**
   * The lower block of the owning face of an edge between blocks {@code bs != bt}, if that face
   * is normal to {@code axis}; else -1.
   */
  private static int owner(int bs, int bt, long[] gridShape, int n, int axis) {
    long rs = bs;
    long rt = bt;
    for (int d = 0; d < n; d++) {
      long gs = rs % gridShape[d];
      long gt = rt % gridShape[d];
      if (gs != gt) {
        if (d != axis) {
          return -1;
        }
        return gs < gt ? bs : bt;
      }
      rs /= gridShape[d];
      rt /= gridShape[d];
    }
    return -1;
  }

  private static int[] blockIndices(BlockGrid grid, long[] min, int[] shape) {
    int n = shape.length;
    int[] blockOf = new int[BoxIndex.voxelCount(shape)];
    long[] gridShape = grid.gridShape();
    long[][] partial = new long[n][];
    long stride = 1;
    for (int d = 0; d < n; d++) {
      partial[d] = new long[shape[d]];
      for (int x = 0; x < shape[d]; x++) {
        partial[d][x] = grid.blockCoordinate(d, min[d] + x) * stride;
      }
      stride *= gridShape[d];
    }
    int[] p = new int[n];
    for (int i = 0; i < blockOf.length; i++) {
      long index = 0;
      for (int d = 0; d < n; d++) {
        index += partial[d][p[d]];
      }
      blockOf[i] = (int) index;
      for (int d = 0; d < n; d++) {
        if (++p[d] < shape[d]) {
          break;
        }
        p[d] = 0;
      }
    }
    return blockOf;
  }
}
