package org.sunder.stitching.task;

import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.BlockGrid;

/**
 * What the partition stage tells the solve about one block. Local ids run {@code 1..n} with
 * {@code n = segmentSizes.length}; the provisional id of local id {@code k} is
 * {@code layout.provisional(block, k)}.
 *
 * <p>A segment is a <em>boundary segment</em> when it has a voxel closer to a face than the
 * longest offset along the face's axis, i.e. when some voxel edge can join it to another block's
 * core, or when it is an unsettled piece of the block's partition (see
 * {@link org.sunder.blockwise.partition.SettledPartition}). Only boundary segments enter the
 * global solve.
 *
 * @param block the block index
 * @param segmentSizes voxels in the core per local id ({@code segmentSizes[k - 1]})
 * @param boundaryLocalIds the local ids of the boundary segments, ascending
 * @param boundarySides per boundary segment, a bit mask of the block's sides it is near:
 *     bit {@code 2 * axis} the lower side along {@code axis}, bit {@code 2 * axis + 1} the upper
 *     side (sides on the volume border never count); 0 for an unsettled piece far from faces
 * @param boundaryFirstVoxels per boundary segment, the index in the volume (memory order) of
 *     its first voxel in the core. The fragment methods' solve orders the joined pieces by the
 *     smallest of these, the order in which a one-block run numbers its fragments, so that
 *     ties fall as they would there
 * @param innerEdges statistics of the edges with both ends in this block's core between two
 *     different boundary segments, keyed by provisional id
 * @param separatedU with {@code separatedV}: the pairs of boundary segments (provisional ids,
 *     {@code u < v}, ascending) joined by a repulsive edge in the block's extended box, which
 *     the block's partition therefore kept apart; the Mutex Watershed's solve keeps them apart
 * @param separatedV see {@code separatedU}
 * @param interiorEdges with a size filter only (else empty): statistics of the core's edges
 *     between a segment the filter after the global solve judges and another segment, except
 *     pairs of boundary segments (those are inner edges), keyed by provisional id, so that the
 *     filter sees every neighbour of a segment it judges. It judges the boundary segments, and
 *     for the fragment methods also every segment smaller than {@code minSegmentSize} (their
 *     blocks filter nothing themselves)
 */
public record BlockSummary(int block, long[] segmentSizes, int[] boundaryLocalIds,
    int[] boundarySides, long[] boundaryFirstVoxels, EdgeStatistics innerEdges,
    long[] separatedU, long[] separatedV,
    EdgeStatistics interiorEdges) implements Serializable {

  /** The number of segments (local ids) of the block. */
  public int segmentCount() {
    return segmentSizes.length;
  }

  /** The face indices of the sides in mask {@code sides}, ascending (allocates). */
  public static int[] faces(BlockGrid grid, int block, int sides) {
    int[] faces = new int[Integer.bitCount(sides)];
    int count = 0;
    for (int bit = 0; bit < 32; bit++) {
      if ((sides & (1 << bit)) != 0) {
        faces[count++] = grid.faceIndex(block, bit / 2, bit % 2 == 1);
      }
    }
    Arrays.sort(faces);
    return faces;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof BlockSummary s && block == s.block
        && Arrays.equals(segmentSizes, s.segmentSizes)
        && Arrays.equals(boundaryLocalIds, s.boundaryLocalIds)
        && Arrays.equals(boundarySides, s.boundarySides)
        && Arrays.equals(boundaryFirstVoxels, s.boundaryFirstVoxels)
        && innerEdges.equals(s.innerEdges)
        && Arrays.equals(separatedU, s.separatedU) && Arrays.equals(separatedV, s.separatedV)
        && interiorEdges.equals(s.interiorEdges);
  }

  @Override
  public int hashCode() {
    return block * 31 + Arrays.hashCode(boundaryLocalIds);
  }

  @Override
  public String toString() {
    return "BlockSummary[block " + block + ", " + segmentSizes.length + " segments, "
        + boundaryLocalIds.length + " on faces, " + innerEdges + "]";
  }
}
