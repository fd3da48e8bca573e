package org.sunder.stitching;

import java.util.Locale;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.store.DataType;

/**
 * What one partition task ({@link PartitionTask}) of a run holds in memory, by formula: the
 * largest extended block's voxels times (channels x bytes per affinity value +
 * {@value #WORKING_BYTES_PER_VOXEL} bytes of the partition's graph and working arrays +
 * {@value #LABEL_BYTES_PER_VOXEL} bytes of provisional labels). The working figure is the
 * partition module's stated bound for the Mutex Watershed; agglomeration from voxels may need
 * more. O(dimensions); reads only the affinities' metadata.
 *
 * @param extendedVoxels voxels of a full block's extended box, clipped to the volume
 * @param channels affinity channels (one per offset)
 * @param valueType affinity data type, lower case ({@code float32} or {@code uint8})
 * @param bytesPerValue bytes of one affinity value
 */
public record PartitionEstimate(long extendedVoxels, int channels, String valueType,
    int bytesPerValue) {
  /** Bytes per voxel of the partition's graph and working arrays. */
  public static final int WORKING_BYTES_PER_VOXEL = 150;
  /** Bytes per voxel of the provisional labels (uint64). */
  public static final int LABEL_BYTES_PER_VOXEL = 8;

  /** The estimate for {@code setup}'s largest block. */
  public static PartitionEstimate of(StitchingSetup setup) {
    DataType type = setup.openInput().openDataset(setup.affinitiesPath()).dataType();
    BlockGrid grid = setup.grid();
    long[] volume = grid.volumeShape();
    long[] extent = new long[volume.length];
    for (int d = 0; d < volume.length; d++) {
      extent[d] = Math.min(volume[d], grid.blockShape()[d] + 2L * grid.halo()[d]);
    }
    return new PartitionEstimate(Shapes.elementCount(extent), setup.offsets().count(),
        type.name().toLowerCase(Locale.ROOT), type == DataType.UINT8 ? 1 : 4);
  }

  /** Bytes per voxel besides the affinities. */
  public int otherBytesPerVoxel() {
    return WORKING_BYTES_PER_VOXEL + LABEL_BYTES_PER_VOXEL;
  }

  /** Bytes one partition task holds. */
  public long bytes() {
    return extendedVoxels * ((long) channels * bytesPerValue + otherBytesPerVoxel());
  }
}
