package org.sunder.blockwise.store;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Path;

/**
 * How one format lays out a chunk: where its file is, which shape it is stored with, and how
 * its elements become bytes and back. Implementations are immutable and thread-safe.
 */
interface ChunkFormat {

  /** The chunk's file under the dataset directory; {@code grid} in memory order. */
  Path chunkFile(Path datasetDir, long[] grid);

  /** The shape the chunk is written with, given its shape clipped to the volume. */
  int[] storedDims(int[] clippedDims);

  /**
   * Decodes a chunk file. The result's dims cover at least {@code clippedDims} in every
   * dimension and at most the chunk shape. With {@code lastNeededOrNull} (a position inside
   * {@code clippedDims}, memory order) only the elements up to it in memory order are needed:
   * the rest may be left unspecified, and a format whose codec decodes front to back stops
   * there (see {@link org.sunder.blockwise.store.codec.Codec#decodePrefix}).
   *
   * @throws IOException naming what is wrong (header, size, compressed data)
   */
  DecodedChunk decode(byte[] file, int[] clippedDims, int[] lastNeededOrNull) throws IOException;

  /** Elements up to and including {@code position} in memory order, in an array of {@code dims}. */
  static int prefixElements(int[] position, int[] dims) {
    long index = 0;
    for (int d = dims.length - 1; d >= 0; d--) {
      index = index * dims[d] + position[d];
    }
    return Math.toIntExact(index + 1);
  }

  /** The file content for {@code elements} of shape {@code storedDims}. */
  ByteBuffer[] encode(Object elements, int[] storedDims);

  /** A chunk's elements in memory order and their shape. */
  record DecodedChunk(Object elements, int[] dims) {}
}
