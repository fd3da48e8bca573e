package org.sunder.blockwise.store.codec;

import java.io.IOException;
import java.util.zip.CRC32;
import java.util.zip.DataFormatException;
import java.util.zip.Inflater;

/**
 * Decodes one or more concatenated gzip members (RFC 1952) into an exact-size array: each
 * member's header (with optional extra field, name, comment and header CRC) is skipped, its raw
 * deflate data inflated straight into the output, and its CRC-32 and size trailer checked.
 */
final class GzipMembers {
  private static final int FHCRC = 2;
  private static final int FEXTRA = 4;
  private static final int FNAME = 8;
  private static final int FCOMMENT = 16;

  private GzipMembers() {}

  static byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    byte[] out = new byte[decodedSize];
    int end = offset + length;
    int at = offset;
    int size = 0;
    Inflater inflater = new Inflater(true);
    try {
      do {
        at = skipHeader(source, at, end);
        inflater.reset();
        inflater.setInput(source, at, end - at);
        int start = size;
        size = DeflateCodec.inflate(inflater, out, size, "gzip");
        if (!inflater.finished()) {
          if (size == out.length && inflater.inflate(new byte[1]) > 0) {
            throw new IOException("gzip data decompresses to more than the expected "
                + decodedSize + " bytes");
          }
          if (!inflater.finished()) {
            throw new IOException("gzip data is truncated after " + size + " bytes");
          }
        }
        at = end - inflater.getRemaining();
        at = checkTrailer(source, at, end, out, start, size - start);
      } while (at < end && size < out.length);
    } catch (DataFormatException e) {
      throw new IOException("gzip data is corrupt: " + e.getMessage(), e);
    } finally {
      inflater.end();
    }
    if (size != decodedSize) {
      throw new IOException("gzip data ends after " + size + " decompressed bytes, expected "
          + decodedSize);
    }
    if (at < end) {
      throw new IOException("gzip data decompresses to more than the expected " + decodedSize
          + " bytes");
    }
    return out;
  }

  private static int skipHeader(byte[] b, int at, int end) throws IOException {
    if (end - at < 10) {
      throw new IOException("gzip member at byte " + at + " is shorter than its 10-byte header");
    }
    if ((b[at] & 0xff) != 0x1f || (b[at + 1] & 0xff) != 0x8b || b[at + 2] != 8) {
      throw new IOException("gzip data does not start with the gzip magic 1f 8b 08 (found "
          + String.format("%02x %02x %02x", b[at], b[at + 1], b[at + 2]) + ")");
    }
    int flags = b[at + 3] & 0xff;
    int p = at + 10;
    if ((flags & FEXTRA) != 0) {
      if (p + 2 > end) {
        throw new IOException("gzip header is truncated in its extra field");
      }
      p += 2 + ((b[p] & 0xff) | (b[p + 1] & 0xff) << 8);
    }
    for (int flag : new int[] {FNAME, FCOMMENT}) {
      if ((flags & flag) != 0) {
        while (p < end && b[p] != 0) {
          p++;
        }
        p++;
      }
    }
    if ((flags & FHCRC) != 0) {
      p += 2;
    }
    if (p > end) {
      throw new IOException("gzip header is truncated");
    }
    return p;
  }

  private static int checkTrailer(byte[] b, int at, int end, byte[] out, int from, int count)
      throws IOException {
    if (end - at < 8) {
      throw new IOException("gzip member is truncated in its 8-byte trailer");
    }
    CRC32 crc = new CRC32();
    crc.update(out, from, count);
    int stated = intLe(b, at);
    if (stated != (int) crc.getValue()) {
      throw new IOException("gzip member fails its CRC-32 check");
    }
    if (intLe(b, at + 4) != count) {
      throw new IOException("gzip trailer says " + Integer.toUnsignedString(intLe(b, at + 4))
          + " bytes, the member holds " + count);
    }
    return at + 8;
  }

  private static int intLe(byte[] b, int at) {
    return (b[at] & 0xff) | (b[at + 1] & 0xff) << 8 | (b[at + 2] & 0xff) << 16
        | (b[at + 3] & 0xff) << 24;
  }
}
