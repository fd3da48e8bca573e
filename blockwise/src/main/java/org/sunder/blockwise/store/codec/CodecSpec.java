package org.sunder.blockwise.store.codec;

import java.io.Serializable;
import java.util.Objects;
import java.util.Set;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.store.Codecs;

/**
 * Which compression a dataset's chunks use, with its parameters. An immutable value; the codec
 * itself is made by {@link org.sunder.blockwise.store.Codecs}.
 *
 * <p>Names: {@code raw}, {@code gzip}, {@code zlib}, {@code zstd}, {@code lz4}, {@code bzip2},
 * {@code xz}, {@code blosc}. {@link #level()} is the compression level (gzip, zlib, zstd, blosc's
 * clevel), the preset (xz), the block size in 100 kB (bzip2) or the acceleration (lz4).
 */
public final class CodecSpec implements Serializable {
  private static final long serialVersionUID = 1L;

  /** Blosc's shuffle modes, as numcodecs numbers them. */
  public static final int NO_SHUFFLE = 0;
  public static final int BYTE_SHUFFLE = 1;
  public static final int BIT_SHUFFLE = 2;
  /** numcodecs' "bit shuffle for 1-byte elements, byte shuffle otherwise". */
  public static final int AUTO_SHUFFLE = -1;

  /** The internal compressors of blosc 1. */
  public static final Set<String> BLOSC_COMPRESSORS =
      Set.of("blosclz", "lz4", "lz4hc", "zlib", "zstd", "snappy");

  private final String name;
  private final int level;
  private final String bloscCompressor;
  private final int shuffle;
  private final int blockSize;

  private CodecSpec(String name, int level, String bloscCompressor, int shuffle, int blockSize) {
    this.name = name;
    this.level = level;
    this.bloscCompressor = bloscCompressor;
    this.shuffle = shuffle;
    this.blockSize = blockSize;
  }

  /** No compression. */
  public static CodecSpec raw() {
    return new CodecSpec("raw", 0, null, 0, 0);
  }

  /** Deflate in a gzip member (RFC 1952); level 0 to 9. */
  public static CodecSpec gzip(int level) {
    return new CodecSpec("gzip", checkRange("gzip level", level, 0, 9), null, 0, 0);
  }

  /** Deflate in a zlib stream (RFC 1950); level 0 to 9. */
  public static CodecSpec zlib(int level) {
    return new CodecSpec("zlib", checkRange("zlib level", level, 0, 9), null, 0, 0);
  }

  /** Zstandard; level -131072 to 22 (3 is zstd's default). */
  public static CodecSpec zstd(int level) {
    return new CodecSpec("zstd", checkRange("zstd level", level, -131072, 22), null, 0, 0);
  }

  /** LZ4 with acceleration 1. */
  public static CodecSpec lz4() {
    return lz4(1);
  }

  /** LZ4 with the given acceleration (1 = default, higher = faster, larger). */
  public static CodecSpec lz4(int acceleration) {
    return new CodecSpec("lz4", checkRange("lz4 acceleration", acceleration, 1, 65537),
        null, 0, 65536);
  }

  /** bzip2 with 900 kB blocks. */
  public static CodecSpec bzip2() {
    return bzip2(9);
  }

  /** bzip2 with blocks of {@code blockSize} times 100 kB, 1 to 9. */
  public static CodecSpec bzip2(int blockSize) {
    return new CodecSpec("bzip2", checkRange("bzip2 block size", blockSize, 1, 9), null, 0, 0);
  }

  /** xz (LZMA2 in the .xz container) with preset 0 to 9. */
  public static CodecSpec xz(int preset) {
    return new CodecSpec("xz", checkRange("xz preset", preset, 0, 9), null, 0, 0);
  }

  /** A blosc 1 frame, blosc's automatic block size. */
  public static CodecSpec blosc(String cname, int clevel, int shuffle) {
    return blosc(cname, clevel, shuffle, 0);
  }

  /**
   * A blosc 1 frame with internal compressor {@code cname} (one of {@link #BLOSC_COMPRESSORS}),
   * level 0 to 9, shuffle {@link #NO_SHUFFLE}, {@link #BYTE_SHUFFLE}, {@link #BIT_SHUFFLE} or
   * {@link #AUTO_SHUFFLE}, and block size in bytes (0 = automatic).
   */
  public static CodecSpec blosc(String cname, int clevel, int shuffle, int blockSize) {
    Objects.requireNonNull(cname, "cname");
    if (!BLOSC_COMPRESSORS.contains(cname)) {
      throw new StoreException(ErrorKind.INVALID_CONFIG, "blosc cname '" + cname
          + "' is unknown; expected one of " + BLOSC_COMPRESSORS);
    }
    checkRange("blosc clevel", clevel, 0, 9);
    checkRange("blosc shuffle", shuffle, -1, 2);
    checkRange("blosc blocksize", blockSize, 0, Integer.MAX_VALUE);
    return new CodecSpec("blosc", clevel, cname, shuffle, blockSize);
  }

  /** This spec with a different N5 lz4 block size (only meaningful for lz4). */
  public CodecSpec withBlockSize(int bytes) {
    return new CodecSpec(name, level, bloscCompressor, shuffle,
        checkRange(name + " block size", bytes, 0, Integer.MAX_VALUE));
  }

  private static int checkRange(String what, int value, int min, int max) {
    if (value < min || value > max) {
      throw new StoreException(ErrorKind.INVALID_CONFIG,
          what + " is " + value + "; expected " + min + " to " + max);
    }
    return value;
  }

  /** The codec's name: raw, gzip, zlib, zstd, lz4, bzip2, xz or blosc. */
  public String name() {
    return name;
  }

  /** Level, preset, block size in 100 kB (bzip2) or acceleration (lz4); 0 for raw. */
  public int level() {
    return level;
  }

  /** Blosc's internal compressor name; null unless this is blosc. */
  public String bloscCompressor() {
    return bloscCompressor;
  }

  /** Blosc's shuffle mode; 0 unless this is blosc. */
  public int shuffle() {
    return shuffle;
  }

  /** Blosc's block size (0 = automatic) or N5 lz4's block size in bytes. */
  public int blockSize() {
    return blockSize;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof CodecSpec that
        && name.equals(that.name)
        && level == that.level
        && Objects.equals(bloscCompressor, that.bloscCompressor)
        && shuffle == that.shuffle
        && blockSize == that.blockSize;
  }

  @Override
  public int hashCode() {
    return Objects.hash(name, level, bloscCompressor, shuffle, blockSize);
  }

  @Override
  public String toString() {
    return switch (name) {
      case "raw" -> "raw";
      case "blosc" -> "blosc(" + bloscCompressor + ", clevel " + level + ", shuffle " + shuffle
          + (blockSize == 0 ? "" : ", blocksize " + blockSize) + ")";
      default -> name + "(" + level + ")";
    };
  }
}
