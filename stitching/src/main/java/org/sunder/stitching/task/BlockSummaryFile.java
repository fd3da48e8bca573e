package org.sunder.stitching.task;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * A {@link BlockSummary} as a file in the work dir, so that the partition stage hands the solve
 * a block's summary through storage rather than through task results (a summary grows with the
 * block's segments and edges; a task record stays a few numbers, {@link Stored}).
 * Big-endian, in the frame of {@link CheckedFile} (magic {@code "SUNDSUMM"}):
 * <pre>
 *   int block
 *   int n, long[n] segmentSizes
 *   int b, int[b] boundaryLocalIds, int[b] boundarySides, long[b] boundaryFirstVoxels
 *   table innerEdges       (int rows, long[] u, long[] v, double[] sum, long[] count,
 *                           double[] min, double[] max)
 *   int s, long[s] separatedU, long[s] separatedV
 *   table interiorEdges
 * </pre>
 * 8 bytes per segment, 16 per boundary segment, 48 per edge, 16 per separated pair. Write and read
 * are O(file size) (reading re-validates the tables, O(m log m)).
 */
public final class BlockSummaryFile {
  private static final byte[] MAGIC = "SUNDSUMM".getBytes(StandardCharsets.US_ASCII);
  private static final String WHAT = "block summary";

  private BlockSummaryFile() {}

  /**
   * The partition task's record: the figures of the summary it wrote, and the file's checksum.
   *
   * @param block the block index
   * @param segments segments (local ids) of the block
   * @param boundarySegments those that enter the reduced graph
   * @param innerEdges pairs of boundary segments joined inside the core
   * @param separatedPairs pairs of boundary segments the block kept apart
   * @param interiorEdges pairs kept for the size filter
   * @param bytes the file's size
   * @param checksum the file's CRC-32
   */
  public record Stored(int block, int segments, int boundarySegments, int innerEdges,
      int separatedPairs, int interiorEdges, long bytes, long checksum)
      implements java.io.Serializable {

    /** The reduced-graph pairs this block contributes at most (inner + interior edges). */
    public long pairs() {
      return (long) innerEdges + interiorEdges;
    }
  }

  /** Writes {@code summary} to {@code file} atomically; returns the task's record. */
  public static Stored write(Path file, BlockSummary s) {
    int n = s.segmentSizes().length;
    int b = s.boundaryLocalIds().length;
    int sep = s.separatedU().length;
    long body = 4 + 4 + 8L * n + 4 + 16L * b
        + CheckedFile.statisticsBytes(s.innerEdges().size())
        + 4 + 16L * sep + CheckedFile.statisticsBytes(s.interiorEdges().size());
    ByteBuffer out = CheckedFile.start(MAGIC, body);
    out.putInt(s.block());
    out.putInt(n);
    out.asLongBuffer().put(s.segmentSizes());
    out.position(out.position() + 8 * n);
    out.putInt(b);
    out.asIntBuffer().put(s.boundaryLocalIds());
    out.position(out.position() + 4 * b);
    out.asIntBuffer().put(s.boundarySides());
    out.position(out.position() + 4 * b);
    out.asLongBuffer().put(s.boundaryFirstVoxels());
    out.position(out.position() + 8 * b);
    CheckedFile.putStatistics(out, s.innerEdges());
    out.putInt(sep);
    out.asLongBuffer().put(s.separatedU());
    out.position(out.position() + 8 * sep);
    out.asLongBuffer().put(s.separatedV());
    out.position(out.position() + 8 * sep);
    CheckedFile.putStatistics(out, s.interiorEdges());
    long checksum = CheckedFile.finish(file, out);
    return new Stored(s.block(), n, b, s.innerEdges().size(), sep, s.interiorEdges().size(),
        out.limit(), checksum);
  }

  /** Reads the summary the record {@code stored} names (its checksum must match). */
  public static BlockSummary read(Path file, Stored stored) {
    BlockSummary s = read(file, stored.checksum());
    if (s.block() != stored.block()) {
      throw CheckedFile.bad(file, WHAT, "holds block " + s.block() + ", expected block "
          + stored.block());
    }
    return s;
  }

  /**
   * Reads a file written by {@link #write}.
   *
   * @param expectedChecksum the recorded checksum, or -1 to accept any valid file
   */
  public static BlockSummary read(Path file, long expectedChecksum) {
    ByteBuffer in = CheckedFile.open(file, MAGIC, WHAT, expectedChecksum);
    try {
      int block = in.getInt();
      int n = CheckedFile.count(in, 8, file, WHAT, "segment");
      long[] sizes = CheckedFile.longs(in, n);
      int b = CheckedFile.count(in, 16, file, WHAT, "boundary segment");
      int[] boundary = CheckedFile.ints(in, b);
      int[] sides = CheckedFile.ints(in, b);
      long[] firstVoxels = CheckedFile.longs(in, b);
      EdgeStatistics inner = CheckedFile.getStatistics(in, file, WHAT);
      int sep = CheckedFile.count(in, 16, file, WHAT, "separated pair");
      long[] su = CheckedFile.longs(in, sep);
      long[] sv = CheckedFile.longs(in, sep);
      EdgeStatistics interior = CheckedFile.getStatistics(in, file, WHAT);
      CheckedFile.requireConsumed(in, file, WHAT);
      return new BlockSummary(block, sizes, boundary, sides, firstVoxels, inner, su, sv,
          interior);
    } catch (java.nio.BufferUnderflowException e) {
      throw CheckedFile.bad(file, WHAT, "is truncated");
    }
  }
}
