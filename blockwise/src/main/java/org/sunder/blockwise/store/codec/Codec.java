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
}
