package org.sunder.stitching.solve;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import org.sunder.stitching.task.CheckedFile;

/**
 * A {@link MergeMap} as a work-dir file, in the frame of {@link CheckedFile} (magic
 * {@code "SUNDMERG"}): {@code int n}, {@code long[n] nodes}, {@code long[n] representatives},
 * big-endian. 16 bytes per entry; written atomically; O(file size).
 */
public final class MergeMapFile {
  private static final byte[] MAGIC = "SUNDMERG".getBytes(StandardCharsets.US_ASCII);
  private static final String WHAT = "merge map";

  private MergeMapFile() {}

  /** Writes {@code map} to {@code file} atomically; returns the file's checksum. */
  public static long write(Path file, MergeMap map) {
    int n = map.size();
    ByteBuffer out = CheckedFile.start(MAGIC, 4 + 16L * n);
    out.putInt(n);
    out.asLongBuffer().put(map.nodes());
    out.position(out.position() + 8 * n);
    out.asLongBuffer().put(map.representatives());
    out.position(out.position() + 8 * n);
    return CheckedFile.finish(file, out);
  }

  /**
   * Reads a map written by {@link #write}.
   *
   * @param expectedChecksum the checksum its writer recorded, or -1 to accept any valid file
   */
  public static MergeMap read(Path file, long expectedChecksum) {
    ByteBuffer in = CheckedFile.open(file, MAGIC, WHAT, expectedChecksum);
    try {
      int n = CheckedFile.count(in, 16, file, WHAT, "entry");
      long[] nodes = CheckedFile.longs(in, n);
      long[] reps = CheckedFile.longs(in, n);
      CheckedFile.requireConsumed(in, file, WHAT);
      return new MergeMap(nodes, reps);
    } catch (java.nio.BufferUnderflowException | IllegalArgumentException e) {
      throw CheckedFile.bad(file, WHAT, "is truncated or invalid (" + e.getMessage() + ")");
    }
  }
}
