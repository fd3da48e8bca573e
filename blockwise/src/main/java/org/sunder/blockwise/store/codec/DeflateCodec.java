package org.sunder.blockwise.store.codec;

import java.io.IOException;
import java.util.Arrays;
import java.util.zip.DataFormatException;
import java.util.zip.Deflater;
import java.util.zip.Inflater;

/**
 * Deflate (RFC 1951) in a zlib stream (RFC 1950) or a gzip member (RFC 1952), with the JDK's
 * zlib. Gzip input may hold several concatenated members, as gzip files may.
 */
public final class DeflateCodec implements Codec {
  private static final int GZIP_HEADER = 10;
  private static final int GZIP_TRAILER = 8;

  private final boolean gzip;
  private final int level;

  public DeflateCodec(boolean gzip, int level) {
    this.gzip = gzip;
    this.level = level;
  }

  @Override
  public byte[] encode(byte[] data) {
    Deflater deflater = new Deflater(level, gzip);
    try {
      deflater.setInput(data);
      deflater.finish();
      int prefix = gzip ? GZIP_HEADER : 0;
      byte[] out = new byte[prefix + data.length / 2 + 64];
      int size = prefix;
      while (!deflater.finished()) {
        if (size == out.length) {
          out = Arrays.copyOf(out, out.length * 2);
        }
        size += deflater.deflate(out, size, out.length - size);
      }
      if (!gzip) {
        return Arrays.copyOf(out, size);
      }
      out = Arrays.copyOf(out, size + GZIP_TRAILER);
      out[0] = 0x1f;
      out[1] = (byte) 0x8b;
      out[2] = 8;
      out[9] = (byte) 0xff;
      java.util.zip.CRC32 crc = new java.util.zip.CRC32();
      crc.update(data);
      putIntLe(out, size, (int) crc.getValue());
      putIntLe(out, size + 4, data.length);
      return out;
    } finally {
      deflater.end();
    }
  }

  private static void putIntLe(byte[] out, int at, int value) {
    out[at] = (byte) value;
    out[at + 1] = (byte) (value >>> 8);
    out[at + 2] = (byte) (value >>> 16);
    out[at + 3] = (byte) (value >>> 24);
  }

  @Override
  public byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    if (gzip) {
      return GzipMembers.decode(source, offset, length, decodedSize);
    }
    Inflater inflater = new Inflater(false);
    try {
      inflater.setInput(source, offset, length);
      byte[] out = new byte[decodedSize];
      int size = inflate(inflater, out, 0, "zlib");
      if (size != decodedSize) {
        throw new IOException("zlib data ends after " + size + " decompressed bytes, expected "
            + decodedSize);
      }
      if (!inflater.finished()) {
        if (inflater.inflate(new byte[1]) > 0) {
          throw new IOException("zlib data decompresses to more than the expected "
              + decodedSize + " bytes");
        }
        if (!inflater.finished()) {
          throw new IOException("zlib data is truncated after " + decodedSize + " bytes");
        }
      }
      return out;
    } catch (DataFormatException e) {
      throw new IOException("zlib data is corrupt: " + e.getMessage(), e);
    } finally {
      inflater.end();
    }
  }

  /** Inflates into {@code out} from {@code at} until it is full or the stream ends. */
  static int inflate(Inflater inflater, byte[] out, int at, String name)
      throws DataFormatException, IOException {
    int size = at;
    while (size < out.length && !inflater.finished()) {
      int n = inflater.inflate(out, size, out.length - size);
      if (n == 0 && (inflater.needsInput() || inflater.needsDictionary())) {
        throw new IOException(name + " data is truncated after " + (size) + " decompressed bytes,"
            + " expected " + out.length);
      }
      size += n;
    }
    return size;
  }
}
