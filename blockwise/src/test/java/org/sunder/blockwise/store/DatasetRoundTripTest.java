package org.sunder.blockwise.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.ArrayDataAccess;
import net.imglib2.type.numeric.integer.UnsignedLongType;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * Writes random volumes in random boxes and whole chunks and reads random boxes back, against a
 * dense in-memory copy, for every format, element type, layout option and codec.
 */
class DatasetRoundTripTest {
  private static final long[] SHAPE = {23, 17, 11};
  private static final int[] CHUNKS = {8, 5, 4};

  @TempDir
  Path tmp;

  static List<Arguments> layouts() {
    List<Arguments> out = new ArrayList<>();
    CodecSpec[] codecs = {CodecSpec.raw(), CodecSpec.gzip(5), CodecSpec.zstd(3),
        CodecSpec.blosc("lz4", 5, 1)};
    int i = 0;
    for (StorageFormat format : StorageFormat.values()) {
      for (DataType type : DataType.values()) {
        CodecSpec codec = codecs[i % codecs.length];
        Endianness endianness = i % 2 == 0 ? Endianness.LITTLE : Endianness.BIG;
        ChunkOrder order = (i / 2) % 2 == 0 ? ChunkOrder.C : ChunkOrder.F;
        String separator = (i / 3) % 2 == 0 ? "." : "/";
        out.add(Arguments.of(format, type, codec, endianness, order, separator));
        i++;
      }
    }
    return out;
  }

  @ParameterizedTest(name = "{0} {1} {2} {3} {4} ''{5}''")
  @MethodSource("layouts")
  void boxesReadBackAsWritten(StorageFormat format, DataType type, CodecSpec codec,
      Endianness endianness, ChunkOrder order, String separator) {
    Random random = new Random(13);
    Container container = Container.create(tmp.resolve("c"), format);
    DatasetSpec spec = DatasetSpec.of(SHAPE, CHUNKS, type).withCodec(codec)
        .withEndianness(endianness).withChunkOrder(order).withDimensionSeparator(separator)
        .withFillValue(format == StorageFormat.ZARR ? FillValue.ofInteger(7) : FillValue.zero());
    Dataset dataset = container.createDataset("group/volume", spec);
    int total = (int) (SHAPE[0] * SHAPE[1] * SHAPE[2]);
    Object expected = ElementArrays.allocate(type, total, dataset.spec().fillValue());
    int[] volume = {(int) SHAPE[0], (int) SHAPE[1], (int) SHAPE[2]};
    for (int round = 0; round < 12; round++) {
      int[] min = new int[3];
      int[] size = new int[3];
      for (int d = 0; d < 3; d++) {
        min[d] = random.nextInt(volume[d]);
        size[d] = 1 + random.nextInt(volume[d] - min[d]);
      }
      Object data = RandomArrays.random(type, size[0] * size[1] * size[2], random);
      dataset.write(ElementArrays.wrap(data, type, longs(size)), longs(min));
      BoxCopy.copy(data, size, new int[3], expected, volume, min, size);
    }
    Dataset reopened = Container.open(tmp.resolve("c")).openDataset("group/volume");
    assertEquals(dataset.spec(), reopened.spec());
    for (int round = 0; round < 12; round++) {
      int[] min = new int[3];
      int[] size = new int[3];
      for (int d = 0; d < 3; d++) {
        min[d] = random.nextInt(volume[d]);
        size[d] = 1 + random.nextInt(volume[d] - min[d]);
      }
      long[] max = new long[3];
      for (int d = 0; d < 3; d++) {
        max[d] = min[d] + size[d] - 1L;
      }
      ArrayImg<?, ?> read = reopened.read(new FinalInterval(longs(min), max));
      assertArrayEquals(longs(size), read.dimensionsAsLongArray());
      Object want = ElementArrays.allocate(type, size[0] * size[1] * size[2]);
      BoxCopy.copy(expected, volume, min, want, size, new int[3], size);
      assertTrue(Objects.deepEquals(want, storage(read)),
          "box at " + Arrays.toString(min) + " size " + Arrays.toString(size));
    }
    Object whole = storage(reopened.read(new FinalInterval(SHAPE)));
    assertTrue(Objects.deepEquals(expected, whole));
    // several boxes in one pass, overlapping or not, one of them inside another
    for (int round = 0; round < 4; round++) {
      List<FinalInterval> boxes = new ArrayList<>();
      for (int k = 0; k < 1 + round; k++) {
        boxes.add(randomBox(random, volume));
      }
      FinalInterval outer = boxes.get(0);
      long[] innerMin = outer.minAsLongArray();
      long[] innerMax = innerMin.clone();
      boxes.add(new FinalInterval(innerMin, innerMax));
      List<ArrayImg<?, ?>> together = reopened.read(boxes);
      assertEquals(boxes.size(), together.size());
      for (int k = 0; k < boxes.size(); k++) {
        assertTrue(Objects.deepEquals(storage(reopened.read(boxes.get(k))),
            storage(together.get(k))), "box " + k + " of round " + round);
      }
    }
  }

  private static FinalInterval randomBox(Random random, int[] volume) {
    long[] min = new long[3];
    long[] max = new long[3];
    for (int d = 0; d < 3; d++) {
      min[d] = random.nextInt(volume[d]);
      max[d] = min[d] + random.nextInt(volume[d] - (int) min[d]);
    }
    return new FinalInterval(min, max);
  }

  /**
   * A box that needs only the first elements of a chunk (in memory order: its first channel,
   * say) decodes no further: with the last blosc block of the chunk made unreadable, the first
   * channel still reads and the last fails, naming the chunk.
   */
  @Test
  void aBoxNeedingTheStartOfAChunkDecodesOnlyThatFar() throws IOException {
    long[] shape = {64, 64, 4, 3};
    int[] chunks = {64, 64, 4, 3};
    Dataset dataset = Container.create(tmp.resolve("prefix"), StorageFormat.ZARR)
        .createDataset("affinities", DatasetSpec.of(shape, chunks, DataType.FLOAT32)
            .withCodec(CodecSpec.blosc("lz4", 5, 1)));
    float[] values = (float[]) RandomArrays.random(DataType.FLOAT32, 64 * 64 * 4 * 3,
        new Random(17));
    dataset.write(ElementArrays.wrap(values, DataType.FLOAT32, shape), new long[4]);
    Path file = dataset.chunkFile(new long[4]);
    byte[] frame = Files.readAllBytes(file);
    // blosc: a 16-byte header, then the start of each block (little-endian ints)
    int blocks = (64 * 64 * 4 * 3 * 4 + 32 * 1024 - 1) / (32 * 1024);
    assertTrue(blocks > 3, "the chunk has several blocks: " + blocks);
    ByteBuffer.wrap(frame).order(ByteOrder.LITTLE_ENDIAN)
        .putInt(16 + 4 * (blocks - 1), Integer.MAX_VALUE);
    Files.write(file, frame);
    float[] firstChannel = (float[]) storage(dataset.read(new FinalInterval(
        new long[] {0, 0, 0, 0}, new long[] {63, 63, 3, 0})));
    assertArrayEquals(Arrays.copyOf(values, 64 * 64 * 4), firstChannel);
    StoreException e = assertThrows(StoreException.class,
        () -> dataset.read(new FinalInterval(new long[] {0, 0, 0, 2},
            new long[] {63, 63, 3, 2})));
    assertTrue(e.getMessage().contains("grid position [0, 0, 0, 0]"), e.getMessage());
  }

  @Test
  void wholeChunksRoundTripAndMissingChunksReadAsFill() {
    Container container = Container.create(tmp.resolve("z"), StorageFormat.ZARR);
    Dataset dataset = container.createDataset("labels",
        DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT64).withFillValue(FillValue.ofInteger(-1L)));
    long[] border = {2, 3, 2};
    assertFalse(dataset.chunkExists(border));
    ArrayImg<?, ?> missing = dataset.readChunk(border);
    assertArrayEquals(new long[] {7, 2, 3}, missing.dimensionsAsLongArray());
    for (long v : (long[]) storage(missing)) {
      assertEquals(-1L, v);
    }
    long[] values = (long[]) RandomArrays.random(DataType.UINT64, 7 * 2 * 3, new Random(13));
    dataset.writeChunk(border, ElementArrays.wrap(values, DataType.UINT64, new long[] {7, 2, 3}));
    assertTrue(dataset.chunkExists(border));
    ArrayImg<UnsignedLongType, ?> back = dataset.read(new FinalInterval(
        new long[] {16, 15, 8}, new long[] {22, 16, 10}));
    assertArrayEquals(values, (long[]) storage(back));
  }

  @Test
  void concurrentWritersOfDifferentChunksKeepEveryValue() throws Exception {
    Container container = Container.create(tmp.resolve("n5"), StorageFormat.N5);
    long[] shape = {40, 30, 6};
    int[] chunks = {10, 10, 3};
    Dataset dataset = container.createDataset("a", DatasetSpec.of(shape, chunks, DataType.INT32));
    ExecutorService pool = Executors.newFixedThreadPool(4);
    List<Future<?>> tasks = new ArrayList<>();
    for (int gx = 0; gx < 4; gx++) {
      for (int gy = 0; gy < 3; gy++) {
        for (int gz = 0; gz < 2; gz++) {
          long[] min = {gx * 10L, gy * 10L, gz * 3L};
          tasks.add(pool.submit(() -> {
            for (int part = 0; part < 3; part++) {
              int[] values = new int[10 * 10];
              java.util.Arrays.fill(values, (int) (min[0] * 10000 + min[1] * 100 + min[2] + part));
              long[] at = {min[0], min[1], min[2] + part};
              dataset.write(ElementArrays.wrap(values, DataType.INT32, new long[] {10, 10, 1}), at);
            }
          }));
        }
      }
    }
    for (Future<?> task : tasks) {
      task.get();
    }
    pool.shutdown();
    int[] all = (int[]) storage(dataset.read(new FinalInterval(shape)));
    for (int z = 0; z < 6; z++) {
      for (int y = 0; y < 30; y++) {
        for (int x = 0; x < 40; x++) {
          long expected = (x / 10 * 10) * 10000L + (y / 10 * 10) * 100L + (z / 3 * 3) + z % 3;
          assertEquals(expected, all[x + 40 * (y + 30 * z)], "voxel " + x + "," + y + "," + z);
        }
      }
    }
  }

  @Test
  void concurrentPartialWritesOfOneChunkInOneDatasetKeepEveryValue() throws Exception {
    Container container = Container.create(tmp.resolve("rmw"), StorageFormat.ZARR);
    long[] shape = {16, 12, 5};
    Dataset dataset = container.createDataset("a",
        DatasetSpec.of(shape, new int[] {16, 12, 5}, DataType.UINT16));
    ExecutorService pool = Executors.newFixedThreadPool(4);
    List<Future<?>> tasks = new ArrayList<>();
    for (int z = 0; z < 5; z++) {
      for (int y = 0; y < 12; y++) {
        long[] at = {0, y, z};
        short value = (short) (1 + y + 12 * z);
        tasks.add(pool.submit(() -> {
          short[] row = new short[16];
          java.util.Arrays.fill(row, value);
          dataset.write(ElementArrays.wrap(row, DataType.UINT16, new long[] {16, 1, 1}), at);
        }));
      }
    }
    for (Future<?> task : tasks) {
      task.get();
    }
    pool.shutdown();
    short[] all = (short[]) storage(dataset.read(new FinalInterval(shape)));
    for (int i = 0; i < all.length; i++) {
      assertEquals(1 + i / 16, all[i], "row " + i / 16 + " lost by a read-modify-write race");
    }
  }

  static Object storage(ArrayImg<?, ?> img) {
    return ((ArrayDataAccess<?>) img.update(null)).getCurrentStorageArray();
  }

  static long[] longs(int[] values) {
    long[] out = new long[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[i];
    }
    return out;
  }
}
