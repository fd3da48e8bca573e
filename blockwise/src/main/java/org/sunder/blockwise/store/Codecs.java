package org.sunder.blockwise.store;

import java.util.LinkedHashMap;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.store.codec.BloscCodec;
import org.sunder.blockwise.store.codec.Bzip2Codec;
import org.sunder.blockwise.store.codec.Codec;
import org.sunder.blockwise.store.codec.CodecSpec;
import org.sunder.blockwise.store.codec.DeflateCodec;
import org.sunder.blockwise.store.codec.Lz4Codec;
import org.sunder.blockwise.store.codec.RawCodec;
import org.sunder.blockwise.store.codec.XzCodec;
import org.sunder.blockwise.store.codec.ZstdCodec;

/**
 * The codec registry: makes a {@link Codec} from a {@link CodecSpec}, and maps specs to and from
 * the JSON of N5's {@code "compression"} ({@code "type"}) and Zarr's {@code "compressor"}
 * ({@code "id"}).
 *
 * <pre>
 *   spec    N5 "type"                 Zarr "id"
 *   raw     raw                       (compressor null)
 *   gzip    gzip (useZlib false)      gzip
 *   zlib    gzip (useZlib true)       zlib
 *   zstd    zstd                      zstd
 *   lz4     lz4                       lz4
 *   bzip2   bzip2 (blockSize)         bz2 (level)
 *   xz      xz (preset)               lzma (format 1)
 *   blosc   blosc                     blosc
 * </pre>
 *
 * <p>LZ4 framing: for N5 the codec writes lz4-java's block stream (N5's Java lz4), for Zarr
 * numcodecs' size-prefixed block; both read either.
 */
public final class Codecs {
  private Codecs() {}

  /**
   * The codec for {@code spec} in {@code format}, for elements of {@code type}.
   *
   * @throws StoreException INVALID_CONFIG if the spec can be read but not written (blosc with
   *     blosclz); use {@link #createDecoder} to read such data
   */
  public static Codec create(CodecSpec spec, StorageFormat format, DataType type) {
    if (spec.name().equals("blosc")) {
      BloscCodec.checkEncodable(spec);
    }
    return createDecoder(spec, format, type);
  }

  /** A codec for {@code spec} that decodes every variant; its encode may not support all. */
  public static Codec createDecoder(CodecSpec spec, StorageFormat format, DataType type) {
    return switch (spec.name()) {
      case "raw" -> new RawCodec();
      case "gzip" -> new DeflateCodec(true, spec.level());
      case "zlib" -> new DeflateCodec(false, spec.level());
      case "zstd" -> new ZstdCodec(spec.level());
      case "lz4" -> new Lz4Codec(format == StorageFormat.N5
          ? Lz4Codec.Framing.BLOCK_STREAM : Lz4Codec.Framing.SIZE_PREFIXED, spec.blockSize());
      case "bzip2" -> new Bzip2Codec(spec.level());
      case "xz" -> new XzCodec(spec.level());
      case "blosc" -> new BloscCodec(spec, type.bytes());
      default -> throw new StoreException(ErrorKind.INVALID_CONFIG,
          "codec '" + spec.name() + "' has no implementation");
    };
  }

  /** N5's {@code "compression"} object for {@code spec}. */
  public static Map<String, Object> toN5(CodecSpec spec) {
    Map<String, Object> json = new LinkedHashMap<>();
    switch (spec.name()) {
      case "raw" -> json.put("type", "raw");
      case "gzip", "zlib" -> {
        json.put("type", "gzip");
        json.put("level", spec.level());
        json.put("useZlib", spec.name().equals("zlib"));
      }
      case "zstd" -> {
        json.put("type", "zstd");
        json.put("level", spec.level());
      }
      case "lz4" -> {
        json.put("type", "lz4");
        json.put("blockSize", spec.blockSize());
      }
      case "bzip2" -> {
        json.put("type", "bzip2");
        json.put("blockSize", spec.level());
      }
      case "xz" -> {
        json.put("type", "xz");
        json.put("preset", spec.level());
      }
      case "blosc" -> {
        json.put("type", "blosc");
        putBlosc(json, spec);
      }
      default -> throw new StoreException(ErrorKind.INVALID_CONFIG,
          "codec '" + spec.name() + "' has no N5 form");
    }
    return json;
  }

  /** Zarr's {@code "compressor"} object for {@code spec}; null for raw. */
  public static Map<String, Object> toZarr(CodecSpec spec) {
    Map<String, Object> json = new LinkedHashMap<>();
    switch (spec.name()) {
      case "raw" -> {
        return null;
      }
      case "gzip", "zlib", "zstd" -> {
        json.put("id", spec.name());
        json.put("level", spec.level());
      }
      case "lz4" -> {
        json.put("id", "lz4");
        json.put("acceleration", spec.level());
      }
      case "bzip2" -> {
        json.put("id", "bz2");
        json.put("level", spec.level());
      }
      case "xz" -> {
        json.put("id", "lzma");
        json.put("format", 1);
        json.put("check", -1);
        json.put("preset", spec.level());
        json.put("filters", null);
      }
      case "blosc" -> {
        json.put("id", "blosc");
        putBlosc(json, spec);
      }
      default -> throw new StoreException(ErrorKind.INVALID_CONFIG,
          "codec '" + spec.name() + "' has no Zarr form");
    }
    return json;
  }

  private static void putBlosc(Map<String, Object> json, CodecSpec spec) {
    json.put("cname", spec.bloscCompressor());
    json.put("clevel", spec.level());
    json.put("shuffle", spec.shuffle());
    json.put("blocksize", spec.blockSize());
  }

  /**
   * The spec of an N5 {@code "compression"} object, or of an N5 1.x {@code "compressionType"}
   * name when {@code json} holds only {@code "type"}.
   *
   * @param where the metadata file, for messages
   */
  public static CodecSpec fromN5(Map<String, ?> json, String where) {
    CodecJson c = new CodecJson(json, where, "compression");
    String type = c.string("type");
    return c.wrap(() -> switch (type) {
      case "raw" -> CodecSpec.raw();
      case "gzip" -> c.bool("useZlib", false)
          ? CodecSpec.zlib(c.integer("level", 6)) : CodecSpec.gzip(c.integer("level", 6));
      case "zstd" -> CodecSpec.zstd(c.integer("level", 3));
      case "lz4" -> CodecSpec.lz4(c.integer("acceleration", 1))
          .withBlockSize(c.integer("blockSize", 65536));
      case "bzip2" -> CodecSpec.bzip2(c.integer("blockSize", 9));
      case "xz" -> CodecSpec.xz(c.integer("preset", 6));
      case "blosc" -> blosc(c);
      default -> throw c.unknown("type", type,
          "raw, gzip, zstd, lz4, bzip2, xz or blosc");
    });
  }

  /**
   * The spec of a Zarr {@code "compressor"} object; {@code null} is raw.
   *
   * @param where the metadata file, for messages
   */
  public static CodecSpec fromZarr(Map<String, ?> json, String where) {
    if (json == null) {
      return CodecSpec.raw();
    }
    CodecJson c = new CodecJson(json, where, "compressor");
    String id = c.string("id");
    return c.wrap(() -> switch (id) {
      case "gzip" -> CodecSpec.gzip(c.integer("level", 1));
      case "zlib" -> CodecSpec.zlib(c.integer("level", 1));
      case "zstd" -> CodecSpec.zstd(c.integer("level", 1));
      case "lz4" -> CodecSpec.lz4(c.integer("acceleration", 1));
      case "bz2" -> CodecSpec.bzip2(c.integer("level", 1));
      case "lzma" -> lzma(c);
      case "blosc" -> blosc(c);
      default -> throw c.unknown("id", id,
          "gzip, zlib, zstd, lz4, bz2, lzma or blosc (or compressor null for raw)");
    });
  }

  private static CodecSpec lzma(CodecJson c) {
    int format = c.integer("format", 1);
    if (format != 1) {
      throw c.unknown("format", String.valueOf(format), "1 (FORMAT_XZ)");
    }
    if (c.has("filters")) {
      throw c.unknown("filters", String.valueOf(c.raw("filters")), "null (LZMA2 with a preset)");
    }
    return CodecSpec.xz(c.has("preset") ? c.integer("preset", 6) : 6);
  }

  private static CodecSpec blosc(CodecJson c) {
    return CodecSpec.blosc(c.string("cname"), c.integer("clevel", 5),
        c.integer("shuffle", CodecSpec.BYTE_SHUFFLE), c.integer("blocksize", 0));
  }
}
