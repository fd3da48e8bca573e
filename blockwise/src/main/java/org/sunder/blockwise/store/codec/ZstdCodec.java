package org.sunder.blockwise.store.codec;

import com.github.luben.zstd.Zstd;
import com.github.luben.zstd.ZstdException;
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
}
