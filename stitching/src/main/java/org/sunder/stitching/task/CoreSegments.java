package org.sunder.stitching.task;

import java.util.Arrays;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.PairSums;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.partition.PieceEdges;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;

/**
 * From the partition of a block's extended box to its core: provisional labels and the
 * {@link BlockSummary}.
 *
 * <p>The partition comes as a {@link SettledPartition} whose open voxels are those with edges
 * leaving the extended box ({@link #openVoxels}): the core's segments are its pieces, so a merge
 * the block made on the strength of its halo is left to the global solve, which sees all the
 * edges. Boundary segments are the pieces near a face and the unsettled pieces.
 *
 * <p>Local ids are the pieces present in the core, renumbered from 1 in ascending order of the
 * piece label; when the core is the whole extended box (one block covering the volume) local ids
 * equal the partition's labels.
 *
 * <p>Inner edges count only edges with <em>both</em> ends in the core; edges reaching into the
 * halo are left to the block that owns the other end or to the face that owns them (see
 * {@link SeamEdges}). So every voxel edge of the volume is counted exactly once, and the reduced
 * graph's statistics are those of the whole volume's region graph of the provisional labels,
 * restricted to boundary segments.
 *
 * <p>Separated pairs: pairs of settled boundary segments joined by at least one repulsive edge
 * (weight {@code < 0}) anywhere in the extended box. For the Mutex Watershed these are exactly
 * the pairs the block kept apart by a mutual exclusion (every repulsive edge between two final
 * clusters adds one) on the strength of its core alone; touching segments without such an edge
 * were merely not connected inside the box, and the solve may still join them through another
 * block. Unsettled pieces have no separated pairs: the solve decides them from their edges.
 * O(extended voxels * offsets).
 */
public final class CoreSegments {
  /** Where {@link #innerEdgesOfPieces} puts a row: among the core's pairs or the interior's. */
  private static final byte CORE_ROW = 1;
  private static final byte INTERIOR_ROW = 2;

  private CoreSegments() {}

  /**
   * The provisional labels of the core (core order), the block's summary and, when asked for,
   * the core's continuation flags (core order, see {@link #continuations}), else null.
   */
  public record Result(long[] provisionalLabels, BlockSummary summary, byte[] continuations) {}

  /**
   * The open voxels of a block's extended box (memory order): those closer to a side of the box
   * that lies inside the volume than the longest offset along that axis, so that some of their
   * edges leave the box. None when the extended box is the whole volume.
   */
  static byte[] openVoxels(BlockGrid grid, Block block, Offsets offsets) {
    int n = grid.numDimensions();
    int[] shape = block.extendedShape();
    int[] reach = offsets.reach();
    int[] lowEnd = new int[n];
    int[] highStart = new int[n];
    long[] min = block.extendedMin();
    long[] max = block.extendedMax();
    for (int d = 0; d < n; d++) {
      lowEnd[d] = min[d] > 0 ? reach[d] : 0;
      highStart[d] = max[d] < grid.volumeShape()[d] - 1 ? shape[d] - reach[d] : Integer.MAX_VALUE;
    }
    int voxels = Shapes.intElementCount(shape);
    byte[] open = new byte[voxels];
    int[] p = new int[n];
    for (int i = 0; i < voxels; i++) {
      for (int d = 0; d < n; d++) {
        if (p[d] < lowEnd[d] || p[d] >= highStart[d]) {
          open[i] = 1;
          break;
        }
      }
      for (int d = 0; d < n; d++) {
        if (++p[d] < shape[d]) {
          break;
        }
        p[d] = 0;
      }
    }
    return open;
  }

  /** The core's voxels of a block's extended box (memory order), flagged 1. O(extended voxels). */
  static byte[] coreVoxels(Block block) {
    byte[] core = new byte[Shapes.intElementCount(block.extendedShape())];
    for (int i : Shapes.subBoxIndices(block.extendedShape(),
        BoxIndex.origin(block.extendedMin(), block.coreMin()), block.coreShape())) {
      core[i] = 1;
    }
    return core;
  }

  /**
   * The voxels of a block's extended box (memory order) whose segments a per-block size filter
   * must leave alone because the block sees only part of them: the halo, and the core's voxels
   * closer to a face than the longest offset along its axis (those of boundary segments). The
   * complement is where whole non-boundary segments lie. O(extended voxels).
   */
  static byte[] partialVoxels(BlockGrid grid, Block block, Offsets offsets) {
    int n = grid.numDimensions();
    int[] shape = block.extendedShape();
    int[] reach = offsets.reach();
    long[] extMin = block.extendedMin();
    long[] coreMin = block.coreMin();
    int[] coreShape = block.coreShape();
    int[] lowEnd = new int[n];
    int[] highStart = new int[n];
    for (int d = 0; d < n; d++) {
      int origin = (int) (coreMin[d] - extMin[d]);
      boolean lowFace = grid.faceIndex(block.index(), d, false) >= 0;
      boolean highFace = grid.faceIndex(block.index(), d, true) >= 0;
      lowEnd[d] = origin + (lowFace ? reach[d] : 0);
      highStart[d] = origin + coreShape[d] - (highFace ? reach[d] : 0);
    }
    int voxels = Shapes.intElementCount(shape);
    byte[] partial = new byte[voxels];
    int[] p = new int[n];
    for (int i = 0; i < voxels; i++) {
      for (int d = 0; d < n; d++) {
        if (p[d] < lowEnd[d] || p[d] >= highStart[d]) {
          partial[i] = 1;
          break;
        }
      }
      for (int d = 0; d < n; d++) {
        if (++p[d] < shape[d]) {
          break;
        }
        p[d] = 0;
      }
    }
    return partial;
  }

  /**
   * @param filterNodesBelow which segments the size filter after the solve judges, and so
   *     which {@link BlockSummary#interiorEdges()} to collect: 0 none (no size filter); 1 the
   *     boundary segments (the block filtered the others itself); {@code k > 1} the boundary
   *     segments and every segment of fewer than {@code k} core voxels (the block filtered
   *     nothing)
   * @param markContinuations whether to compute {@link #continuations} (fragment methods)
   * @param extendedGraph the extended box's edges; may be null when the partition carries the
   *     statistics between its pieces ({@link SettledPartition#edgesOrNull()})
   */
  public static Result of(BlockGrid grid, IdLayout layout, Block block, Offsets offsets,
      SettledPartition partition, GridGraph extendedGraph, int filterNodesBelow,
      boolean markContinuations) {
    Segmentation segmentation = partition.pieces();
    int[] extShape = block.extendedShape();
    int[] coreShape = block.coreShape();
    int[] coreIndex = Shapes.subBoxIndices(extShape,
        BoxIndex.origin(block.extendedMin(), block.coreMin()), coreShape);
    int[] labels = segmentation.labels();
    int[] localOf = new int[segmentation.segmentCount() + 1];
    for (int i : coreIndex) {
      localOf[labels[i]] = 1;
    }
    int localCount = 0;
    for (int label = 1; label < localOf.length; label++) {
      localOf[label] = localOf[label] == 0 ? 0 : ++localCount;
    }
    localOf[0] = 0;
    long[] sizes = new long[localCount];
    int[] coreLocal = new int[coreIndex.length];
    for (int i = 0; i < coreIndex.length; i++) {
      int local = localOf[labels[coreIndex[i]]];
      coreLocal[i] = local;
      if (local > 0) {
        sizes[local - 1]++;
      }
    }
    int[] sides = boundarySides(grid, block, offsets, coreShape, coreLocal, localCount);
    boolean[] boundary = new boolean[localCount + 1];
    boolean[] unsettled = new boolean[localCount + 1];
    int boundaryCount = 0;
    for (int label = 1; label < localOf.length; label++) {
      int local = localOf[label];
      if (local != 0) {
        unsettled[local] = partition.unsettled()[label];
        boundary[local] = sides[local] != 0 || unsettled[local];
        boundaryCount += boundary[local] ? 1 : 0;
      }
    }
    long[] firstVoxels = firstVoxels(grid.volumeShape(), block, coreLocal, localCount);
    int[] boundaryIds = new int[boundaryCount];
    int[] boundarySides = new int[boundaryCount];
    long[] boundaryFirstVoxels = new long[boundaryCount];
    int next = 0;
    for (int k = 1; k <= localCount; k++) {
      if (boundary[k]) {
        boundaryIds[next] = k;
        boundaryFirstVoxels[next] = firstVoxels[k];
        boundarySides[next++] = sides[k];
      }
    }
    boolean[] filterNode = new boolean[localCount + 1];
    if (filterNodesBelow > 0) {
      for (int k = 1; k <= localCount; k++) {
        filterNode[k] = boundary[k] || sizes[k - 1] < filterNodesBelow;
      }
    }
    Inner inner = partition.edgesOrNull() != null
        ? innerEdgesOfPieces(layout, block.index(), localOf, boundary, unsettled, filterNode,
            partition.edgesOrNull())
        : innerEdges(layout, block.index(), labels, localOf, coreIndex, boundary, unsettled,
            extendedGraph, filterNode);
    long[] provisional = new long[coreLocal.length];
    for (int i = 0; i < coreLocal.length; i++) {
      int local = coreLocal[i];
      provisional[i] = local == 0 ? 0 : layout.provisional(block.index(), local);
    }
    return new Result(provisional,
        new BlockSummary(block.index(), sizes, boundaryIds, boundarySides, boundaryFirstVoxels,
            inner.edges(), inner.separatedU(), inner.separatedV(), inner.interior()),
        markContinuations ? continuations(grid, block, labels, coreIndex) : null);
  }

  /**
   * Per local id {@code 1..localCount}, the index in the volume (memory order) of its first
   * voxel in the core ({@code coreLocal}: local ids in core order, 0 for none). O(core voxels).
   */
  static long[] firstVoxels(long[] volumeShape, Block block, int[] coreLocal, int localCount) {
    int[] firstInCore = new int[localCount + 1];
    Arrays.fill(firstInCore, -1);
    for (int i = 0; i < coreLocal.length; i++) {
      if (coreLocal[i] > 0 && firstInCore[coreLocal[i]] < 0) {
        firstInCore[coreLocal[i]] = i;
      }
    }
    int[] coreShape = block.coreShape();
    long[] coreMin = block.coreMin();
    long[] first = new long[localCount + 1];
    for (int local = 1; local <= localCount; local++) {
      int rest = firstInCore[local];
      long index = 0;
      long stride = 1;
      for (int d = 0; d < coreShape.length; d++) {
        index += (coreMin[d] + rest % coreShape[d]) * stride;
        rest /= coreShape[d];
        stride *= volumeShape[d];
      }
      first[local] = index;
    }
    return first;
  }

  /**
   * Per core voxel (core order), the sides across which its piece continues: bit
   * {@code 2 * axis + upper} is set when the voxel lies in the core's outermost layer on that
   * side, the side has a face, and the voxel just across it (in the halo) carries the same
   * non-zero piece label. Where both blocks of a face mark a voxel pair, both saw one piece run
   * through it; see {@link SeamEdges#continued()}. O(core voxels).
   */
  static byte[] continuations(BlockGrid grid, Block block, int[] pieceLabels, int[] coreIndex) {
    int n = grid.numDimensions();
    int[] extShape = block.extendedShape();
    int[] coreShape = block.coreShape();
    int[] origin = BoxIndex.origin(block.extendedMin(), block.coreMin());
    int[] stride = new int[n];
    boolean[] low = new boolean[n];
    boolean[] high = new boolean[n];
    int s = 1;
    for (int d = 0; d < n; d++) {
      stride[d] = s;
      s *= extShape[d];
      low[d] = grid.faceIndex(block.index(), d, false) >= 0 && origin[d] > 0;
      high[d] = grid.faceIndex(block.index(), d, true) >= 0
          && origin[d] + coreShape[d] < extShape[d];
    }
    byte[] flags = new byte[coreIndex.length];
    int[] p = new int[n];
    for (int i = 0; i < coreIndex.length; i++) {
      int at = coreIndex[i];
      int label = pieceLabels[at];
      if (label != 0) {
        int mask = 0;
        for (int d = 0; d < n; d++) {
          if (low[d] && p[d] == 0 && pieceLabels[at - stride[d]] == label) {
            mask |= 1 << (2 * d);
          }
          if (high[d] && p[d] == coreShape[d] - 1 && pieceLabels[at + stride[d]] == label) {
            mask |= 1 << (2 * d + 1);
          }
        }
        flags[i] = (byte) mask;
      }
      for (int d = 0; d < n; d++) {
        if (++p[d] < coreShape[d]) {
          break;
        }
        p[d] = 0;
      }
    }
    return flags;
  }

  /**
   * Per local id, the mask of sides (bit {@code 2 * axis + upper}) that have a face and that
   * the segment comes closer to than the longest offset along the axis.
   */
  private static int[] boundarySides(BlockGrid grid, Block block, Offsets offsets,
      int[] coreShape, int[] coreLocal, int localCount) {
    int n = coreShape.length;
    int[] depth = offsets.reach();
    int[] lowEnd = new int[n];
    int[] highStart = new int[n];
    for (int d = 0; d < n; d++) {
      boolean lowFace = grid.faceIndex(block.index(), d, false) >= 0;
      boolean highFace = grid.faceIndex(block.index(), d, true) >= 0;
      lowEnd[d] = lowFace ? depth[d] : 0;
      highStart[d] = highFace ? coreShape[d] - depth[d] : Integer.MAX_VALUE;
    }
    int[] sides = new int[localCount + 1];
    int[] p = new int[n];
    for (int i = 0; i < coreLocal.length; i++) {
      int local = coreLocal[i];
      if (local != 0) {
        int mask = 0;
        for (int d = 0; d < n; d++) {
          if (p[d] < lowEnd[d]) {
            mask |= 1 << (2 * d);
          }
          if (p[d] >= highStart[d]) {
            mask |= 1 << (2 * d + 1);
          }
        }
        sides[local] |= mask;
      }
      for (int d = 0; d < n; d++) {
        if (++p[d] < coreShape[d]) {
          break;
        }
        p[d] = 0;
      }
    }
    return sides;
  }

  /** Core-only statistics and separated pairs (extended box) of the boundary segments. */
  private record Inner(EdgeStatistics edges, long[] separatedU, long[] separatedV,
      EdgeStatistics interior) {}

  /**
   * @param filterNode per local id, whether the size filter after the solve judges it: the
   *     interior statistics hold the core's edges between a filter node and another segment,
   *     except between two boundary segments (those are the inner edges)
   */
  private static Inner innerEdges(IdLayout layout, int block, int[] labels, int[] localOf,
      int[] coreIndex, boolean[] boundary, boolean[] unsettled, GridGraph extendedGraph,
      boolean[] filterNode) {
    int[] boundaryOf = new int[localOf.length];
    boolean[] filterOf = new boolean[localOf.length];
    boolean any = false;
    boolean withInteriorEdges = false;
    for (int label = 1; label < localOf.length; label++) {
      int local = localOf[label];
      if (local != 0 && boundary[local]) {
        boundaryOf[label] = local;
        any = true;
      }
      if (local != 0 && filterNode[local]) {
        filterOf[label] = true;
        withInteriorEdges = true;
      }
    }
    if (!any && !withInteriorEdges) {
      return new Inner(EdgeStatistics.empty(), new long[0], new long[0],
          EdgeStatistics.empty());
    }
    boolean[] inCore = new boolean[labels.length];
    for (int i : coreIndex) {
      inCore[i] = true;
    }
    PairSums core = new PairSums(extendedGraph);
    EdgeStatistics.Accumulator repulsive = new EdgeStatistics.Accumulator(256);
    PairSums interior = new PairSums(extendedGraph);
    boolean interiorEdges = withInteriorEdges;
    core.forEachValueAcross(labels, (s, t, k, w) -> {
      int a = boundaryOf[labels[s]];
      int b = boundaryOf[labels[t]];
      if (interiorEdges && (a == 0 || b == 0) && (filterOf[labels[s]] || filterOf[labels[t]])
          && inCore[s] && inCore[t]) {
        int ls = localOf[labels[s]];
        int lt = localOf[labels[t]];
        if (ls != 0 && lt != 0 && ls != lt) {
          interior.add(ls, lt, w);
        }
        return;
      }
      if (a == 0 || b == 0 || a == b) {
        return;
      }
      if (inCore[s] && inCore[t]) {
        core.add(a, b, w);
      }
      if (core.repels(w) && !unsettled[a] && !unsettled[b]) {
        repulsive.add(a, b, 1);
      }
    });
    return inner(layout, block, core.build(), repulsive, interior.build());
  }

  /** The accumulated statistics of local ids as an {@link Inner} of provisional ids. */
  private static Inner inner(IdLayout layout, int block, EdgeStatistics core,
      EdgeStatistics.Accumulator repulsive, EdgeStatistics interior) {
    EdgeStatistics apart = repulsive.build();
    long[] su = new long[apart.size()];
    long[] sv = new long[apart.size()];
    for (int e = 0; e < apart.size(); e++) {
      su[e] = layout.provisional(block, apart.u(e));
      sv[e] = layout.provisional(block, apart.v(e));
    }
    return new Inner(provisional(layout, block, core), su, sv,
        provisional(layout, block, interior));
  }

  /**
   * As {@link #innerEdges}, from the statistics between pieces that the partition measured
   * (inside = the core) instead of a pass over the box's edges: the same rows, with sums that
   * may differ in the last bits (added in another order). O(piece pairs).
   */
  private static Inner innerEdgesOfPieces(IdLayout layout, int block, int[] localOf,
      boolean[] boundary, boolean[] unsettled, boolean[] filterNode, PieceEdges pieces) {
    EdgeStatistics inside = pieces.inside();
    // which rows go where, counted first, so each table is sized once (a row is at most a pair)
    byte[] target = new byte[inside.size()];
    int coreRows = 0;
    int interiorRows = 0;
    for (int e = 0; e < inside.size(); e++) {
      int ls = localOf[(int) inside.u(e)];
      int lt = localOf[(int) inside.v(e)];
      if (ls != 0 && lt != 0) {
        target[e] = boundary[ls] && boundary[lt] ? CORE_ROW
            : filterNode[ls] || filterNode[lt] ? INTERIOR_ROW : 0;
        coreRows += target[e] == CORE_ROW ? 1 : 0;
        interiorRows += target[e] == INTERIOR_ROW ? 1 : 0;
      }
    }
    EdgeStatistics.Accumulator core = new EdgeStatistics.Accumulator(coreRows);
    EdgeStatistics.Accumulator interior = new EdgeStatistics.Accumulator(interiorRows);
    for (int e = 0; e < inside.size(); e++) {
      if (target[e] != 0) {
        (target[e] == CORE_ROW ? core : interior).add(localOf[(int) inside.u(e)],
            localOf[(int) inside.v(e)], inside.sum(e), inside.count(e), inside.min(e),
            inside.max(e));
      }
    }
    EdgeStatistics anywhere = pieces.anywhere();
    EdgeStatistics.Accumulator repulsive = new EdgeStatistics.Accumulator(256);
    for (int e = 0; e < anywhere.size(); e++) {
      int a = localOf[(int) anywhere.u(e)];
      int b = localOf[(int) anywhere.v(e)];
      if (a != 0 && b != 0 && boundary[a] && boundary[b] && anywhere.min(e) < 0
          && !unsettled[a] && !unsettled[b]) {
        repulsive.add(a, b, anywhere.min(e));
      }
    }
    return inner(layout, block, core.build(), repulsive, interior.build());
  }

  /** {@code local} with local ids replaced by provisional ids. */
  private static EdgeStatistics provisional(IdLayout layout, int block, EdgeStatistics local) {
    int m = local.size();
    long[] u = new long[m];
    long[] v = new long[m];
    for (int e = 0; e < m; e++) {
      u[e] = layout.provisional(block, local.u(e));
      v[e] = layout.provisional(block, local.v(e));
    }
    return EdgeStatistics.of(u, v, local.copySum(), local.copyCount(), local.copyMin(),
        local.copyMax());
  }
}
