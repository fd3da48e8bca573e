package org.sunder.blockwise.partition;

import java.util.Objects;
import org.sunder.blockwise.graph.AffinityBlock;

/**
 * A block's partition that keeps apart what the block joined only through voxels it cannot
 * fully see. A voxel is <em>open</em> when some of its edges leave the box (a halo voxel near a
 * cut face). The {@code pieces} refine the method's full result: for the Mutex Watershed, the
 * method runs as usual but a merge made by an edge with an open end is held back (open voxels
 * stay single, and two parts of a cluster joined only through open voxels are separate pieces);
 * for the fragment methods, a cluster that holds an open voxel is given back as its fragments.
 * {@code unsettled[label]} is true for a piece whose cluster in the method's full result holds
 * an open voxel; such a piece waits for the global solve, every other piece is a whole segment
 * of the full result. Without open voxels, the pieces are the method's partition and none is
 * unsettled. {@code edgesOrNull} holds the statistics between the pieces when the method
 * measured them in passing (see {@link Partitioner#partitionSettled(AffinityBlock, byte[],
 * byte[])}), else null.
 */
public record SettledPartition(Segmentation pieces, boolean[] unsettled, PieceEdges edgesOrNull) {

  public SettledPartition {
    Objects.requireNonNull(pieces, "pieces");
    if (unsettled.length != pieces.segmentCount() + 1) {
      throw new IllegalArgumentException("unsettled has " + unsettled.length
          + " entries for " + pieces.segmentCount() + " pieces (label 0 included)");
    }
  }

  /** A partition whose piece statistics were not measured. */
  public SettledPartition(Segmentation pieces, boolean[] unsettled) {
    this(pieces, unsettled, null);
  }

  /** This partition carrying {@code edges}, the statistics between its pieces. */
  public SettledPartition withEdges(PieceEdges edges) {
    return new SettledPartition(pieces, unsettled, Objects.requireNonNull(edges, "edges"));
  }

  /** A partition that held nothing back: every segment is a settled piece. */
  public static SettledPartition whole(Segmentation segmentation) {
    return new SettledPartition(segmentation, new boolean[segmentation.segmentCount() + 1]);
  }

  /**
   * From a method's full node-to-cluster map and the map of its pieces (cluster ids in
   * {@code [0, n)}, e.g. union-find roots); {@code open} marks the open voxels. {@code O(n)}.
   */
  public static SettledPartition of(int[] clusterOf, int[] pieceOf, byte[] open, byte[] maskOrNull) {
    int n = clusterOf.length;
    boolean[] clusterOpen = new boolean[n];
    for (int i = 0; i < n; i++) {
      if (open[i] != 0 && (maskOrNull == null || maskOrNull[i] != 0)) {
        clusterOpen[clusterOf[i]] = true;
      }
    }
    Segmentation pieces = Segmentation.fromClusters(pieceOf, maskOrNull);
    boolean[] unsettled = new boolean[pieces.segmentCount() + 1];
    int[] labels = pieces.labels();
    for (int i = 0; i < n; i++) {
      if (labels[i] != 0 && clusterOpen[clusterOf[i]]) {
        unsettled[labels[i]] = true;
      }
    }
    return new SettledPartition(pieces, unsettled);
  }

  /** Checks that {@code open} has one flag per voxel of an {@code n}-voxel box. */
  public static void checkOpen(byte[] open, int n) {
    if (open.length != n) {
      throw new IllegalArgumentException("open has " + open.length + " flags for " + n
          + " voxels");
    }
  }
}
