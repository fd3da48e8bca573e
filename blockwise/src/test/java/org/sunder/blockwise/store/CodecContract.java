package org.sunder.blockwise.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.ByteOrder;
import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.store.codec.Codec;

/**
 * What every {@link Codec} promises, run against each implementation (the nested classes of
 * {@link CodecImplementationsTest} supply them): encoding leaves its input alone; decoding gives
 * the same bytes back, from any offset of a larger buffer, for random and for compressible
 * arrays of every {@link DataType} in both byte orders; truncated input and input that decodes
 * to another size fail with an {@link IOException}; damaged or foreign bytes either fail with an
 * {@link IOException} or decode to exactly the requested size, never with another exception.
 */
abstract class CodecContract {
  private static final int[] ELEMENTS = {0, 1, 7, 1000, 5003};

  /** The implementation under test, configured for chunks of {@code type}. */
  abstract Codec codec(DataType type);

  @Test
  void roundTripsRandomAndCompressibleArraysOfEveryDataType() throws IOException {
    Random random = new Random(13);
    for (DataType type : DataType.values()) {
      Codec codec = codec(type);
      for (int n : ELEMENTS) {
        for (ByteOrder order : new ByteOrder[] {ByteOrder.LITTLE_ENDIAN, ByteOrder.BIG_ENDIAN}) {
          for (boolean compressible : new boolean[] {false, true}) {
            byte[] data = chunkBytes(type, n, order, compressible, random);
            String what = type + ", " + n + " elements, " + order
                + (compressible ? ", compressible" : ", random");
            byte[] copy = data.clone();
            byte[] encoded = codec.encode(data);
            assertArrayEquals(copy, data, what + ": encode changed its input");
            assertArrayEquals(data, codec.decode(encoded, 0, encoded.length, data.length), what);
            byte[] inside = new byte[encoded.length + 9];
            Arrays.fill(inside, (byte) 0x5a);
            System.arraycopy(encoded, 0, inside, 4, encoded.length);
            assertArrayEquals(data, codec.decode(inside, 4, encoded.length, data.length),
                what + ", at offset 4 of a larger buffer");
          }
        }
      }
    }
  }

  @Test
  void aPrefixDecodesToTheSameBytesAsTheWhole() throws IOException {
    Random random = new Random(15);
    for (DataType type : new DataType[] {DataType.UINT8, DataType.FLOAT32, DataType.INT64}) {
      Codec codec = codec(type);
      for (boolean compressible : new boolean[] {false, true}) {
        // large enough for codecs that decode in blocks to hold several
        byte[] data = chunkBytes(type, 300_000 / type.bytes(), ByteOrder.LITTLE_ENDIAN,
            compressible, random);
        byte[] encoded = codec.encode(data);
        for (int prefix : new int[] {0, 1, random.nextInt(data.length), data.length - 1,
            data.length}) {
          byte[] decoded = codec.decodePrefix(encoded, 0, encoded.length, data.length, prefix);
          String what = type + (compressible ? ", compressible" : ", random") + ", prefix "
              + prefix + " of " + data.length;
          assertEquals(data.length, decoded.length, what);
          assertArrayEquals(Arrays.copyOf(data, prefix), Arrays.copyOf(decoded, prefix), what);
        }
      }
    }
  }

  @Test
  void truncatedInputOrAnotherSizeFailsWithAnIOException() {
    Random random = new Random(14);
    for (DataType type : new DataType[] {DataType.UINT8, DataType.FLOAT32, DataType.INT64}) {
      Codec codec = codec(type);
      for (boolean compressible : new boolean[] {false, true}) {
        byte[] data = chunkBytes(type, 4000 / type.bytes(), ByteOrder.LITTLE_ENDIAN,
            compressible, random);
        byte[] encoded = codec.encode(data);
        for (int length : new int[] {0, 1, encoded.length / 2, encoded.length - 1}) {
          assertThrows(IOException.class, () -> codec.decode(encoded, 0, length, data.length),
              type + ": " + length + " of " + encoded.length + " encoded bytes");
        }
        int elementSize = type.bytes();
        assertThrows(IOException.class,
            () -> codec.decode(encoded, 0, encoded.length, data.length + elementSize),
            type + ": decoded size one element larger");
        assertThrows(IOException.class,
            () -> codec.decode(encoded, 0, encoded.length, data.length - elementSize),
            type + ": decoded size one element smaller");
      }
    }
  }

  @Test
  void damagedOrForeignBytesFailWithAnIOExceptionOrDecodeToTheRequestedSize() {
    Random random = new Random(15);
    Codec codec = codec(DataType.UINT16);
    for (int trial = 0; trial < 200; trial++) {
      byte[] data = chunkBytes(DataType.UINT16, 700, ByteOrder.LITTLE_ENDIAN, trial % 2 == 0,
          random);
      byte[] input;
      if (trial % 4 == 3) {
        input = new byte[1 + random.nextInt(2000)];
        random.nextBytes(input);
      } else {
        input = codec.encode(data);
        for (int flips = 1 + random.nextInt(4); flips > 0; flips--) {
          input[random.nextInt(input.length)] ^= (byte) (1 << random.nextInt(8));
        }
      }
      try {
        byte[] out = codec.decode(input, 0, input.length, data.length);
        assertEquals(data.length, out.length, "trial " + trial + ": decoded size");
      } catch (IOException expected) {
        // the typed refusal the contract asks for
      } catch (RuntimeException | Error e) {
        fail("trial " + trial + ": damaged input raised " + e + " instead of an IOException", e);
      }
    }
  }

  /**
   * The bytes of a chunk of {@code n} elements: random values, or (compressible) runs of a few
   * values drawn from a random array.
   */
  private static byte[] chunkBytes(DataType type, int n, ByteOrder order, boolean compressible,
      Random random) {
    Object values = RandomArrays.random(type, n, random);
    if (compressible && n > 0) {
      Object palette = RandomArrays.random(type, 4, random);
      for (int i = 0; i < n; i++) {
        System.arraycopy(palette, (i / 37) % 4, values, i, 1);
      }
    }
    return ElementArrays.toBytes(values, order).clone();
  }
}
