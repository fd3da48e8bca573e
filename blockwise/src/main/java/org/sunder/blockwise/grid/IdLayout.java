package org.sunder.blockwise.grid;

import java.io.Serializable;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * How labels are laid out in a {@code uint64} (held in a Java {@code long}): provisional ids of
 * the partition stage and final ids of the solve occupy disjoint ranges, so relabelling is
 * idempotent and a glance at a value tells which it is.
 *
 * <pre>
 *   bit 63            provisional flag: 1 = provisional, 0 = final (or background)
 *   bits 62 .. L      block index (63 - L bits)
 *   bits L-1 .. 0     local id within the block, 1 .. 2^L - 1 (L = localBits)
 *
 *   0                 background / masked, in both stages
 *   1 .. 2^63 - 1     final ids
 *   2^63 | b &lt;&lt; L | k provisional id of local segment k of block b
 * </pre>
 *
 * <p>As unsigned 64-bit values every provisional id is at least {@code 2^63}; as a Java
 * {@code long} it is negative. {@link #forGrid} chooses {@code L} just large enough for a block
 * core's voxel count (a core cannot hold more segments than voxels), leaving the remaining bits
 * to the block index. An immutable value.
 */
public record IdLayout(int localBits) implements Serializable {
  private static final long PROVISIONAL = Long.MIN_VALUE;

  public IdLayout {
    if (localBits < 1 || localBits > 62) {
      throw new SunderException(ErrorKind.INVALID_CONFIG,
          "local id bits " + localBits + " outside 1..62");
    }
  }

  /**
   * The layout for {@code grid}: local bits for the largest core's voxel count, block bits for
   * the block count.
   *
   * @throws SunderException {@link ErrorKind#INVALID_CONFIG} if both do not fit in 63 bits
   */
  public static IdLayout forGrid(BlockGrid grid) {
    long coreVoxels = 1;
    int[] block = grid.blockShape();
    long[] volume = grid.volumeShape();
    for (int d = 0; d < block.length; d++) {
      coreVoxels = Math.multiplyExact(coreVoxels, Math.min(block[d], volume[d]));
    }
    int localBits = Math.max(1, 64 - Long.numberOfLeadingZeros(coreVoxels));
    int blockBits = 63 - localBits;
    int neededBlockBits = 64 - Long.numberOfLeadingZeros(Math.max(0, grid.blockCount() - 1));
    if (localBits > 62 || neededBlockBits > blockBits) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "provisional ids do not fit in 64 bits: "
          + grid.blockCount() + " blocks need " + neededBlockBits + " bits and cores of "
          + coreVoxels + " voxels need " + localBits + " bits, but only 63 are available;"
          + " choose fewer, larger blocks or smaller ones");
    }
    return new IdLayout(localBits);
  }

  /** Bits for the block index. */
  public int blockBits() {
    return 63 - localBits;
  }

  /** The largest local id a block may use. */
  public long maxLocalId() {
    return (1L << localBits) - 1;
  }

  /** The largest final id. */
  public static long maxFinalId() {
    return Long.MAX_VALUE;
  }

  /** The provisional id of local segment {@code localId} (1-based) of block {@code block}. */
  public long provisional(int block, long localId) {
    if (localId < 1 || localId > maxLocalId() || block < 0
        || (blockBits() < 31 && block >= 1 << blockBits())) {
      throw new SunderException(ErrorKind.INTERNAL, "local id " + localId + " of block " + block
          + " does not fit the id layout (" + localBits + " local bits, " + blockBits()
          + " block bits)");
    }
    return PROVISIONAL | ((long) block << localBits) | localId;
  }

  /** Whether {@code id} is a provisional id (bit 63 set). */
  public static boolean isProvisional(long id) {
    return id < 0;
  }

  /** Whether {@code id} is a final id (1 .. 2^63 - 1). */
  public static boolean isFinal(long id) {
    return id > 0;
  }

  /** The block index of a provisional id. */
  public int blockOf(long provisionalId) {
    return (int) ((provisionalId & Long.MAX_VALUE) >>> localBits);
  }

  /** The local id (1-based) of a provisional id. */
  public long localOf(long provisionalId) {
    return provisionalId & maxLocalId();
  }
}
