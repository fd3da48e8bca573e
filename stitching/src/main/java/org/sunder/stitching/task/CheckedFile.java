package org.sunder.stitching.task;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.zip.CRC32;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.files.AtomicWrites;
import org.sunder.blockwise.graph.EdgeStatistics;

/**
 * The frame of the work dir's binary files: an 8-byte magic, a format version (int), the body,
 * and the CRC-32 of every byte before it (long), big-endian. Written whole or not at all
 * ({@link AtomicWrites}), so a task killed while writing leaves no file a reader could take for
 * finished; a retried task writes the same bytes. O(file size) either way.
 */
public final class CheckedFile {
  /** 2: block summaries carry their boundary segments' first voxels. */
  static final int VERSION = 2;
  static final int HEADER = 12;
  static final int TRAILER = 8;

  private CheckedFile() {}

  /** A buffer for a body of {@code bodyBytes} bytes, positioned after the header. */
  public static ByteBuffer start(byte[] magic, long bodyBytes) {
    long total = HEADER + bodyBytes + TRAILER;
    if (total > Integer.MAX_VALUE - 8) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "a work file of " + total
          + " bytes exceeds the 2 GiB a single file may hold; use smaller blocks (blocks.shape)");
    }
    ByteBuffer buffer = ByteBuffer.allocate((int) total);
    buffer.put(magic).putInt(VERSION);
    return buffer;
  }

  /**
   * Appends the checksum and writes the buffer (filled exactly to its body) to {@code file}.
   *
   * @return the checksum, for the task's record
   */
  public static long finish(Path file, ByteBuffer buffer) {
    if (buffer.remaining() != TRAILER) {
      throw new SunderException(ErrorKind.INTERNAL, "work file " + file + ": body has "
          + (buffer.capacity() - HEADER - TRAILER - buffer.remaining() + TRAILER)
          + " bytes, expected " + (buffer.capacity() - HEADER - TRAILER));
    }
    CRC32 crc = new CRC32();
    crc.update(buffer.array(), 0, buffer.position());
    long checksum = crc.getValue();
    buffer.putLong(checksum);
    buffer.flip();
    AtomicWrites.write(file, buffer);
    return checksum;
  }

  /**
   * The body of {@code file}, positioned after the header, limited before the checksum.
   *
   * @param what the file's kind, for messages ("block summary")
   * @param expectedChecksum the checksum the writer recorded, or -1 to accept any valid file
   * @throws SunderException naming the file when it is missing, damaged, of another kind or
   *     version, or not the file the record names
   */
  public static ByteBuffer open(Path file, byte[] magic, String what, long expectedChecksum) {
    byte[] bytes;
    try {
      bytes = Files.readAllBytes(file);
    } catch (NoSuchFileException e) {
      throw new SunderException(ErrorKind.CONFLICT, what + " file " + file + " is missing;"
          + " its task's record exists without it (rerun with --fresh)", e);
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot read " + what + " file " + file
          + ": " + e, e);
    }
    if (bytes.length < HEADER + TRAILER
        || !Arrays.equals(Arrays.copyOf(bytes, magic.length), magic)) {
      throw bad(file, what, "does not start with \"" + new String(magic,
          java.nio.charset.StandardCharsets.US_ASCII) + "\"");
    }
    ByteBuffer buffer = ByteBuffer.wrap(bytes);
    int version = buffer.getInt(magic.length);
    if (version != VERSION) {
      throw bad(file, what, "has format version " + version + ", expected " + VERSION);
    }
    CRC32 crc = new CRC32();
    crc.update(bytes, 0, bytes.length - TRAILER);
    long stored = buffer.getLong(bytes.length - TRAILER);
    if (stored != crc.getValue()) {
      throw bad(file, what, "fails its checksum (stored " + stored + ", computed "
          + crc.getValue() + ")");
    }
    if (expectedChecksum >= 0 && stored != expectedChecksum) {
      throw new SunderException(ErrorKind.CONFLICT, what + " file " + file + " has checksum "
          + stored + " but its task recorded " + expectedChecksum + "; another run wrote it"
          + " (rerun with --fresh)");
    }
    buffer.position(HEADER).limit(bytes.length - TRAILER);
    return buffer;
  }

  /** Throws unless {@code body} was read to its end. */
  public static void requireConsumed(ByteBuffer body, Path file, String what) {
    if (body.hasRemaining()) {
      throw bad(file, what, "has " + body.remaining() + " bytes after its content");
    }
  }

  public static SunderException bad(Path file, String what, String problem) {
    return new SunderException(ErrorKind.CONFLICT, what + " file " + file + " " + problem
        + "; it was not written by this version of Sunder, or was damaged (rerun with --fresh)");
  }

  /** Bytes of an {@link EdgeStatistics} table of {@code rows} rows: count + 48 per row. */
  static long statisticsBytes(int rows) {
    return 4 + 48L * rows;
  }

  static void putStatistics(ByteBuffer out, EdgeStatistics s) {
    int n = s.size();
    out.putInt(n);
    for (int i = 0; i < n; i++) {
      out.putLong(s.u(i));
    }
    for (int i = 0; i < n; i++) {
      out.putLong(s.v(i));
    }
    for (int i = 0; i < n; i++) {
      out.putDouble(s.sum(i));
    }
    for (int i = 0; i < n; i++) {
      out.putLong(s.count(i));
    }
    for (int i = 0; i < n; i++) {
      out.putDouble(s.min(i));
    }
    for (int i = 0; i < n; i++) {
      out.putDouble(s.max(i));
    }
  }

  static EdgeStatistics getStatistics(ByteBuffer in, Path file,
      String what) {
    int n = in.getInt();
    if (n < 0 || 48L * n > in.remaining()) {
      throw bad(file, what, "has an edge table of " + n + " rows in " + in.remaining()
          + " bytes");
    }
    long[] u = longs(in, n);
    long[] v = longs(in, n);
    double[] sum = doubles(in, n);
    long[] count = longs(in, n);
    double[] min = doubles(in, n);
    double[] max = doubles(in, n);
    try {
      return EdgeStatistics.of(u, v, sum, count, min, max);
    } catch (IllegalArgumentException e) {
      throw bad(file, what, "holds an invalid edge table (" + e.getMessage() + ")");
    }
  }

  public static long[] longs(ByteBuffer in, int n) {
    long[] out = new long[n];
    in.asLongBuffer().get(out);
    in.position(in.position() + 8 * n);
    return out;
  }

  static double[] doubles(ByteBuffer in, int n) {
    double[] out = new double[n];
    in.asDoubleBuffer().get(out);
    in.position(in.position() + 8 * n);
    return out;
  }

  public static int[] ints(ByteBuffer in, int n) {
    int[] out = new int[n];
    in.asIntBuffer().get(out);
    in.position(in.position() + 4 * n);
    return out;
  }

  /** Reads a non-negative count, refusing one the remaining bytes cannot hold at {@code width}. */
  public static int count(ByteBuffer in, int width, Path file, String what, String name) {
    int n = in.getInt();
    if (n < 0 || (long) n * width > in.remaining()) {
      throw bad(file, what, "has " + name + " count " + n + " with " + in.remaining()
          + " bytes left");
    }
    return n;
  }
}
