package org.sunder.blockwise.store;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Path;
import org.sunder.blockwise.store.codec.Codec;

/**
 * Zarr v2 chunks: the full chunk shape (border chunks padded with the fill value), elements in
 * the dataset's byte order and C or F order, compressed without any header. Keys are the grid
 * indices slowest axis first, joined by the dimension separator ({@code "/"} makes directories).
 */
final class ZarrChunkFormat implements ChunkFormat {
  private final DatasetSpec spec;
  private final Codec codec;
  private final int[] chunkDims;
  private final ByteOrder order;

  ZarrChunkFormat(DatasetSpec spec, Codec codec) {
    this.spec = spec;
    this.codec = codec;
    this.chunkDims = spec.chunkShape();
    this.order = spec.endianness().byteOrder();
  }

  @Override
  public Path chunkFile(Path datasetDir, long[] grid) {
    if (spec.dimensionSeparator().equals("/")) {
      Path file = datasetDir;
      for (int d = grid.length - 1; d >= 0; d--) {
        file = file.resolve(Long.toString(grid[d]));
      }
      return file;
    }
    StringBuilder key = new StringBuilder();
    for (int d = grid.length - 1; d >= 0; d--) {
      key.append(grid[d]);
      if (d > 0) {
        key.append('.');
      }
    }
    return datasetDir.resolve(key.toString());
  }

  @Override
  public int[] storedDims(int[] clippedDims) {
    return chunkDims;
  }

  @Override
  public DecodedChunk decode(byte[] file, int[] clippedDims, int[] lastNeededOrNull)
      throws IOException {
    int count = spec.chunkElements();
    int elementSize = spec.dataType().bytes();
    // a prefix in memory order is a prefix of the stored bytes in C order only
    int needed = lastNeededOrNull == null || spec.chunkOrder() == ChunkOrder.F ? count
        : ChunkFormat.prefixElements(lastNeededOrNull, chunkDims);
    byte[] raw = codec.decodePrefix(file, 0, file.length, count * elementSize,
        needed * elementSize);
    if (spec.chunkOrder() == ChunkOrder.F) {
      raw = BoxCopy.transpose(raw, chunkDims, elementSize, true);
    }
    return new DecodedChunk(ElementArrays.fromBytes(raw, 0, count, spec.dataType(), order),
        chunkDims);
  }

  @Override
  public ByteBuffer[] encode(Object elements, int[] storedDims) {
    byte[] raw = ElementArrays.toBytes(elements, order);
    if (spec.chunkOrder() == ChunkOrder.F) {
      raw = BoxCopy.transpose(raw, chunkDims, spec.dataType().bytes(), false);
    }
    return new ByteBuffer[] {ByteBuffer.wrap(codec.encode(raw))};
  }
}
