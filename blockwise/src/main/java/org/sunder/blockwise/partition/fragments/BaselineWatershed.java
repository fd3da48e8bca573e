package org.sunder.blockwise.partition.fragments;

import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GraphInputException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.config.PartitionConfig;

/**
 * The yardstick: the naive seeded watershed that every quality and speed figure of Sunder is
 * reported next to, measured in the same run. It is deliberately the plain method, not a tuned
 * one; Sunder's own fragments ({@link WatershedFragments}) differ in every step.
 *
 * <ol>
 *   <li><b>Boundary map</b> {@code b(p) = 1 − mean_k a_k(p)}, the mean over the channels
 *       {@code k} stored at {@code p} whose offset is nearest-neighbour (exactly one non-zero
 *       component, of magnitude 1) and whose edge {@code (p, p + d_k)} ends inside the box.
 *       Each edge is read once, at the voxel that stores it; the channel stored at the other end
 *       is not averaged in (with the usual offsets {@code −1} per axis, {@code p} averages its
 *       edges towards its lower neighbours). A voxel with no such edge reads {@code b = 1}. The
 *       mask does not change {@code b}. Summed in {@code double}, rounded once to {@code float}.
 *       ({@link BoundaryMap}, which Sunder's fragments use, takes the largest {@code 1 − a} over
 *       the edges at both ends instead.)</li>
 *   <li><b>Seeds</b>: the face-connected components ({@code 2·d}-connectivity: 6 in 3D, 4 in
 *       2D) of the in-mask voxels with {@code b < threshold}; threshold default
 *       {@value #DEFAULT_THRESHOLD}.</li>
 *   <li><b>Flood</b>: {@link SeededWatershed} of {@code b} from those seeds over face neighbours
 *       (priority {@code b}; ties in insertion order, so deterministic). An in-mask region that
 *       holds no seed becomes one segment of its own; masked voxels get 0.</li>
 * </ol>
 * Labels are {@code 1..n} in order of each segment's first voxel (memory order). Every seed
 * component lies in exactly one segment and no segment holds two.
 *
 * <p>Being a mean, the map dilutes a boundary that only one of a voxel's {@code d} stored edges
 * crosses to {@code 1/d} of its strength: with exact affinities a voxel just across a flat face
 * reads {@code b = 1/3} in 3D (1/2 in 2D), below the default threshold, so in 3D the seeds of
 * touching objects join through their common faces unless the threshold is below {@code 1/d}.
 * That weakness is part of what the yardstick stands for; the threshold is a parameter.
 *
 * <p>Time {@code O(n · c)} for the map ({@code c} channels), {@code O(n)} for the seeds, and
 * {@code O(n log n)} for the flood with a binary heap, {@code O(n + L)} when {@code b} takes at
 * most {@value SeededWatershed#MAX_LEVELS} distinct values {@code L} (as 8-bit affinities
 * give: a bucket queue). Working memory about 16 bytes per voxel (map, seeds, their search
 * queue, labels) plus the flood's queue (12 bytes per queued voxel for the heap, 8 per voxel
 * for the bucket queue). Immutable and thread-safe.
 *
 * <p>A {@link Partitioner}, so that benchmarks and evaluations run it beside Sunder's methods
 * on the same blocks; it is not one of the methods {@link PartitionConfig} offers, and its
 * {@link #partitionSettled} holds nothing back (the interface's default).
 */
public final class BaselineWatershed implements Partitioner {
  /** The seed threshold on {@code b} unless one is given. */
  public static final double DEFAULT_THRESHOLD = 0.5;

  private final double threshold;

  /** The baseline with seeds at {@code b <} {@value #DEFAULT_THRESHOLD}. */
  public BaselineWatershed() {
    this(DEFAULT_THRESHOLD);
  }

  /**
   * The baseline with seeds at {@code b < threshold}.
   *
   * @throws PartitionConfigException unless {@code 0 < threshold <= 1}
   */
  public BaselineWatershed(double threshold) {
    if (!(threshold > 0 && threshold <= 1)) {
      throw new PartitionConfigException(ErrorKind.INVALID_CONFIG, "baseline threshold "
          + threshold + ": expected a number in (0, 1] (seeds are the voxels with boundary "
          + "value below it)");
    }
    this.threshold = threshold;
  }

  public double threshold() {
    return threshold;
  }

  /** Segments a block (float or 8-bit affinities; its mask, if any, is honoured). */
  @Override
  public Segmentation partition(AffinityBlock block) {
    Objects.requireNonNull(block, "block");
    int[] shape = block.shape();
    float[] boundary = boundary(block);
    byte[] mask = block.maskOrNull();
    int[] seeds = seeds(boundary, shape, mask, threshold);
    int[] labels = WatershedFragments.consecutive(
        SeededWatershed.flood(boundary, shape, seeds, mask, -1));
    int count = 0;
    for (int label : labels) {
      count = Math.max(count, label);
    }
    return new Segmentation(labels, count);
  }

  /**
   * Segments raw float affinities, channel last ({@code affinities[k · n + i]} is channel
   * {@code k} at voxel {@code i}, dimension 0 fastest), {@code offsets} in memory order.
   * Validates like {@link AffinityBlock#ofFloats} and throws its {@link GraphInputException}.
   *
   * @param maskOrNull 1 = inside, or null for no mask
   */
  public Segmentation partition(float[] affinities, int[] shape, int[][] offsets,
      byte[] maskOrNull) {
    Objects.requireNonNull(shape, "shape");
    return partition(AffinityBlock.ofFloats(affinities, shape, new long[shape.length],
        Offsets.of(offsets), maskOrNull));
  }

  /**
   * The boundary map of step 1 (see the class javadoc), one value per voxel; allocates it.
   *
   * @throws GraphInputException when the block has no nearest-neighbour offset
   */
  public static float[] boundary(AffinityBlock block) {
    int[] shape = block.shape();
    int n = block.voxelCount();
    int[][] vectors = block.offsets().vectors();
    int[] channel = new int[vectors.length];
    int[] axis = new int[vectors.length];
    int[] step = new int[vectors.length];
    int used = 0;
    for (int k = 0; k < vectors.length; k++) {
      if (BoundaryMap.isNearestNeighbour(vectors[k], -1)) {
        channel[used] = k;
        axis[used] = VoxelBox.nonZeroAxis(vectors[k]);
        step[used] = vectors[k][axis[used]];
        used++;
      }
    }
    if (used == 0) {
      throw new GraphInputException(ErrorKind.INVALID_CONFIG, "offsets " + block.offsets()
          + ": the baseline watershed needs at least one nearest-neighbour offset (one "
          + "non-zero component, of magnitude 1)");
    }
    float[] floats = block.floatValuesOrNull();
    byte[] bytes = block.byteValuesOrNull();
    float[] boundary = new float[n];
    int[] coordinate = new int[shape.length];
    for (int i = 0; i < n; i++) {
      double sum = 0;
      int count = 0;
      for (int c = 0; c < used; c++) {
        int target = coordinate[axis[c]] + step[c];
        if (target >= 0 && target < shape[axis[c]]) {
          int at = channel[c] * n + i;
          sum += floats != null ? floats[at] : (bytes[at] & 0xff) / 255f;
          count++;
        }
      }
      boundary[i] = count == 0 ? 1f : (float) (1.0 - sum / count);
      VoxelBox.advance(coordinate, shape);
    }
    return boundary;
  }

  /**
   * The seeds of step 2: face-connected components of the in-mask voxels with
   * {@code boundary < threshold}, labelled 1..k in order of first voxel, 0 elsewhere.
   * {@code O(n)}; allocates the labels and a queue of up to {@code n} ints.
   */
  static int[] seeds(float[] boundary, int[] shape, byte[] mask, double threshold) {
    int n = boundary.length;
    int[] strides = VoxelBox.strides(shape);
    int[] labels = new int[n];
    int[] queue = new int[n];
    int next = 0;
    for (int start = 0; start < n; start++) {
      if (labels[start] != 0 || !isSeedVoxel(start, boundary, mask, threshold)) {
        continue;
      }
      int label = ++next;
      labels[start] = label;
      int head = 0;
      int tail = 0;
      queue[tail++] = start;
      while (head < tail) {
        int i = queue[head++];
        int rest = i;
        for (int d = shape.length - 1; d >= 0; d--) {
          int c = rest / strides[d];
          rest -= c * strides[d];
          if (c > 0 && labels[i - strides[d]] == 0
              && isSeedVoxel(i - strides[d], boundary, mask, threshold)) {
            labels[i - strides[d]] = label;
            queue[tail++] = i - strides[d];
          }
          if (c < shape[d] - 1 && labels[i + strides[d]] == 0
              && isSeedVoxel(i + strides[d], boundary, mask, threshold)) {
            labels[i + strides[d]] = label;
            queue[tail++] = i + strides[d];
          }
        }
      }
    }
    return labels;
  }

  private static boolean isSeedVoxel(int i, float[] boundary, byte[] mask, double threshold) {
    return boundary[i] < threshold && (mask == null || mask[i] != 0);
  }
}
