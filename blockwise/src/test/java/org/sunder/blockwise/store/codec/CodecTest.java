package org.sunder.blockwise.store.codec;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.store.Codecs;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.StorageFormat;

/** Round trips and known answers for every codec and for blosc's shuffles. */
class CodecTest {
  private static final int[] SIZES = {0, 1, 8, 999, 4096, 30_011};
  private static final DataType[] TYPE_SIZES =
      {DataType.UINT8, DataType.INT16, DataType.FLOAT32, DataType.UINT64};

  static List<CodecSpec> encodable() {
    List<CodecSpec> specs = new ArrayList<>(List.of(CodecSpec.raw(), CodecSpec.gzip(1),
        CodecSpec.gzip(9), CodecSpec.zlib(6), CodecSpec.zstd(1), CodecSpec.zstd(19),
        CodecSpec.lz4(), CodecSpec.bzip2(1), CodecSpec.bzip2(9), CodecSpec.xz(0), CodecSpec.xz(6)));
    for (String cname : List.of("lz4", "lz4hc", "zlib", "zstd", "snappy")) {
      for (int shuffle = -1; shuffle <= 2; shuffle++) {
        specs.add(CodecSpec.blosc(cname, shuffle == 0 ? 0 : 5, shuffle));
      }
    }
    specs.add(CodecSpec.blosc("lz4", 9, 1, 1000));
    return specs;
  }

  private static byte[] data(int size, Random random, boolean smooth, int typeSize) {
    byte[] data = new byte[size];
    if (!smooth) {
      random.nextBytes(data);
      return data;
    }
    for (int i = 0; i < size; i++) {
      int element = i / typeSize;
      data[i] = (byte) (i % typeSize == typeSize - 1 ? 0 : (int) (40 * Math.sin(element / 50.0))
          + random.nextInt(2));
    }
    return data;
  }

  @Test
  void everyCodecRoundTripsRandomAndSmoothData() throws IOException {
    Random random = new Random(13);
    for (CodecSpec spec : encodable()) {
      List<StorageFormat> formats = spec.name().equals("lz4")
          ? List.of(StorageFormat.values()) : List.of(StorageFormat.ZARR);
      for (StorageFormat format : formats) {
        for (DataType type : TYPE_SIZES) {
          Codec codec = Codecs.create(spec, format, type);
          for (int size : SIZES) {
            int bytes = size / type.bytes() * type.bytes();
            for (boolean smooth : new boolean[] {false, true}) {
              byte[] data = data(bytes, random, smooth, type.bytes());
              byte[] copy = data.clone();
              byte[] encoded = codec.encode(data);
              assertArrayEquals(copy, data, "encode must not change its input");
              assertArrayEquals(data, codec.decode(encoded, 0, encoded.length, bytes),
                  spec + " " + format + " " + type + " " + bytes + " bytes");
              byte[] shifted = new byte[encoded.length + 5];
              System.arraycopy(encoded, 0, shifted, 3, encoded.length);
              assertArrayEquals(data, codec.decode(shifted, 3, encoded.length, bytes));
            }
          }
        }
      }
    }
  }

  @Test
  void decodingToAnotherSizeFails() {
    Random random = new Random(13);
    byte[] data = data(4000, random, true, 4);
    for (CodecSpec spec : encodable()) {
      Codec codec = Codecs.create(spec, StorageFormat.ZARR, DataType.FLOAT32);
      byte[] encoded = codec.encode(data);
      assertThrows(IOException.class, () -> codec.decode(encoded, 0, encoded.length, 4004),
          spec + " must notice a short result");
      assertThrows(IOException.class, () -> codec.decode(encoded, 0, encoded.length, 3996),
          spec + " must notice a long result");
    }
  }

  @Test
  void smoothDataShrinks() {
    byte[] data = data(100_000, new Random(13), true, 4);
    for (CodecSpec spec : encodable()) {
      boolean mayStoreRaw = spec.name().equals("raw") || (spec.name().equals("blosc")
          && (spec.level() == 0 || spec.blockSize() > 0));
      if (!mayStoreRaw) {
        int size = Codecs.create(spec, StorageFormat.ZARR, DataType.FLOAT32).encode(data).length;
        assertTrue(size < data.length * 3 / 4, spec + " stored " + size + " of " + data.length);
      }
    }
  }

  @Test
  void n5Lz4IsLz4JavaBlockStreamAndZarrLz4IsSizePrefixed() throws IOException {
    byte[] data = data(10_000, new Random(13), true, 2);
    byte[] n5 = Codecs.create(CodecSpec.lz4(), StorageFormat.N5, DataType.UINT16).encode(data);
    assertEquals("LZ4Block", new String(n5, 0, 8, StandardCharsets.US_ASCII));
    byte[] zarr = Codecs.create(CodecSpec.lz4(), StorageFormat.ZARR, DataType.UINT16)
        .encode(data);
    assertEquals(10_000, (zarr[0] & 0xff) | (zarr[1] & 0xff) << 8 | (zarr[2] & 0xff) << 16
        | (zarr[3] & 0xff) << 24);
    Codec either = Codecs.create(CodecSpec.lz4(), StorageFormat.N5, DataType.UINT16);
    assertArrayEquals(data, either.decode(zarr, 0, zarr.length, data.length));
    assertArrayEquals(data, either.decode(n5, 0, n5.length, data.length));
  }

  @Test
  void gzipReadsConcatenatedMembers() throws IOException {
    byte[] data = data(5000, new Random(13), true, 1);
    ByteArrayOutputStream joined = new ByteArrayOutputStream();
    for (int half = 0; half < 2; half++) {
      ByteArrayOutputStream member = new ByteArrayOutputStream();
      try (GZIPOutputStream out = new GZIPOutputStream(member)) {
        out.write(data, half * 2500, 2500);
      }
      byte[] bytes = member.toByteArray();
      if (half == 1) {
        bytes[3] |= 8 | 16;
        joined.write(bytes, 0, 10);
        joined.write("chunk.raw\0a comment\0".getBytes(StandardCharsets.US_ASCII));
        joined.write(bytes, 10, bytes.length - 10);
      } else {
        joined.write(bytes);
      }
    }
    byte[] both = joined.toByteArray();
    Codec gzip = Codecs.create(CodecSpec.gzip(6), StorageFormat.ZARR, DataType.UINT8);
    assertArrayEquals(data, gzip.decode(both, 0, both.length, data.length),
        "RFC 1952: a gzip file may hold several members, with optional name and comment");
    both[both.length - 12] ^= 1;
    assertThrows(IOException.class, () -> gzip.decode(both, 0, both.length, data.length));
  }

  @Test
  void bloscFrameHeaderFollowsTheBlosc1Layout() {
    byte[] data = data(40_000, new Random(13), true, 4);
    byte[] frame = Codecs.create(CodecSpec.blosc("zstd", 5, CodecSpec.BYTE_SHUFFLE),
        StorageFormat.ZARR, DataType.FLOAT32).encode(data);
    assertEquals(2, frame[0], "format version 2, as c-blosc 1 writes");
    assertEquals(0x91, frame[2] & 0xff, "zstd (4 << 5), no split, byte shuffle: flags 145 as"
        + " numcodecs writes (checked, FORMATS.md)");
    assertEquals(4, frame[3], "typesize");
    assertEquals(40_000, littleEndianInt(frame, 4));
    assertEquals(frame.length, littleEndianInt(frame, 12), "cbytes is the frame length");
    byte[] noise = new byte[4000];
    new Random(13).nextBytes(noise);
    byte[] raw = Codecs.create(CodecSpec.blosc("lz4", 5, CodecSpec.BYTE_SHUFFLE),
        StorageFormat.ZARR, DataType.FLOAT32).encode(noise);
    assertEquals(35, raw[2] & 0xff, "incompressible: lz4 code, memcpyed, byte shuffle; flags 35"
        + " as numcodecs writes (checked, FORMATS.md)");
    assertArrayEquals(noise, Arrays.copyOfRange(raw, 16, raw.length));
  }

  private static int littleEndianInt(byte[] b, int at) {
    return (b[at] & 0xff) | (b[at + 1] & 0xff) << 8 | (b[at + 2] & 0xff) << 16
        | (b[at + 3] & 0xff) << 24;
  }

  @Test
  void bloscLzDecodesAHandBuiltStream() throws IOException {
    // Built from the format in c-blosc's blosclz.c: control 0x22 = literal run of 3 (bit 5 is
    // the first byte's format marker), then 0xE0 0x00 0x02 = match of 7 + 0 + 2 = 9 bytes at
    // distance 0 + 2 + 1 = 3.
    byte[] stream = {0x22, 'a', 'b', 'c', (byte) 0xE0, 0x00, 0x02};
    byte[] out = new byte[12];
    assertEquals(12, BloscLz.decompress(stream, 0, stream.length, out, 0, out.length));
    assertEquals("abcabcabcabc", new String(out, StandardCharsets.US_ASCII));
    assertThrows(IOException.class, () -> BloscLz.decompress(stream, 0, stream.length,
        new byte[11], 0, 11));
    byte[] tooFar = {0x01, 'a', 'b', (byte) 0x20, 0x05};
    assertThrows(IOException.class, () -> BloscLz.decompress(tooFar, 0, tooFar.length,
        new byte[10], 0, 10));
  }

  @Test
  void transposeMatchesTheBitByBitDefinition() {
    Random random = new Random(13);
    for (int round = 0; round < 1000; round++) {
      long x = random.nextLong();
      long expected = 0;
      for (int j = 0; j < 8; j++) {
        for (int k = 0; k < 8; k++) {
          long bit = (x >>> (8 * j + k)) & 1;
          expected |= bit << (8 * k + j);
        }
      }
      assertEquals(expected, Shuffle.transpose8x8(x));
      assertEquals(x, Shuffle.transpose8x8(Shuffle.transpose8x8(x)));
    }
  }

  @Test
  void shufflesInvertAndPlaceBytesAsSpecified() {
    Random random = new Random(13);
    for (int typeSize : new int[] {1, 2, 3, 4, 8, 16}) {
      for (int elements : new int[] {8, 24, 100, 1001}) {
        int size = elements * typeSize + (typeSize > 1 ? 1 : 0);
        byte[] in = new byte[size];
        random.nextBytes(in);
        byte[] shuffled = new byte[size];
        byte[] back = new byte[size];
        Shuffle.byteShuffle(typeSize, in, 0, shuffled, 0, size);
        int n = size / typeSize;
        assertEquals(in[typeSize * 5 + typeSize - 1], shuffled[(typeSize - 1) * n + 5]);
        Shuffle.byteUnshuffle(typeSize, shuffled, 0, back, 0, size);
        assertArrayEquals(in, back);
        Shuffle.bitShuffle(typeSize, in, 0, shuffled, 0, size, new byte[size]);
        if (n % 8 == 0) {
          int e = 13 % n;
          int b = typeSize - 1;
          for (int k = 0; k < 8; k++) {
            int bit = (in[e * typeSize + b] >>> k) & 1;
            int at = (b * 8 + k) * (n / 8) + e / 8;
            assertEquals(bit, (shuffled[at] >>> (e % 8)) & 1);
          }
        } else {
          assertArrayEquals(in, shuffled, "blosc 1 leaves such blocks as they are");
        }
        Shuffle.bitUnshuffle(typeSize, shuffled, 0, back, 0, size, new byte[size]);
        assertArrayEquals(in, back);
      }
    }
  }
}
