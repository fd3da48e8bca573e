package org.sunder.blockwise.store.codec;

import java.io.IOException;

/**
 * Compresses and decompresses the bytes of one chunk. Implementations are immutable and
 * thread-safe; one instance serves every chunk of a dataset.
 */
public interface Codec {

  /** The compressed form of {@code data}; {@code data} is not changed. */
  byte[] encode(byte[] data);

  /**
   * Decompresses {@code length} bytes of {@code source} starting at {@code offset}.
   *
   * @param decodedSize the exact size the decoded chunk must have
   * @return a new array of exactly {@code decodedSize} bytes
   * @throws IOException if the bytes are truncated, corrupt, or decode to another size; the
   *     message says what was found and what was expected
   */
  byte[] decode(byte[] source, int offset, int length, int decodedSize) throws IOException;

  /**
   * As {@link #decode}, for a reader that needs only the first {@code prefixSize} bytes: they
   * are as {@code decode} gives them, the rest of the {@code decodedSize} bytes are unspecified.
   * Codecs that decode front to back stop once the prefix is out; the others decode it all
   * (this default). What lies beyond the prefix is not checked.
   */
  default byte[] decodePrefix(byte[] source, int offset, int length, int decodedSize,
      int prefixSize) throws IOException {
    return decode(source, offset, length, decodedSize);
  }
}
