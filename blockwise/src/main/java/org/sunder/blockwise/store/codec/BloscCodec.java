package org.sunder.blockwise.store.codec;

import com.github.luben.zstd.Zstd;
import com.github.luben.zstd.ZstdException;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Arrays;
import java.util.zip.DataFormatException;
import java.util.zip.Deflater;
import java.util.zip.Inflater;
import net.jpountz.lz4.LZ4Compressor;
import net.jpountz.lz4.LZ4Exception;
import net.jpountz.lz4.LZ4Factory;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.xerial.snappy.Snappy;

/**
 * The blosc 1 frame (c-blosc {@code README_CHUNK_FORMAT.rst}, {@code README_HEADER.rst}): a
 * 16-byte little-endian header (version, versionlz, flags, typesize, nbytes, blocksize, cbytes),
 * then either the raw data (flag "memcpyed") or a table of block offsets and the blocks; each
 * block is one stream or, when split, one stream per byte of the element type, each preceded by
 * its compressed size (equal to the uncompressed size: stored raw). Shuffle is undone per block.
 *
 * <p>Decodes every internal compressor of blosc 1 (blosclz, lz4, lz4hc, snappy, zlib, zstd) with
 * no, byte or bit shuffle, split or not. Encodes with lz4, lz4hc, snappy, zlib or zstd (not
 * blosclz), with the requested shuffle; like c-blosc, lz4/lz4hc/snappy blocks are split into
 * per-byte streams and zlib/zstd blocks are not, and incompressible data is stored memcpyed.
 */
public final class BloscCodec implements Codec {
  static final int HEADER = 16;
  private static final int FLAG_SHUFFLE = 0x01;
  private static final int FLAG_MEMCPYED = 0x02;
  private static final int FLAG_BITSHUFFLE = 0x04;
  private static final int FLAG_DONT_SPLIT = 0x10;
  private static final int MAX_SPLITS = 16;
  private static final int MIN_BUFFERSIZE = 128;
  private static final String[] FORMAT_NAMES = {"blosclz", "lz4", "snappy", "zlib", "zstd"};
  private static final LZ4Factory LZ4 = LZ4Factory.fastestInstance();

  private final String cname;
  private final int clevel;
  private final int shuffle;
  private final int typeSize;
  private final int forcedBlockSize;

  public BloscCodec(CodecSpec spec, int typeSize) {
    this.cname = spec.bloscCompressor();
    this.clevel = spec.level();
    this.typeSize = typeSize;
    this.forcedBlockSize = spec.blockSize();
    int mode = spec.shuffle();
    this.shuffle = mode == CodecSpec.AUTO_SHUFFLE
        ? (typeSize == 1 ? CodecSpec.BIT_SHUFFLE : CodecSpec.BYTE_SHUFFLE) : mode;
  }

  /** Throws unless {@code spec} can be written (blosclz is decoded only). */
  public static void checkEncodable(CodecSpec spec) {
    if ("blosclz".equals(spec.bloscCompressor())) {
      throw new StoreException(ErrorKind.INVALID_CONFIG, "blosc with cname 'blosclz' can be"
          + " read but not written; expected cname lz4, lz4hc, snappy, zlib or zstd for writing");
    }
  }

  // ---------------------------------------------------------------- decoding

  @Override
  public byte[] decode(byte[] source, int offset, int length, int decodedSize)
      throws IOException {
    return decodePrefix(source, offset, length, decodedSize, decodedSize);
  }

  /** Decodes the blocks that hold the prefix, and no others. */
  @Override
  public byte[] decodePrefix(byte[] source, int offset, int length, int decodedSize,
      int prefixSize) throws IOException {
    if (length < HEADER) {
      throw new IOException("blosc frame has " + length + " bytes, less than its 16-byte header");
    }
    ByteBuffer header = ByteBuffer.wrap(source, offset, HEADER).order(ByteOrder.LITTLE_ENDIAN);
    int version = header.get() & 0xff;
    header.get();
    int flags = header.get() & 0xff;
    int typesize = header.get() & 0xff;
    long nbytes = header.getInt() & 0xffffffffL;
    long blocksize = header.getInt() & 0xffffffffL;
    long cbytes = header.getInt() & 0xffffffffL;
    if (version == 0 || version > 2) {
      throw new IOException("blosc frame has format version " + version + ", expected 1 or 2"
          + " (blosc 1)");
    }
    if ((flags & (FLAG_SHUFFLE | FLAG_BITSHUFFLE)) == (FLAG_SHUFFLE | FLAG_BITSHUFFLE)) {
      throw new IOException("blosc frame flags " + flags + " set byte and bit shuffle at once");
    }
    if (nbytes != decodedSize) {
      throw new IOException("blosc header says " + nbytes + " uncompressed bytes, expected "
          + decodedSize);
    }
    if (cbytes > length || cbytes < HEADER) {
      throw new IOException("blosc header says " + cbytes + " compressed bytes, the data has "
          + length + (cbytes > length ? " (truncated)" : ""));
    }
    byte[] out = new byte[decodedSize];
    if (decodedSize == 0) {
      return out;
    }
    if ((flags & FLAG_MEMCPYED) != 0) {
      if (cbytes < HEADER + nbytes) {
        throw new IOException("memcpyed blosc frame has " + (cbytes - HEADER)
            + " data bytes, expected " + nbytes);
      }
      System.arraycopy(source, offset + HEADER, out, 0, decodedSize);
      return out;
    }
    if (blocksize == 0 || typesize == 0) {
      throw new IOException("blosc header has blocksize " + blocksize + " and typesize "
          + typesize + "; expected both positive");
    }
    if (blocksize > Integer.MAX_VALUE - 8) {
      throw new IOException("blosc header has blocksize " + blocksize
          + "; expected at most 2^31 - 9 bytes");
    }
    int format = flags >>> 5;
    if (format >= FORMAT_NAMES.length) {
      throw new IOException("blosc header names compressor format " + format
          + ", expected 0 to 4 (blosclz, lz4, snappy, zlib, zstd)");
    }
    new FrameReader(source, offset, (int) cbytes, flags, typesize, (int) blocksize, format)
        .decodeInto(out, Math.min(prefixSize, decodedSize));
    return out;
  }

  /** The blocks of one frame; not thread-safe, one per decode call. */
  private static final class FrameReader {
    private final byte[] src;
    private final int base;
    private final int cbytes;
    private final int flags;
    private final int typesize;
    private final int blocksize;
    private final int format;
    private final Inflater inflater;

    FrameReader(byte[] src, int base, int cbytes, int flags, int typesize, int blocksize,
        int format) {
      this.src = src;
      this.base = base;
      this.cbytes = cbytes;
      this.flags = flags;
      this.typesize = typesize;
      this.blocksize = blocksize;
      this.format = format;
      this.inflater = format == 3 ? new Inflater() : null;
    }

    /** Decodes the blocks that hold {@code out}'s first {@code prefix} bytes. */
    void decodeInto(byte[] out, int prefix) throws IOException {
      try {
        int nbytes = out.length;
        int nblocks = (int) ((nbytes + (long) blocksize - 1) / blocksize);
        int needed = (int) ((prefix + (long) blocksize - 1) / blocksize);
        int leftover = nbytes % blocksize;
        if (HEADER + 4L * nblocks > cbytes) {
          throw new IOException("blosc frame of " + cbytes + " bytes is too short for the"
              + " offsets of its " + nblocks + " blocks");
        }
        boolean shuffled = ((flags & FLAG_SHUFFLE) != 0 && typesize > 1)
            || (flags & FLAG_BITSHUFFLE) != 0;
        // no block is longer than the chunk, whatever a damaged header says
        int longest = Math.min(blocksize, nbytes);
        byte[] tmp = shuffled ? new byte[longest] : null;
        byte[] scratch = (flags & FLAG_BITSHUFFLE) != 0 ? new byte[longest] : null;
        ByteBuffer starts = ByteBuffer.wrap(src, base + HEADER, 4 * nblocks)
            .order(ByteOrder.LITTLE_ENDIAN);
        for (int j = 0; j < needed; j++) {
          boolean last = j == nblocks - 1 && leftover > 0;
          int bsize = last ? leftover : blocksize;
          long start = starts.getInt() & 0xffffffffL;
          if (start < HEADER + 4L * nblocks || start >= cbytes) {
            throw new IOException("blosc block " + j + " starts at byte " + start
                + ", outside the frame's " + cbytes + " bytes");
          }
          int at = j * blocksize;
          if (shuffled) {
            decodeBlock((int) start, bsize, last, tmp, 0, j);
            if ((flags & FLAG_SHUFFLE) != 0) {
              Shuffle.byteUnshuffle(typesize, tmp, 0, out, at, bsize);
            } else {
              Shuffle.bitUnshuffle(typesize, tmp, 0, out, at, bsize, scratch);
            }
          } else {
            decodeBlock((int) start, bsize, last, out, at, j);
          }
        }
      } finally {
        if (inflater != null) {
          inflater.end();
        }
      }
    }

    private void decodeBlock(int start, int bsize, boolean leftoverBlock, byte[] dst, int dstOff,
        int block) throws IOException {
      boolean split = (flags & FLAG_DONT_SPLIT) == 0 && typesize <= MAX_SPLITS
          && bsize / typesize >= MIN_BUFFERSIZE && !leftoverBlock;
      int nsplits = split ? typesize : 1;
      int neblock = bsize / nsplits;
      int ip = base + start;
      int end = base + cbytes;
      for (int s = 0; s < nsplits; s++) {
        if (ip + 4 > end) {
          throw new IOException("blosc block " + block + " is truncated before stream " + s);
        }
        int size = ByteBuffer.wrap(src, ip, 4).order(ByteOrder.LITTLE_ENDIAN).getInt();
        ip += 4;
        if (size < 0 || ip + (long) size > end) {
          throw new IOException("blosc block " + block + " stream " + s + " says " + size
              + " compressed bytes, past the end of the frame");
        }
        int target = dstOff + s * neblock;
        if (size == neblock) {
          System.arraycopy(src, ip, dst, target, neblock);
        } else {
          int got = decompress(ip, size, dst, target, neblock);
          if (got != neblock) {
            throw new IOException("blosc block " + block + " stream " + s + " ("
                + FORMAT_NAMES[format] + ") decompresses to " + got + " bytes, expected "
                + neblock);
          }
        }
        ip += size;
      }
    }

    private int decompress(int ip, int size, byte[] dst, int dstOff, int expected)
        throws IOException {
      switch (format) {
        case 0:
          return BloscLz.decompress(src, ip, size, dst, dstOff, expected);
        case 1:
          try {
            return LZ4.safeDecompressor().decompress(src, ip, size, dst, dstOff, expected);
          } catch (LZ4Exception e) {
            throw new IOException("lz4 stream inside blosc is corrupt: " + e.getMessage(), e);
          }
        case 2:
          return snappy(ip, size, dst, dstOff, expected);
        case 3:
          return zlib(ip, size, dst, dstOff, expected);
        default:
          try {
            long got = Zstd.decompressByteArray(dst, dstOff, expected, src, ip, size);
            if (Zstd.isError(got)) {
              throw new IOException("zstd stream inside blosc is corrupt: "
                  + Zstd.getErrorName(got));
            }
            return (int) got;
          } catch (ZstdException e) {
            throw new IOException("zstd stream inside blosc is corrupt: " + e.getMessage(), e);
          }
      }
    }

    private int snappy(int ip, int size, byte[] dst, int dstOff, int expected)
        throws IOException {
      if (!Snappy.isValidCompressedBuffer(src, ip, size)
          || Snappy.uncompressedLength(src, ip, size) != expected) {
        throw new IOException("snappy stream inside blosc is corrupt or does not hold "
            + expected + " bytes");
      }
      return Snappy.uncompress(src, ip, size, dst, dstOff);
    }

    private int zlib(int ip, int size, byte[] dst, int dstOff, int expected)
        throws IOException {
      inflater.reset();
      inflater.setInput(src, ip, size);
      try {
        int total = 0;
        while (total < expected && !inflater.finished()) {
          int n = inflater.inflate(dst, dstOff + total, expected - total);
          if (n == 0 && (inflater.needsInput() || inflater.needsDictionary())) {
            break;
          }
          total += n;
        }
        return total;
      } catch (DataFormatException e) {
        throw new IOException("zlib stream inside blosc is corrupt: " + e.getMessage(), e);
      }
    }
  }

  // ---------------------------------------------------------------- encoding

  @Override
  public byte[] encode(byte[] data) {
    if (cname.equals("blosclz")) {
      checkEncodable(CodecSpec.blosc(cname, clevel, shuffle));
    }
    int nbytes = data.length;
    int blocksize = blockSize(nbytes);
    int flags = (formatCode() << 5) | shuffleFlag() | (splits() ? 0 : FLAG_DONT_SPLIT);
    byte[] out = new byte[nbytes + HEADER];
    int end = nbytes == 0 ? -1 : encodeBlocks(data, blocksize, out);
    if (end < 0) {
      System.arraycopy(header(flags | FLAG_MEMCPYED, nbytes, blocksize, nbytes + HEADER), 0,
          out, 0, HEADER);
      System.arraycopy(data, 0, out, HEADER, nbytes);
      return out;
    }
    System.arraycopy(header(flags, nbytes, blocksize, end), 0, out, 0, HEADER);
    return Arrays.copyOf(out, end);
  }

  /** Like c-blosc 1: every internal compressor but zstd gets one stream per element byte. */
  private boolean splits() {
    return !cname.equals("zstd");
  }

  /**
   * Writes the block offsets and blocks after the header; returns the frame's end, or -1 if
   * the frame would not be smaller than the data stored raw.
   */
  private int encodeBlocks(byte[] data, int blocksize, byte[] out) {
    int nbytes = data.length;
    int nblocks = (nbytes + blocksize - 1) / blocksize;
    int leftover = nbytes % blocksize;
    int limit = out.length;
    int op = HEADER + 4 * nblocks < limit ? HEADER + 4 * nblocks : -1;
    byte[] tmp = shuffleFlag() != 0 ? new byte[blocksize] : null;
    byte[] scratch = shuffle == CodecSpec.BIT_SHUFFLE ? new byte[blocksize] : null;
    BlockCompressor compressor = new BlockCompressor(cname, formatCode(), clevel);
    try {
      for (int j = 0; j < nblocks && op >= 0; j++) {
        writeIntLe(out, HEADER + 4 * j, op);
        boolean last = j == nblocks - 1 && leftover > 0;
        int bsize = last ? leftover : blocksize;
        byte[] blockSource = data;
        int blockOff = j * blocksize;
        if (tmp != null) {
          if (shuffle == CodecSpec.BIT_SHUFFLE) {
            Shuffle.bitShuffle(typeSize, data, blockOff, tmp, 0, bsize, scratch);
          } else {
            Shuffle.byteShuffle(typeSize, data, blockOff, tmp, 0, bsize);
          }
          blockSource = tmp;
          blockOff = 0;
        }
        boolean split = splits() && typeSize <= MAX_SPLITS
            && bsize / typeSize >= MIN_BUFFERSIZE && !last;
        op = encodeBlock(compressor, blockSource, blockOff, bsize, split ? typeSize : 1, out, op,
            limit);
      }
    } finally {
      compressor.close();
    }
    return op;
  }

  /** Writes one block's streams at {@code op}; returns the new end, or -1 if it overflows. */
  private static int encodeBlock(BlockCompressor compressor, byte[] src, int srcOff, int bsize,
      int nsplits, byte[] out, int op, int limit) {
    int neblock = bsize / nsplits;
    for (int s = 0; s < nsplits; s++) {
      if (op + 4 > limit) {
        return -1;
      }
      int room = Math.min(limit - op - 4, neblock);
      int size = compressor.compress(src, srcOff + s * neblock, neblock, out, op + 4, room);
      if (size <= 0 || size >= neblock) {
        if (op + 4 + neblock > limit) {
          return -1;
        }
        System.arraycopy(src, srcOff + s * neblock, out, op + 4, neblock);
        size = neblock;
      }
      writeIntLe(out, op, size);
      op += 4 + size;
    }
    return op;
  }

  private int blockSize(int nbytes) {
    if (nbytes < typeSize) {
      return Math.max(1, nbytes);
    }
    int size;
    if (forcedBlockSize > 0) {
      size = Math.max(forcedBlockSize, MIN_BUFFERSIZE);
    } else {
      size = 32 * 1024;
      if (cname.equals("lz4hc") || cname.equals("zlib") || cname.equals("zstd")) {
        size *= 2;
      }
      size = switch (clevel) {
        case 0 -> size / 4;
        case 1, 2, 3 -> size / 2;
        case 4, 5 -> size;
        case 6 -> size * 2;
        case 7, 8 -> size * 4;
        default -> size * 8;
      };
    }
    size = Math.min(size, nbytes);
    return size > typeSize ? size / typeSize * typeSize : size;
  }

  private int formatCode() {
    return switch (cname) {
      case "lz4", "lz4hc" -> 1;
      case "snappy" -> 2;
      case "zlib" -> 3;
      case "zstd" -> 4;
      default -> 0;
    };
  }

  private int shuffleFlag() {
    return switch (shuffle) {
      case CodecSpec.BYTE_SHUFFLE -> typeSize > 1 ? FLAG_SHUFFLE : 0;
      case CodecSpec.BIT_SHUFFLE -> FLAG_BITSHUFFLE;
      default -> 0;
    };
  }

  private byte[] header(int flags, int nbytes, int blocksize, int cbytes) {
    byte[] head = new byte[HEADER];
    head[0] = 2;
    head[1] = 1;
    head[2] = (byte) flags;
    head[3] = (byte) typeSize;
    writeIntLe(head, 4, nbytes);
    writeIntLe(head, 8, blocksize);
    writeIntLe(head, 12, cbytes);
    return head;
  }

  private static void writeIntLe(byte[] out, int at, int value) {
    out[at] = (byte) value;
    out[at + 1] = (byte) (value >>> 8);
    out[at + 2] = (byte) (value >>> 16);
    out[at + 3] = (byte) (value >>> 24);
  }

  /** One internal compressor for the blocks of one frame; not thread-safe. */
  private static final class BlockCompressor {
    private final int format;
    private final int clevel;
    private final LZ4Compressor lz4;
    private final Deflater deflater;
    private byte[] buffer = new byte[0];

    BlockCompressor(String cname, int format, int clevel) {
      this.format = format;
      this.clevel = clevel;
      this.lz4 = format != 1 ? null
          : cname.equals("lz4hc") ? LZ4.highCompressor(Math.max(1, clevel)) : LZ4.fastCompressor();
      this.deflater = format == 3 ? new Deflater(clevel) : null;
    }

    private byte[] buffer(int size) {
      if (buffer.length < size) {
        buffer = new byte[size];
      }
      return buffer;
    }

    /** Compressed size written at {@code dstOff}, or 0 if it does not fit in {@code room}. */
    int compress(byte[] src, int off, int len, byte[] dst, int dstOff, int room) {
      switch (format) {
        case 1: {
          byte[] scratch = buffer(lz4.maxCompressedLength(len));
          int size = lz4.compress(src, off, len, scratch, 0, scratch.length);
          return copyIfFits(scratch, size, dst, dstOff, room);
        }
        case 2: {
          byte[] scratch = buffer(Snappy.maxCompressedLength(len));
          try {
            int size = Snappy.compress(src, off, len, scratch, 0);
            return copyIfFits(scratch, size, dst, dstOff, room);
          } catch (IOException e) {
            throw new java.io.UncheckedIOException("snappy compression failed", e);
          }
        }
        case 3: {
          deflater.reset();
          deflater.setInput(src, off, len);
          deflater.finish();
          int size = 0;
          while (!deflater.finished() && size < room) {
            size += deflater.deflate(dst, dstOff + size, room - size);
          }
          return deflater.finished() ? size : 0;
        }
        default: {
          try {
            long size = Zstd.compressByteArray(dst, dstOff, room, src, off, len, clevel);
            return Zstd.isError(size) ? 0 : (int) size;
          } catch (ZstdException e) {
            return 0;
          }
        }
      }
    }

    private static int copyIfFits(byte[] scratch, int size, byte[] dst, int dstOff, int room) {
      if (size > room) {
        return 0;
      }
      System.arraycopy(scratch, 0, dst, dstOff, size);
      return size;
    }

    void close() {
      if (deflater != null) {
        deflater.end();
      }
    }
  }
}
