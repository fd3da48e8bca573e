package org.sunder.stitching.setup;

import java.util.Locale;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.partition.config.PartitionMethod;
import org.sunder.blockwise.store.DataType;
import org.sunder.stitching.task.PartitionTask;

/**
 * What one partition task ({@link PartitionTask}) of a run holds in memory, by formula: the
 * largest extended block's voxels times (channels x bytes per affinity value + the method's
 * working bytes per voxel + {@value #LABEL_BYTES_PER_VOXEL} bytes of provisional labels + for the
 * fragment methods, the share of their context: {@link #contextBytesPerExtendedVoxel}).
 * O(dimensions); reads only the affinities' metadata.
 *
 * <p>The working bytes per voxel are the method's own figure
 * ({@link PartitionMethod#workingBytesPerVoxel}), measured where the method says so.
 *
 * @param extendedVoxels voxels of a full block's extended box, clipped to the volume
 * @param channels affinity channels (one per offset)
 * @param valueType affinity data type, lower case ({@code float32} or {@code uint8})
 * @param bytesPerValue bytes of one affinity value
 * @param workingBytesPerVoxel the method's working bytes per voxel
 * @param contextBytesPerVoxel the fragment methods' context per extended voxel, else 0
 */
public record PartitionEstimate(long extendedVoxels, int channels, String valueType,
    int bytesPerValue, int workingBytesPerVoxel, int contextBytesPerVoxel) {
  /** Bytes per voxel of the provisional labels (uint64). */
  public static final int LABEL_BYTES_PER_VOXEL = 8;
  /**
   * Bytes per voxel of a fragment method's context ({@link AffinityReader#readBlock}) besides
   * its channels: boundary map, fragment labels, flags and the flood's queue (a stated bound,
   * not measured).
   */
  static final int CONTEXT_WORKING_BYTES = 20;
  /** Bytes per context voxel of the moves of fragment borders (FragmentBorders' figure). */
  static final int BORDER_MOVE_BYTES = 21;
  /**
   * Context voxels per extended voxel for a context {@code halos} halos wide, a bound: the
   * context grows each side of the extended box by that many halos, and where the halo overhead
   * is at most 1.35 (the default shapes' target) every axis's core is at least 2 / 0.35 halos
   * long, so the context is at most ((1.35 + 0.35 halos) / 1.35)^3 times the extended box: 2
   * for one halo, 4 for two (3.5 rounded up).
   */
  static int contextPerExtendedVoxel(int halos) {
    double perAxis = (1.35 + 0.35 * halos) / 1.35;
    return (int) Math.ceil(perAxis * perAxis * perAxis);
  }

  /** The estimate for {@code setup}'s largest block. */
  public static PartitionEstimate of(StitchingSetup setup) {
    DataType type = setup.openInput().openDataset(setup.affinitiesPath()).dataType();
    BlockGrid grid = setup.grid();
    long[] volume = grid.volumeShape();
    long[] extent = new long[volume.length];
    for (int d = 0; d < volume.length; d++) {
      extent[d] = Math.min(volume[d], grid.blockShape()[d] + 2L * grid.halo()[d]);
    }
    PartitionMethod method = setup.partition().method();
    return new PartitionEstimate(Shapes.elementCount(extent), setup.offsets().count(),
        type.name().toLowerCase(Locale.ROOT), bytesPerValue(type), method.workingBytesPerVoxel(),
        contextBytesPerExtendedVoxel(method, setup.offsets().count(), bytesPerValue(type)));
  }

  /** Bytes of one affinity value of {@code type}: 1 for uint8, else 4. */
  public static int bytesPerValue(DataType type) {
    return type == DataType.UINT8 ? 1 : 4;
  }

  /**
   * Bytes a partition task holds per voxel of its extended box: affinities, the method's working
   * arrays and the labels.
   */
  public static long bytesPerExtendedVoxel(PartitionMethod method, int channels,
      int bytesPerValue) {
    return (long) channels * bytesPerValue + method.workingBytesPerVoxel() + LABEL_BYTES_PER_VOXEL
        + contextBytesPerExtendedVoxel(method, channels, bytesPerValue);
  }

  /**
   * A fragment method's context, per voxel of the extended box: {@link
   * #contextPerExtendedVoxel} x (three nearest-neighbour channels + {@link
   * #CONTEXT_WORKING_BYTES}), for a method that moves fragment borders x (every channel + {@link
   * #CONTEXT_WORKING_BYTES} + {@link #BORDER_MOVE_BYTES}); 0 for the other methods, which read
   * no context.
   */
  static int contextBytesPerExtendedVoxel(PartitionMethod method, int channels,
      int bytesPerValue) {
    int perVoxel = method.movesFragmentBorders()
        ? channels * bytesPerValue + CONTEXT_WORKING_BYTES + BORDER_MOVE_BYTES
        : 3 * bytesPerValue + CONTEXT_WORKING_BYTES;
    return method.contextHalos() > 0 ? contextPerExtendedVoxel(method.contextHalos()) * perVoxel
        : 0;
  }

  /**
   * As {@link #bytesPerExtendedVoxel(PartitionMethod, int, int)} for the method of JSON
   * name {@code methodName}; the default method ({@code fragments-multicut}) when it is null or
   * names no method (the partition configuration refuses that with its own message).
   */
  public static long bytesPerExtendedVoxel(String methodName, int channels, int bytesPerValue) {
    PartitionMethod method = PartitionMethod.byName(methodName)
        .orElse(PartitionMethod.robustDefault());
    return bytesPerExtendedVoxel(method, channels, bytesPerValue);
  }

  /** Bytes per voxel besides the affinities. */
  public int otherBytesPerVoxel() {
    return workingBytesPerVoxel + LABEL_BYTES_PER_VOXEL + contextBytesPerVoxel;
  }

  /** Bytes one partition task holds. */
  public long bytes() {
    return extendedVoxels * ((long) channels * bytesPerValue + otherBytesPerVoxel());
  }

  /**
   * The solve's seconds for a reduced graph of {@code edges} edges: the method's own cost per
   * edge ({@link PartitionMethod#solveNanosPerEdge}, which names where it was measured).
   */
  public static double solveSeconds(StitchingSetup setup, long edges) {
    return edges * setup.partition().method().solveNanosPerEdge() / 1e9;
  }
}
