package org.sunder.stitching.solve;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * The binary file of one part's edges in the work dir (a level's input or what it hands up).
 * Big-endian, columns one after another so that equal high bits of the ids sit together:
 * <pre>
 *   8 bytes   magic "SUNDEDGE"
 *   int       format version (1)
 *   int       edge count m
 *   long[m]   u          (provisional ids)
 *   long[m]   v
 *   double[m] weight
 *   long[m]   keyU       (the edge's key, see {@link SolveEdges})
 *   long[m]   keyV
 *   byte[m]   kind       (Mutex Watershed edges: 0 max, 1 min, 2 separated; linkage pair
 *                         rows: 3 sum, 4 count, 5 min, 6 max, 7 constrained; multicut
 *                         rows: 8 cost, 9 joined)
 *   long      CRC-32 of every byte before it
 * </pre>
 * 41 bytes per edge plus 24. Written to a temporary file in the same directory and renamed into
 * place, so a reader never sees half a file; a retried task rewrites the same bytes. Columns go
 * through one {@link ColumnBuffer} in bulk (no call per value), straight from and into the
 * arrays of {@link SolveEdges}: O(m), a few ns per edge besides the disk.
 */
public final class EdgeFile {
  private static final byte[] MAGIC = {'S', 'U', 'N', 'D', 'E', 'D', 'G', 'E'};
  private static final int VERSION = 1;
  private static final int HEADER_BYTES = 16;
  private static final int BYTES_PER_EDGE = 41;

  private EdgeFile() {}

  /** The size of the file of {@code m} edges: 41 bytes per edge plus 24. */
  static long fileBytes(long m) {
    return HEADER_BYTES + BYTES_PER_EDGE * m + Long.BYTES;
  }

  /** Writes {@code edges} to {@code file} atomically; returns the file's CRC-32. */
  public static long write(Path file, SolveEdges edges) {
    Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
    long checksum;
    try {
      Files.createDirectories(file.toAbsolutePath().getParent());
      try (OutputStream out = Files.newOutputStream(tmp)) {
        ColumnBuffer columns = ColumnBuffer.writingTo(out);
        int m = edges.size();
        columns.putBytes(MAGIC, MAGIC.length);
        columns.putInt(VERSION);
        columns.putInt(m);
        columns.putLongs(edges.uColumn(), m);
        columns.putLongs(edges.vColumn(), m);
        columns.putDoubles(edges.weightColumn(), m);
        columns.putLongs(edges.keyUColumn(), m);
        columns.putLongs(edges.keyVColumn(), m);
        columns.putBytes(edges.kindColumn(), m);
        checksum = columns.checksum();
        columns.putLong(checksum);
        columns.flush();
      }
      Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
      return checksum;
    } catch (IOException ex) {
      throw new SunderException(ErrorKind.STORAGE, "cannot write edge file " + file + ": "
          + ex.getMessage(), ex);
    }
  }

  /** Reads a file written by {@link #write}; a typed error names the file if it is not one. */
  public static SolveEdges read(Path file) {
    return read(file, -1);
  }

  /**
   * Reads a file written by {@link #write} whose writer recorded {@code expectedChecksum} (-1
   * accepts any valid file); a typed error names the file if it is not that one.
   */
  public static SolveEdges read(Path file, long expectedChecksum) {
    try (InputStream in = Files.newInputStream(file)) {
      long fileSize = Files.size(file);
      ColumnBuffer columns = ColumnBuffer.readingFrom(in);
      byte[] magic = new byte[MAGIC.length];
      columns.getBytes(magic, magic.length);
      if (!Arrays.equals(magic, MAGIC)) {
        throw bad(file, "does not start with \"SUNDEDGE\"");
      }
      int version = columns.getInt();
      if (version != VERSION) {
        throw bad(file, "has format version " + version + ", expected " + VERSION);
      }
      int m = columns.getInt();
      if (m < 0) {
        throw bad(file, "has edge count " + m);
      }
      if (fileSize < fileBytes(m)) {
        throw bad(file, "is truncated (" + fileSize + " bytes, " + fileBytes(m) + " for its "
            + m + " edges)");
      }
      long[] u = new long[m];
      long[] v = new long[m];
      double[] w = new double[m];
      long[] ku = new long[m];
      long[] kv = new long[m];
      byte[] kind = new byte[m];
      columns.getLongs(u, m);
      columns.getLongs(v, m);
      columns.getDoubles(w, m);
      columns.getLongs(ku, m);
      columns.getLongs(kv, m);
      columns.getBytes(kind, m);
      long expected = columns.checksum();
      long stored = columns.getLong();
      if (stored != expected) {
        throw bad(file, "fails its checksum (stored " + stored + ", computed " + expected + ")");
      }
      if (!columns.atEnd()) {
        throw bad(file, "has bytes after its checksum");
      }
      if (expectedChecksum != -1 && stored != expectedChecksum) {
        throw bad(file, "has checksum " + stored + " but its task recorded " + expectedChecksum);
      }
      for (int e = 0; e < m; e++) {
        if (kind[e] < SolveEdges.MAX || kind[e] > SizeFilterPartSolver.JOINED) {
          throw bad(file, "edge " + e + " has kind " + kind[e] + ", expected 0 to "
              + SizeFilterPartSolver.JOINED);
        }
      }
      return SolveEdges.wrap(u, v, w, ku, kv, kind);
    } catch (EOFException ex) {
      throw bad(file, "is truncated");
    } catch (IOException ex) {
      throw new SunderException(ErrorKind.STORAGE, "cannot read edge file " + file + ": "
          + ex.getMessage(), ex);
    }
  }

  private static SunderException bad(Path file, String what) {
    return new SunderException(ErrorKind.INVALID_INPUT, "edge file " + file + " " + what
        + "; it was not written by this version's solve, or was damaged");
  }
}
