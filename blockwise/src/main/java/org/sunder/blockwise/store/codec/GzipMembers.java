package org.sunder.blockwise.store.codec;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.util.zip.GZIPInputStream;

/** Decodes one or more concatenated gzip members (RFC 1952) into an exact-size array. */
final class GzipMembers {
  private GzipMembers() {}

  static byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    try (GZIPInputStream in =
        new GZIPInputStream(new ByteArrayInputStream(source, offset, length), 65536)) {
      byte[] out = in.readNBytes(decodedSize);
      if (out.length != decodedSize) {
        throw new IOException("gzip data ends after " + out.length
            + " decompressed bytes, expected " + decodedSize);
      }
      if (in.read() != -1) {
        throw new IOException("gzip data decompresses to more than the expected "
            + decodedSize + " bytes");
      }
      return out;
    } catch (java.io.EOFException e) {
      throw new IOException("gzip data is truncated: " + e.getMessage(), e);
    } catch (java.util.zip.ZipException e) {
      throw new IOException("gzip data is corrupt: " + e.getMessage(), e);
    }
  }
}
