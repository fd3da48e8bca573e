package org.sunder.blockwise.partition.fragments;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.partition.PieceEdges;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;

/**
 * The fragments of one block and the statistics of the signed edges between them: the common
 * first half of the fragment-based methods. {@link BoundaryMap} from the nearest-neighbour
 * channels, {@link WatershedFragments}, for the multicut on sections {@link FragmentBorders}
 * (border voxels moved to the fragment their edges attract most), then the {@link RegionGraph}
 * over every present edge of
 * the block's {@link GridGraph} (all offsets, long-range too).
 *
 * @param labels fragment of each voxel, 1..count, 0 where masked
 * @param count number of fragments
 * @param statistics edge statistics between fragment ids 1..count
 * @param insideStatistics the same over the edges with both ends in the region the caller
 *     marked (see {@link #of(AffinityBlock, FragmentOptions, WeightRule, Subsampling, byte[])}),
 *     or null when none was
 */
public record BlockFragments(int[] labels, int count, EdgeStatistics statistics,
    EdgeStatistics insideStatistics) {

  /**
   * Computes the fragments of {@code block}; with {@code movesBorders} and fragments made per
   * section, their border voxels moved by {@link FragmentBorders} in the block's context, which
   * must then hold every channel (the multicut's fragments; 3D fragments and fragment
   * agglomeration keep the watershed's, see {@link FragmentBorders} for why).
   */
  public static BlockFragments of(AffinityBlock block, FragmentOptions options,
      WeightRule weights, Subsampling subsampling, boolean movesBorders) {
    return of(block, options, weights, subsampling, movesBorders, null);
  }

  /**
   * As {@link #of(AffinityBlock, FragmentOptions, WeightRule, Subsampling, boolean)}, also
   * measuring, in the same pass over the edges, the statistics over the edges whose ends are
   * both marked in {@code insideOrNull} (one flag per voxel; for a block, its core).
   */
  public static BlockFragments of(AffinityBlock block, FragmentOptions options,
      WeightRule weights, Subsampling subsampling, boolean movesBorders, byte[] insideOrNull) {
    FragmentOptions fitted = options.forDimension(block.shape().length);
    AffinityBlock source = source(block);
    int[] inSource = indicesInSource(block);
    boolean[] defective = DefectiveSections.find(source, fitted.voxelSize());
    GridGraph graph = GridGraph.of(block, weights, subsampling);
    byte[] sourceIgnored = ignoredVoxels(source, defective);
    int[] sourceLabels = label(source, fitted, defective);
    if (movesBorders && fitted.sliceAxis() >= 0) {
      if (!source.offsets().equals(block.offsets())) {
        throw new IllegalArgumentException("moving fragment borders reads every channel of the"
            + " context; it has " + source.offsets() + ", the block " + block.offsets());
      }
      sourceLabels = source == block
          ? FragmentBorders.reassign(sourceLabels, graph, sourceIgnored, fitted.sliceAxis())
          : FragmentBorders.reassign(sourceLabels, GridGraph.of(source, weights, subsampling),
              sourceIgnored, fitted.sliceAxis(), movableMin(block), movableMax(block));
    }
    int[] labels = croppedLabels(sourceLabels, inSource);
    byte[] ignored = cropped(sourceIgnored, inSource);
    int count = 0;
    for (int l : labels) {
      count = Math.max(count, l);
    }
    RegionGraph regions = RegionGraph.of(labels, graph, insideOrNull, ignored);
    return new BlockFragments(labels, count, regions.statistics(),
        insideOrNull == null ? null : regions.insideStatistics());
  }

  /**
   * The first corner, in its context, of the box whose border voxels a block moves: its own box
   * and the layer of voxels around it, through which the pieces at its sides connect. Beyond,
   * the context keeps the watershed's fragments, which are what the moves read.
   */
  private static int[] movableMin(AffinityBlock block) {
    int[] min = block.originInContext().clone();
    for (int d = 0; d < min.length; d++) {
      min[d] = Math.max(0, min[d] - 1);
    }
    return min;
  }

  /** The last corner (exclusive) of the box of {@link #movableMin}. */
  private static int[] movableMax(AffinityBlock block) {
    int[] max = block.originInContext().clone();
    for (int d = 0; d < max.length; d++) {
      max[d] = Math.min(block.contextOrNull().shape(d), max[d] + block.shape(d) + 1);
    }
    return max;
  }

  /**
   * Per voxel of {@code block}, 1 where the fragment methods leave the voxel's edges out of
   * their costs: in a {@link DefectiveSections defective section}, or {@link DetachedVoxels
   * detached} from every object. The seams judge the voxels near a face the same way from a slab
   * of affinities that reaches {@link DetachedVoxels#REACH} voxels beyond the face's edges.
   *
   * @param options the fragment options, fitted to the voxel size or not
   */
  public static byte[] ignoredVoxels(AffinityBlock block, FragmentOptions options) {
    FragmentOptions fitted = options.forDimension(block.shape().length);
    AffinityBlock source = source(block);
    return cropped(ignoredVoxels(source, DefectiveSections.find(source, fitted.voxelSize())),
        indicesInSource(block));
  }

  /**
   * The box the voxel-level work reads: the block's {@link AffinityBlock#contextOrNull context}
   * when it has one, so that fragments and voxel judgements near the block's sides are those of
   * a wider box (a seeded watershed floods from seeds anywhere in its box), else the block.
   */
  private static AffinityBlock source(AffinityBlock block) {
    return block.contextOrNull() != null ? block.contextOrNull() : block;
  }

  /**
   * For each voxel of {@code block}'s box, its index in {@link #source}'s box; null when the
   * block has no context (the source is the block).
   */
  private static int[] indicesInSource(AffinityBlock block) {
    return block.contextOrNull() == null ? null : Shapes.subBoxIndices(
        block.contextOrNull().shape(), block.originInContext(), block.shape());
  }

  /**
   * Fragment labels of {@link #source}'s box at {@code inSource} (all of them when null),
   * renumbered 1..count in order of first appearance.
   */
  private static int[] croppedLabels(int[] labels, int[] inSource) {
    if (inSource == null) {
      return labels;
    }
    int[] out = new int[inSource.length];
    for (int i = 0; i < inSource.length; i++) {
      out[i] = labels[inSource[i]];
    }
    return WatershedFragments.consecutive(out);
  }

  /** Flags of {@link #source}'s box at {@code inSource} (all of them when null). */
  private static byte[] cropped(byte[] flags, int[] inSource) {
    if (inSource == null) {
      return flags;
    }
    byte[] out = new byte[inSource.length];
    for (int i = 0; i < inSource.length; i++) {
      out[i] = flags[inSource[i]];
    }
    return out;
  }

  private static byte[] ignoredVoxels(AffinityBlock block, boolean[] defectiveOrNull) {
    byte[] ignored = DetachedVoxels.find(block);
    if (defectiveOrNull != null) {
      byte[] inDefective = DefectiveSections.voxels(defectiveOrNull, block.shape());
      for (int i = 0; i < ignored.length; i++) {
        ignored[i] |= inDefective[i];
      }
    }
    return ignored;
  }

  /**
   * Fragment labels only (boundary map and seeded watershed), 1..count in order of first
   * appearance. In anisotropic data, fragments step over {@link DefectiveSections}: such a
   * plane takes the boundary map and then the fragments of the nearest sound plane, and
   * {@link #of} leaves its edges out.
   */
  public static int[] label(AffinityBlock block, FragmentOptions options) {
    FragmentOptions fitted = options.forDimension(block.shape().length);
    AffinityBlock source = source(block);
    return croppedLabels(label(source, fitted, DefectiveSections.find(source, fitted.voxelSize())),
        indicesInSource(block));
  }

  private static int[] label(AffinityBlock block, FragmentOptions fitted,
      boolean[] defectiveOrNull) {
    int[] shape = block.shape();
    int[][] offsets = block.offsets().vectors();
    float[] boundary = block.isQuantized()
        ? BoundaryMap.of(block.byteValuesOrNull(), shape, offsets, block.maskOrNull(),
            fitted.sliceAxis())
        : BoundaryMap.of(block.floatValuesOrNull(), shape, offsets, block.maskOrNull(),
            fitted.sliceAxis());
    if (defectiveOrNull == null) {
      return new WatershedFragments(fitted).label(boundary, shape, block.maskOrNull());
    }
    DefectiveSections.bridge(boundary, shape, defectiveOrNull);
    int[] labels = new WatershedFragments(fitted).label(boundary, shape, block.maskOrNull());
    return DefectiveSections.adopt(labels, shape, defectiveOrNull);
  }

  /**
   * The clustering {@code clusterOfFragment} (cluster of fragment {@code f} at index
   * {@code f − 1}, ids {@code >= 0}) as a {@link SettledPartition}: a cluster holding an open,
   * unmasked voxel ({@code open[i] != 0}) is unsettled and its pieces are its fragments, so the
   * global solve can continue the method from the fragment-level statistics (its merges leaned
   * on edges the block could not see, and a merge order that ran through them cannot be undone
   * later); every other cluster is one settled piece. When the fragments were measured with an
   * inside region, the partition carries the statistics between its pieces ({@link PieceEdges}).
   * O(voxels + fragment pairs).
   */
  SettledPartition settled(int[] clusterOfFragment, byte[] open, byte[] mask) {
    SettledPartition.checkOpen(open, labels.length);
    int clusters = 0;
    for (int c : clusterOfFragment) {
      clusters = Math.max(clusters, c + 1);
    }
    int[] representative = new int[clusters];
    java.util.Arrays.fill(representative, -1);
    for (int f = 0; f < count; f++) {
      int c = clusterOfFragment[f];
      if (representative[c] < 0) {
        representative[c] = f;
      }
    }
    boolean[] clusterOpen = new boolean[clusters];
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] > 0 && open[i] != 0 && (mask == null || mask[i] != 0)) {
        clusterOpen[clusterOfFragment[labels[i] - 1]] = true;
      }
    }
    int[] clusterOfVoxel = new int[labels.length];
    int[] pieceOfVoxel = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] > 0) {
        int fragment = labels[i] - 1;
        int c = clusterOfFragment[fragment];
        clusterOfVoxel[i] = representative[c];
        pieceOfVoxel[i] = clusterOpen[c] ? fragment : representative[c];
      }
    }
    SettledPartition partition = SettledPartition.of(clusterOfVoxel, pieceOfVoxel, open, mask);
    return insideStatistics == null ? partition : partition.withEdges(pieceEdges(partition));
  }

  /** The fragment statistics moved to the pieces of {@code partition}. */
  private PieceEdges pieceEdges(SettledPartition partition) {
    int[] pieceLabels = partition.pieces().labels();
    int[] pieceOfFragment = new int[count + 1];
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] > 0) {
        pieceOfFragment[labels[i]] = pieceLabels[i];
      }
    }
    // rows between fragments summed per pair of pieces in row order, so the sums depend on
    // nothing but the rows; rows inside one piece dropped
    return new PieceEdges(insideStatistics.mapped(pieceOfFragment),
        statistics.mapped(pieceOfFragment));
  }

  /** The voxel segmentation that gives fragment {@code f} the cluster {@code clusterOf[f−1]}. */
  Segmentation toSegmentation(int[] clusterOfFragment, byte[] mask) {
    int[] clusterOfVoxel = new int[labels.length];
    for (int i = 0; i < labels.length; i++) {
      clusterOfVoxel[i] = labels[i] > 0 ? clusterOfFragment[labels[i] - 1] : 0;
    }
    return Segmentation.fromClusters(clusterOfVoxel, mask);
  }
}
