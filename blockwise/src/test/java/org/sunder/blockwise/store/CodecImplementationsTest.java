package org.sunder.blockwise.store;

import org.junit.jupiter.api.Nested;
import org.sunder.blockwise.store.codec.Codec;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * {@link CodecContract} run against every codec implementation: raw, gzip, zlib, zstd, lz4 in
 * both framings (N5's block stream and the Zarr size prefix), bzip2, xz and blosc with each of
 * its compressors and shuffles.
 */
class CodecImplementationsTest {

  private static Codec zarr(CodecSpec spec, DataType type) {
    return Codecs.create(spec, StorageFormat.ZARR, type);
  }

  @Nested
  class Raw extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.raw(), type);
    }
  }

  @Nested
  class Gzip extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.gzip(5), type);
    }
  }

  @Nested
  class Zlib extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.zlib(5), type);
    }
  }

  @Nested
  class Zstd extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.zstd(3), type);
    }
  }

  @Nested
  class Lz4SizePrefixed extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.lz4(), type);
    }
  }

  @Nested
  class Lz4BlockStream extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return Codecs.create(CodecSpec.lz4(), StorageFormat.N5, type);
    }
  }

  @Nested
  class Bzip2 extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.bzip2(1), type);
    }
  }

  @Nested
  class Xz extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.xz(1), type);
    }
  }

  @Nested
  class BloscLz4ByteShuffle extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.blosc("lz4", 5, CodecSpec.BYTE_SHUFFLE), type);
    }
  }

  @Nested
  class BloscZstdBitShuffle extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.blosc("zstd", 5, CodecSpec.BIT_SHUFFLE), type);
    }
  }

  @Nested
  class BloscZlibNoShuffle extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.blosc("zlib", 5, CodecSpec.NO_SHUFFLE), type);
    }
  }

  @Nested
  class BloscLz4hcSmallBlocks extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.blosc("lz4hc", 9, CodecSpec.AUTO_SHUFFLE, 1000), type);
    }
  }

  @Nested
  class BloscSnappy extends CodecContract {
    @Override
    Codec codec(DataType type) {
      return zarr(CodecSpec.blosc("snappy", 5, CodecSpec.BYTE_SHUFFLE), type);
    }
  }
}
