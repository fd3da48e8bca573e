package org.sunder.blockwise.store.codec;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import net.jpountz.lz4.LZ4BlockInputStream;
import net.jpountz.lz4.LZ4BlockOutputStream;
import net.jpountz.lz4.LZ4Compressor;
import net.jpountz.lz4.LZ4Exception;
import net.jpountz.lz4.LZ4Factory;
import net.jpountz.lz4.LZ4SafeDecompressor;

/**
 * LZ4 (the LZ4 block format) in one of two framings, both read whatever was written:
 *
 * <ul>
 *   <li>{@link Framing#SIZE_PREFIXED}, numcodecs' {@code LZ4}: the uncompressed size as a 4-byte
 *       little-endian integer, then one LZ4 block. Written for Zarr.
 *   <li>{@link Framing#BLOCK_STREAM}, lz4-java's {@code LZ4BlockOutputStream} (each block with
 *       the {@code "LZ4Block"} magic, sizes and an xxhash32 checksum), which N5's Java writers
 *       use. Written for N5.
 * </ul>
 */
public final class Lz4Codec implements Codec {
  private static final byte[] MAGIC = "LZ4Block".getBytes(StandardCharsets.US_ASCII);
  private static final LZ4Factory FACTORY = LZ4Factory.fastestInstance();

  /** How the LZ4 data is framed. */
  public enum Framing { SIZE_PREFIXED, BLOCK_STREAM }

  private final Framing framing;
  private final int blockSize;

  public Lz4Codec(Framing framing, int blockSize) {
    this.framing = framing;
    this.blockSize = blockSize;
  }

  @Override
  public byte[] encode(byte[] data) {
    return framing == Framing.SIZE_PREFIXED ? encodeSizePrefixed(data) : encodeBlockStream(data);
  }

  private static byte[] encodeSizePrefixed(byte[] data) {
    LZ4Compressor compressor = FACTORY.fastCompressor();
    byte[] out = new byte[4 + compressor.maxCompressedLength(data.length)];
    out[0] = (byte) data.length;
    out[1] = (byte) (data.length >>> 8);
    out[2] = (byte) (data.length >>> 16);
    out[3] = (byte) (data.length >>> 24);
    int size = compressor.compress(data, 0, data.length, out, 4, out.length - 4);
    return java.util.Arrays.copyOf(out, 4 + size);
  }

  private byte[] encodeBlockStream(byte[] data) {
    ByteArrayOutputStream sink = new ByteArrayOutputStream(data.length / 2 + 64);
    try (LZ4BlockOutputStream out =
        new LZ4BlockOutputStream(sink, Math.max(64, blockSize), FACTORY.fastCompressor())) {
      out.write(data);
    } catch (IOException e) {
      throw new UncheckedIOException("in-memory lz4 compression failed", e);
    }
    return sink.toByteArray();
  }

  @Override
  public byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    if (length >= MAGIC.length && java.util.Arrays.equals(source, offset, offset + MAGIC.length,
        MAGIC, 0, MAGIC.length)) {
      return decodeBlockStream(source, offset, length, decodedSize);
    }
    return decodeSizePrefixed(source, offset, length, decodedSize);
  }

  private static byte[] decodeSizePrefixed(byte[] source, int offset, int length,
      int decodedSize) throws IOException {
    if (length < 4) {
      throw new IOException("lz4 data has " + length + " bytes, less than its 4-byte size prefix");
    }
    int stated = (source[offset] & 0xff) | (source[offset + 1] & 0xff) << 8
        | (source[offset + 2] & 0xff) << 16 | (source[offset + 3] & 0xff) << 24;
    if (stated != decodedSize) {
      throw new IOException("lz4 size prefix says " + Integer.toUnsignedString(stated)
          + " bytes, expected " + decodedSize);
    }
    byte[] out = new byte[decodedSize];
    LZ4SafeDecompressor decompressor = FACTORY.safeDecompressor();
    int size;
    try {
      size = decompressor.decompress(source, offset + 4, length - 4, out, 0, decodedSize);
    } catch (LZ4Exception e) {
      throw new IOException("lz4 data is corrupt: " + e.getMessage(), e);
    }
    if (size != decodedSize) {
      throw new IOException("lz4 data decompresses to " + size + " bytes, expected "
          + decodedSize);
    }
    return out;
  }

  private static byte[] decodeBlockStream(byte[] source, int offset, int length,
      int decodedSize) throws IOException {
    StreamCodec stream = new StreamCodec() {
      @Override
      java.io.OutputStream compressing(java.io.OutputStream sink, int length) {
        throw new UnsupportedOperationException();
      }

      @Override
      java.io.InputStream decompressing(java.io.InputStream in) {
        return LZ4BlockInputStream.newBuilder().withDecompressor(FACTORY.safeDecompressor())
            .build(in);
      }

      @Override
      String name() {
        return "lz4 block stream";
      }
    };
    return stream.decode(source, offset, length, decodedSize);
  }
}
