package org.sunder.blockwise.store.codec;

import com.github.luben.zstd.Zstd;
import com.github.luben.zstd.ZstdException;
import com.github.luben.zstd.ZstdInputStreamNoFinalizer;
import java.io.ByteArrayInputStream;
import java.io.IOException;

/** Zstandard frames (RFC 8878) through zstd-jni, which bundles its native library. */
public final class ZstdCodec implements Codec {
  private final int level;

  public ZstdCodec(int level) {
    this.level = level;
  }

  @Override
  public byte[] encode(byte[] data) {
    return Zstd.compress(data, level);
  }

  @Override
  public byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    byte[] out = new byte[decodedSize];
    long size;
    try {
      size = Zstd.decompressByteArray(out, 0, decodedSize, source, offset, length);
    } catch (ZstdException e) {
      throw new IOException("zstd data is corrupt or larger than the expected " + decodedSize
          + " bytes: " + e.getMessage(), e);
    }
    if (Zstd.isError(size)) {
      throw new IOException("zstd data is corrupt or larger than the expected " + decodedSize
          + " bytes: " + Zstd.getErrorName(size));
    }
    if (size != decodedSize) {
      throw new IOException("zstd data decompresses to " + size + " bytes, expected "
          + decodedSize);
    }
    return out;
  }

  /**
   * Streams the frame until the prefix is out (zstd decodes blocks of at most 128 KiB in order),
   * at about the one-call decode's cost per byte (832 KiB float chunks, warmed: 0.23 of a chunk
   * in 0.25 ms, 0.5 in 0.49, 0.7 in 0.70, the whole in one call 0.85); a prefix longer than
   * three quarters decodes whole in one call, which costs as much and checks the whole frame.
   */
  @Override
  public byte[] decodePrefix(byte[] source, int offset, int length, int decodedSize,
      int prefixSize) throws IOException {
    if (prefixSize > decodedSize / 4 * 3) {
      return decode(source, offset, length, decodedSize);
    }
    byte[] out = new byte[decodedSize];
    int read;
    try (ZstdInputStreamNoFinalizer in =
        new ZstdInputStreamNoFinalizer(new ByteArrayInputStream(source, offset, length))) {
      read = in.readNBytes(out, 0, prefixSize);
    } catch (IOException | ZstdException e) {
      throw new IOException("zstd data is corrupt: " + e.getMessage(), e);
    }
    if (read != prefixSize) {
      throw new IOException("zstd data decompresses to " + read + " bytes, expected at least "
          + prefixSize + " of " + decodedSize);
    }
    return out;
  }
}
