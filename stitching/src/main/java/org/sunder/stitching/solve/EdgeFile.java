package org.sunder.stitching.solve;

import java.io.BufferedInputStream;
import java.io.BufferedOutputStream;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.zip.CRC32;
import java.util.zip.CheckedInputStream;
import java.util.zip.CheckedOutputStream;
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
 * place, so a reader never sees half a file; a retried task rewrites the same bytes.
 */
public final class EdgeFile {
  private static final byte[] MAGIC = {'S', 'U', 'N', 'D', 'E', 'D', 'G', 'E'};
  private static final int VERSION = 1;

  private EdgeFile() {}

  /** Writes {@code edges} to {@code file} atomically; returns the file's CRC-32. */
  public static long write(Path file, SolveEdges edges) {
    Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
    long checksum;
    try {
      Files.createDirectories(file.toAbsolutePath().getParent());
      CRC32 crc = new CRC32();
      try (OutputStream raw = Files.newOutputStream(tmp);
          CheckedOutputStream checked =
              new CheckedOutputStream(new BufferedOutputStream(raw, 1 << 16), crc);
          DataOutputStream out = new DataOutputStream(checked)) {
        int m = edges.size();
        out.write(MAGIC);
        out.writeInt(VERSION);
        out.writeInt(m);
        for (int e = 0; e < m; e++) {
          out.writeLong(edges.u(e));
        }
        for (int e = 0; e < m; e++) {
          out.writeLong(edges.v(e));
        }
        for (int e = 0; e < m; e++) {
          out.writeDouble(edges.weight(e));
        }
        for (int e = 0; e < m; e++) {
          out.writeLong(edges.keyU(e));
        }
        for (int e = 0; e < m; e++) {
          out.writeLong(edges.keyV(e));
        }
        for (int e = 0; e < m; e++) {
          out.writeByte(edges.kind(e));
        }
        out.flush();
        checksum = crc.getValue();
        out.writeLong(checksum);
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
    CRC32 crc = new CRC32();
    try (InputStream raw = Files.newInputStream(file);
        CheckedInputStream checked =
            new CheckedInputStream(new BufferedInputStream(raw, 1 << 16), crc);
        DataInputStream in = new DataInputStream(checked)) {
      byte[] magic = new byte[MAGIC.length];
      in.readFully(magic);
      if (!java.util.Arrays.equals(magic, MAGIC)) {
        throw bad(file, "does not start with \"SUNDEDGE\"");
      }
      int version = in.readInt();
      if (version != VERSION) {
        throw bad(file, "has format version " + version + ", expected " + VERSION);
      }
      int m = in.readInt();
      if (m < 0) {
        throw bad(file, "has edge count " + m);
      }
      long[] u = new long[m];
      long[] v = new long[m];
      double[] w = new double[m];
      long[] ku = new long[m];
      long[] kv = new long[m];
      byte[] kind = new byte[m];
      for (int e = 0; e < m; e++) {
        u[e] = in.readLong();
      }
      for (int e = 0; e < m; e++) {
        v[e] = in.readLong();
      }
      for (int e = 0; e < m; e++) {
        w[e] = in.readDouble();
      }
      for (int e = 0; e < m; e++) {
        ku[e] = in.readLong();
      }
      for (int e = 0; e < m; e++) {
        kv[e] = in.readLong();
      }
      in.readFully(kind);
      long expected = crc.getValue();
      long stored = in.readLong();
      if (stored != expected) {
        throw bad(file, "fails its checksum (stored " + stored + ", computed " + expected + ")");
      }
      if (in.read() != -1) {
        throw bad(file, "has bytes after its checksum");
      }
      if (expectedChecksum != -1 && stored != expectedChecksum) {
        throw bad(file, "has checksum " + stored + " but its task recorded " + expectedChecksum);
      }
      SolveEdges edges = new SolveEdges(m);
      for (int e = 0; e < m; e++) {
        if (kind[e] < SolveEdges.MAX || kind[e] > MulticutPartSolver.JOINED) {
          throw bad(file, "edge " + e + " has kind " + kind[e] + ", expected 0 to "
              + MulticutPartSolver.JOINED);
        }
        edges.add(u[e], v[e], w[e], ku[e], kv[e], kind[e]);
      }
      return edges;
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
