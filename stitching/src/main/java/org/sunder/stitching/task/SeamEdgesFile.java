package org.sunder.stitching.task;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * A face's {@link SeamEdges} as a file in the work dir, so that the seam stage hands the solve
 * its edges through storage; the task's record is a few numbers ({@link Stored}). Big-endian, in
 * the frame of {@link CheckedFile} (magic {@code "SUNDSEAM"}): {@code int face}, then the
 * tables {@code edges} and {@code continued} as {@link BlockSummaryFile} writes its tables
 * (48 bytes per pair). O(file size).
 */
public final class SeamEdgesFile {
  private static final byte[] MAGIC = "SUNDSEAM".getBytes(StandardCharsets.US_ASCII);
  private static final String WHAT = "seam edges";

  private SeamEdgesFile() {}

  /**
   * The seam task's record.
   *
   * @param face the face index
   * @param edges pairs of segments joined across the face
   * @param continued pairs with continued voxel pairs (fragment methods)
   * @param bytes the file's size
   * @param checksum the file's CRC-32
   */
  public record Stored(int face, int edges, int continued, long bytes, long checksum)
      implements java.io.Serializable {}

  /** Writes {@code seams} to {@code file} atomically; returns the task's record. */
  public static Stored write(Path file, SeamEdges seams) {
    long body = 4 + CheckedFile.statisticsBytes(seams.edges().size())
        + CheckedFile.statisticsBytes(seams.continued().size());
    ByteBuffer out = CheckedFile.start(MAGIC, body);
    out.putInt(seams.face());
    CheckedFile.putStatistics(out, seams.edges());
    CheckedFile.putStatistics(out, seams.continued());
    long checksum = CheckedFile.finish(file, out);
    return new Stored(seams.face(), seams.edges().size(), seams.continued().size(), out.limit(),
        checksum);
  }

  /** Reads the seam edges the record {@code stored} names (its checksum must match). */
  public static SeamEdges read(Path file, Stored stored) {
    SeamEdges s = read(file, stored.checksum());
    if (s.face() != stored.face()) {
      throw CheckedFile.bad(file, WHAT, "holds face " + s.face() + ", expected face "
          + stored.face());
    }
    return s;
  }

  /**
   * Reads a file written by {@link #write}.
   *
   * @param expectedChecksum the recorded checksum, or -1 to accept any valid file
   */
  public static SeamEdges read(Path file, long expectedChecksum) {
    ByteBuffer in = CheckedFile.open(file, MAGIC, WHAT, expectedChecksum);
    try {
      int face = in.getInt();
      EdgeStatistics edges = CheckedFile.getStatistics(in, file, WHAT);
      EdgeStatistics continued = CheckedFile.getStatistics(in, file, WHAT);
      CheckedFile.requireConsumed(in, file, WHAT);
      return new SeamEdges(face, edges, continued);
    } catch (java.nio.BufferUnderflowException e) {
      throw CheckedFile.bad(file, WHAT, "is truncated");
    }
  }
}
