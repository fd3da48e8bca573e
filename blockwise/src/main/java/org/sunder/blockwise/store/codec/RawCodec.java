package org.sunder.blockwise.store.codec;

import java.io.IOException;

/** No compression: the bytes are stored as they are. */
public final class RawCodec implements Codec {

  @Override
  public byte[] encode(byte[] data) {
    return data.clone();
  }

  @Override
  public byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    return decodePrefix(source, offset, length, decodedSize, decodedSize);
  }

  @Override
  public byte[] decodePrefix(byte[] source, int offset, int length, int decodedSize,
      int prefixSize) throws IOException {
    if (length != decodedSize) {
      throw new IOException("raw chunk has " + length + " bytes, expected " + decodedSize);
    }
    byte[] out = new byte[decodedSize];
    System.arraycopy(source, offset, out, 0, Math.min(prefixSize, decodedSize));
    return out;
  }
}
