package org.sunder.stitching;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import org.sunder.blockwise.grid.IdLayout;

/**
 * A {@link BlockIdMap} as a file in the work dir, written by the task that numbers a block and
 * read by that block's relabel only. Big-endian, in the frame of {@link CheckedFile} (magic
 * {@code "SUNDIDMP"}): {@code int localBits}, {@code int block}, {@code int n},
 * {@code long[n] finalIds} (index 0 = 0). 8 bytes per segment; O(file size).
 */
public final class BlockIdMapFile {
  private static final byte[] MAGIC = "SUNDIDMP".getBytes(StandardCharsets.US_ASCII);
  private static final String WHAT = "block id map";

  private BlockIdMapFile() {}

  /**
   * The record of a written map.
   *
   * @param block the block index
   * @param segments local ids mapped
   * @param checksum the file's CRC-32
   */
  public record Stored(int block, int segments, long checksum) implements java.io.Serializable {}

  /** Writes {@code map} to {@code file} atomically. */
  public static Stored write(Path file, BlockIdMap map) {
    long[] ids = map.finalIds();
    ByteBuffer out = CheckedFile.start(MAGIC, 12 + 8L * ids.length);
    out.putInt(map.layout().localBits()).putInt(map.block()).putInt(ids.length);
    out.asLongBuffer().put(ids);
    out.position(out.position() + 8 * ids.length);
    return new Stored(map.block(), ids.length - 1, CheckedFile.finish(file, out));
  }

  /**
   * Reads block {@code block}'s map.
   *
   * @param expectedChecksum the recorded checksum, or -1 to accept any valid file
   */
  public static BlockIdMap read(Path file, int block, long expectedChecksum) {
    ByteBuffer in = CheckedFile.open(file, MAGIC, WHAT, expectedChecksum);
    try {
      int localBits = in.getInt();
      int stored = in.getInt();
      if (stored != block) {
        throw CheckedFile.bad(file, WHAT, "holds block " + stored + ", expected block " + block);
      }
      int n = CheckedFile.count(in, 8, file, WHAT, "id");
      long[] ids = CheckedFile.longs(in, n);
      CheckedFile.requireConsumed(in, file, WHAT);
      return new BlockIdMap(new IdLayout(localBits), block, ids);
    } catch (java.nio.BufferUnderflowException | IllegalArgumentException e) {
      throw CheckedFile.bad(file, WHAT, "is truncated or invalid (" + e.getMessage() + ")");
    }
  }
}
