package org.sunder.blockwise.store;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Path;
import java.util.Arrays;
import org.sunder.blockwise.store.codec.Codec;

/**
 * N5 blocks: a big-endian header (mode uint16, dimension count uint16, the block's size per
 * dimension uint32, and for mode 1 the element count uint32) followed by the compressed
 * big-endian elements. Border blocks are written truncated to the volume; blocks of any size
 * between the truncated and the full chunk shape are read (Python's N5 store writes full ones).
 */
final class N5ChunkFormat implements ChunkFormat {
  private static final int MODE_DEFAULT = 0;
  private static final int MODE_VARLENGTH = 1;

  private final DatasetSpec spec;
  private final Codec codec;

  N5ChunkFormat(DatasetSpec spec, Codec codec) {
    this.spec = spec;
    this.codec = codec;
  }

  @Override
  public Path chunkFile(Path datasetDir, long[] grid) {
    Path file = datasetDir;
    for (long g : grid) {
      file = file.resolve(Long.toString(g));
    }
    return file;
  }

  @Override
  public int[] storedDims(int[] clippedDims) {
    return clippedDims;
  }

  @Override
  public DecodedChunk decode(byte[] file, int[] clippedDims, int[] lastNeededOrNull)
      throws IOException {
    int n = spec.numDimensions();
    if (file.length < 4) {
      throw new IOException("block has " + file.length + " bytes, less than its 4-byte header");
    }
    ByteBuffer header = ByteBuffer.wrap(file).order(ByteOrder.BIG_ENDIAN);
    int mode = header.getShort() & 0xffff;
    int dims = header.getShort() & 0xffff;
    if (mode != MODE_DEFAULT && mode != MODE_VARLENGTH) {
      throw new IOException("block header has mode " + mode + ", expected 0 (default) or 1"
          + " (varlength)");
    }
    if (dims != n) {
      throw new IOException("block header says " + dims + " dimensions, expected " + n);
    }
    int headerSize = 4 + 4 * n + (mode == MODE_VARLENGTH ? 4 : 0);
    if (file.length < headerSize) {
      throw new IOException("block has " + file.length + " bytes, less than its "
          + headerSize + "-byte header");
    }
    int[] size = new int[n];
    long count = 1;
    for (int d = 0; d < n; d++) {
      size[d] = header.getInt();
      if (Integer.compareUnsigned(size[d], clippedDims[d]) < 0
          || Integer.compareUnsigned(size[d], spec.chunkShape(d)) > 0) {
        throw new IOException("block header size " + Integer.toUnsignedString(size[d])
            + " in dimension " + d + " (header " + headerDims(file, n) + ") is outside "
            + clippedDims[d] + " to " + spec.chunkShape(d) + " for this block");
      }
      count *= size[d];
    }
    if (mode == MODE_VARLENGTH) {
      long stated = header.getInt() & 0xffffffffL;
      if (stated != count) {
        throw new IOException("varlength block header counts " + stated
            + " elements, expected " + count + " for block size " + Arrays.toString(size));
      }
    }
    int bytes = (int) count * spec.dataType().bytes();
    int needed = lastNeededOrNull == null ? (int) count
        : ChunkFormat.prefixElements(lastNeededOrNull, size);
    byte[] raw = codec.decodePrefix(file, headerSize, file.length - headerSize, bytes,
        needed * spec.dataType().bytes());
    Object elements = ElementArrays.fromBytes(raw, 0, (int) count, spec.dataType(),
        ByteOrder.BIG_ENDIAN);
    return new DecodedChunk(elements, size);
  }

  private static String headerDims(byte[] file, int n) {
    ByteBuffer header = ByteBuffer.wrap(file, 4, 4 * n).order(ByteOrder.BIG_ENDIAN);
    long[] dims = new long[n];
    for (int d = 0; d < n; d++) {
      dims[d] = header.getInt() & 0xffffffffL;
    }
    return Arrays.toString(dims);
  }

  @Override
  public ByteBuffer[] encode(Object elements, int[] storedDims) {
    int n = storedDims.length;
    ByteBuffer header = ByteBuffer.allocate(4 + 4 * n).order(ByteOrder.BIG_ENDIAN);
    header.putShort((short) MODE_DEFAULT).putShort((short) n);
    for (int size : storedDims) {
      header.putInt(size);
    }
    header.flip();
    byte[] payload = codec.encode(ElementArrays.toBytes(elements, ByteOrder.BIG_ENDIAN));
    return new ByteBuffer[] {header, ByteBuffer.wrap(payload)};
  }
}
