package org.sunder.stitching.solve;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.ByteBuffer;
import java.util.zip.CRC32;

/**
 * A big-endian buffer between primitive columns and a stream, with the CRC-32 of every byte put
 * or taken so far: whole arrays go through it in bulk ({@link ByteBuffer#asLongBuffer} copies),
 * one stream call per 128 KiB instead of one call per value. One direction per instance. O(n)
 * per column of n values; 128 KiB. Not thread-safe.
 */
final class ColumnBuffer {
  private static final int CAPACITY = 1 << 17;
  private final byte[] bytes = new byte[CAPACITY];
  /**
   * Writing: bytes {@code [0, position)} are not yet written out. Reading: bytes
   * {@code [position, limit)} are not yet taken.
   */
  private final ByteBuffer buffer = ByteBuffer.wrap(bytes);
  private final CRC32 crc = new CRC32();
  /** The bytes before this index in {@link #bytes} are counted in {@link #crc}. */
  private int checked;
  private final InputStream in;
  private final OutputStream out;
  private boolean endOfStream;

  private ColumnBuffer(InputStream in, OutputStream out) {
    this.in = in;
    this.out = out;
    if (in != null) {
      buffer.limit(0);
    }
  }

  /** A buffer that writes what is put into it to {@code out} (call {@link #flush} at the end). */
  static ColumnBuffer writingTo(OutputStream out) {
    return new ColumnBuffer(null, out);
  }

  /** A buffer that takes what it returns from {@code in}. */
  static ColumnBuffer readingFrom(InputStream in) {
    return new ColumnBuffer(in, null);
  }

  /** The CRC-32 of every byte put or taken so far. */
  long checksum() {
    crc.update(bytes, checked, buffer.position() - checked);
    checked = buffer.position();
    return crc.getValue();
  }

  // ---- writing

  void putInt(int value) throws IOException {
    room(Integer.BYTES);
    buffer.putInt(value);
  }

  void putLong(long value) throws IOException {
    room(Long.BYTES);
    buffer.putLong(value);
  }

  /** Puts {@code values[0..n)}. */
  void putLongs(long[] values, int n) throws IOException {
    for (int off = 0; off < n; ) {
      room(Long.BYTES);
      int k = Math.min(n - off, buffer.remaining() / Long.BYTES);
      buffer.asLongBuffer().put(values, off, k);
      buffer.position(buffer.position() + k * Long.BYTES);
      off += k;
    }
  }

  /** Puts {@code values[0..n)}. */
  void putDoubles(double[] values, int n) throws IOException {
    for (int off = 0; off < n; ) {
      room(Double.BYTES);
      int k = Math.min(n - off, buffer.remaining() / Double.BYTES);
      buffer.asDoubleBuffer().put(values, off, k);
      buffer.position(buffer.position() + k * Double.BYTES);
      off += k;
    }
  }

  /** Puts {@code values[0..n)}. */
  void putBytes(byte[] values, int n) throws IOException {
    for (int off = 0; off < n; ) {
      room(1);
      int k = Math.min(n - off, buffer.remaining());
      buffer.put(values, off, k);
      off += k;
    }
  }

  /** Writes out what is buffered and flushes the stream. */
  void flush() throws IOException {
    drain();
    out.flush();
  }

  private void room(int size) throws IOException {
    if (buffer.remaining() < size) {
      drain();
    }
  }

  private void drain() throws IOException {
    checksum();
    out.write(bytes, 0, buffer.position());
    buffer.clear();
    checked = 0;
  }

  // ---- reading

  int getInt() throws IOException {
    need(Integer.BYTES);
    return buffer.getInt();
  }

  long getLong() throws IOException {
    need(Long.BYTES);
    return buffer.getLong();
  }

  /** Fills {@code values[0..n)}; EOFException if the stream ends first. */
  void getLongs(long[] values, int n) throws IOException {
    for (int off = 0; off < n; ) {
      need(Long.BYTES);
      int k = Math.min(n - off, buffer.remaining() / Long.BYTES);
      buffer.asLongBuffer().get(values, off, k);
      buffer.position(buffer.position() + k * Long.BYTES);
      off += k;
    }
  }

  /** Fills {@code values[0..n)}; EOFException if the stream ends first. */
  void getDoubles(double[] values, int n) throws IOException {
    for (int off = 0; off < n; ) {
      need(Double.BYTES);
      int k = Math.min(n - off, buffer.remaining() / Double.BYTES);
      buffer.asDoubleBuffer().get(values, off, k);
      buffer.position(buffer.position() + k * Double.BYTES);
      off += k;
    }
  }

  /** Fills {@code values[0..n)}; EOFException if the stream ends first. */
  void getBytes(byte[] values, int n) throws IOException {
    for (int off = 0; off < n; ) {
      need(1);
      int k = Math.min(n - off, buffer.remaining());
      buffer.get(values, off, k);
      off += k;
    }
  }

  /** Whether every byte of the stream has been taken (reads ahead, takes nothing). */
  boolean atEnd() throws IOException {
    if (buffer.remaining() == 0) {
      fill(1);
    }
    return buffer.remaining() == 0;
  }

  /** Makes at least {@code size} bytes available to take, or throws EOFException. */
  private void need(int size) throws IOException {
    if (buffer.remaining() < size) {
      fill(size);
      if (buffer.remaining() < size) {
        throw new EOFException();
      }
    }
  }

  /** Reads until {@code size} bytes are available or the stream ends. */
  private void fill(int size) throws IOException {
    checksum();
    buffer.compact();
    while (buffer.position() < size && !endOfStream) {
      int read = in.read(bytes, buffer.position(), buffer.remaining());
      if (read < 0) {
        endOfStream = true;
      } else {
        buffer.position(buffer.position() + read);
      }
    }
    buffer.flip();
    checked = 0;
  }
}
