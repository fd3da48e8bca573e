package org.sunder.stitching.solve;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.task.CheckedFile;

/**
 * A {@link BlockIdMap} as a file in the work dir, written by the task that numbers a block and
 * read by that block's relabel only. Big-endian, in the frame of {@link CheckedFile} (magic
 * {@code "SUNDIDMP"}): {@code int localBits}, {@code int block}, {@code int n},
 * {@code long[n] finalIds} (index 0 = 0). 8 bytes per segment; O(file size).
 *
 * <p>Also the compact form the solve writes per block, a {@link SolvedFinalIds.BlockPart}
 * (magic {@code "SUNDIDPT"}): {@code int block}, {@code long offset}, {@code int n},
 * {@code int[n] locals}, {@code long[n] finals} — 12 bytes per solved segment of the block,
 * from which the block's task builds its whole map ({@link BlockIdMap#of}).
 */
public final class BlockIdMapFile {
  private static final byte[] MAGIC = "SUNDIDMP".getBytes(StandardCharsets.US_ASCII);
  private static final String WHAT = "block id map";
  private static final byte[] PART_MAGIC = "SUNDIDPT".getBytes(StandardCharsets.US_ASCII);
  private static final String PART = "solved block ids";

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

  /** Writes one block's part of the solve's numbering atomically; returns its checksum. */
  public static long writePart(Path file, SolvedFinalIds.BlockPart part) {
    int n = part.locals().length;
    ByteBuffer out = CheckedFile.start(PART_MAGIC, 16 + 12L * n);
    out.putInt(part.block()).putLong(part.offset()).putInt(n);
    out.asIntBuffer().put(part.locals());
    out.position(out.position() + 4 * n);
    out.asLongBuffer().put(part.finals());
    out.position(out.position() + 8 * n);
    return CheckedFile.finish(file, out);
  }

  /** Reads block {@code block}'s part written by {@link #writePart}. */
  public static SolvedFinalIds.BlockPart readPart(Path file, int block) {
    ByteBuffer in = CheckedFile.open(file, PART_MAGIC, PART, -1);
    try {
      int stored = in.getInt();
      if (stored != block) {
        throw CheckedFile.bad(file, PART, "holds block " + stored + ", expected block " + block);
      }
      long offset = in.getLong();
      int n = CheckedFile.count(in, 12, file, PART, "solved segment");
      int[] locals = CheckedFile.ints(in, n);
      long[] finals = CheckedFile.longs(in, n);
      CheckedFile.requireConsumed(in, file, PART);
      return new SolvedFinalIds.BlockPart(block, offset, locals, finals);
    } catch (java.nio.BufferUnderflowException e) {
      throw CheckedFile.bad(file, PART, "is truncated");
    }
  }
}
