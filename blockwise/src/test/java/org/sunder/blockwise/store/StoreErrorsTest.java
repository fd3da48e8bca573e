package org.sunder.blockwise.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImgs;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * Every kind of bad input raises a {@link StoreException} of the right kind whose message names
 * the path, key or chunk grid position and what was expected; failed writes leave nothing.
 */
class StoreErrorsTest {
  private static final long[] SHAPE = {20, 13, 6};
  private static final int[] CHUNKS = {8, 5, 4};

  @TempDir
  Path tmp;

  private static StoreException assertStoreError(ErrorKind kind, Executable action,
      String... fragments) {
    StoreException e = assertThrows(StoreException.class, action);
    assertEquals(kind, e.kind(), e.getMessage());
    for (String fragment : fragments) {
      assertTrue(e.getMessage().contains(fragment),
          "message should name '" + fragment + "': " + e.getMessage());
    }
    return e;
  }

  // ------------------------------------------------------------ containers and datasets

  @Test
  void missingContainerIsNamed() {
    Path missing = tmp.resolve("nowhere");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(missing),
        missing.toString(), "does not exist");
  }

  @Test
  void directoryWithoutMetadataIsNotAContainer() throws IOException {
    Path plain = Files.createDirectories(tmp.resolve("plain"));
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(plain),
        plain.toString(), ".zgroup", "attributes.json");
  }

  @Test
  void unsupportedFormatVersionsAreNamed() throws IOException {
    Path n5 = Files.createDirectories(tmp.resolve("n5"));
    Files.writeString(n5.resolve("attributes.json"), "{\"n5\": \"5.1.0\"}");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(n5), "attributes.json",
        "'n5'", "\"5.1.0\"", "major 4");
    Path zarr = Files.createDirectories(tmp.resolve("zarr"));
    Files.writeString(zarr.resolve(".zgroup"), "{\"zarr_format\": 3}");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(zarr), ".zgroup",
        "'zarr_format'", "expected 2");
  }

  @Test
  void containerOfTheOtherFormatIsAConflict() {
    Container.create(tmp.resolve("c"), StorageFormat.N5);
    assertStoreError(ErrorKind.CONFLICT, () -> Container.create(tmp.resolve("c"),
        StorageFormat.ZARR), "already N5");
  }

  @Test
  void missingDatasetIsNamed() {
    Container container = Container.create(tmp.resolve("c"), StorageFormat.ZARR);
    assertStoreError(ErrorKind.INVALID_INPUT, () -> container.openDataset("volumes/raw"),
        "'volumes/raw'", "does not exist", tmp.resolve("c").toString());
    assertStoreError(ErrorKind.INVALID_INPUT, () -> container.readAttributes("volumes"),
        "'volumes'");
  }

  @Test
  void existingDatasetIsAConflictAndBadPathsAreRejected() {
    Container container = Container.create(tmp.resolve("c"), StorageFormat.N5);
    container.createDataset("a", DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT8));
    assertStoreError(ErrorKind.CONFLICT,
        () -> container.createDataset("a", DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT8)),
        "'a'", "already exists");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> container.openDataset("a/../b"), "'..'");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> container.createGroup("a/inner"),
        "'a' is a dataset");
  }

  @Test
  void unwritableCodecCreatesNothing() {
    Container container = Container.create(tmp.resolve("c"), StorageFormat.ZARR);
    assertStoreError(ErrorKind.INVALID_CONFIG, () -> container.createDataset("b",
        DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT16).withCodec(CodecSpec.blosc("blosclz", 5,
            1))), "blosclz");
    assertFalse(Files.exists(tmp.resolve("c/b")));
  }

  @Test
  void reservedN5AttributesCannotBeMerged() {
    Container container = Container.create(tmp.resolve("c"), StorageFormat.N5);
    container.createDataset("a", DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT8));
    assertStoreError(ErrorKind.INVALID_INPUT,
        () -> container.mergeAttributes("a", Map.of("dataType", "uint16")), "'dataType'",
        "attributes.json");
  }

  // ------------------------------------------------------------ metadata

  private Path zarrArray(String json) throws IOException {
    Path root = tmp.resolve("z");
    Container.create(root, StorageFormat.ZARR);
    Path dir = Files.createDirectories(root.resolve("a"));
    Files.writeString(dir.resolve(".zarray"), json);
    return root;
  }

  private static String zarray(String key, String value) {
    Map<String, String> fields = new java.util.LinkedHashMap<>();
    fields.put("zarr_format", "2");
    fields.put("shape", "[6, 13, 20]");
    fields.put("chunks", "[4, 5, 8]");
    fields.put("dtype", "\"<u2\"");
    fields.put("compressor", "{\"id\": \"zstd\", \"level\": 1}");
    fields.put("fill_value", "0");
    fields.put("order", "\"C\"");
    fields.put("filters", "null");
    if (value == null) {
      fields.remove(key);
    } else {
      fields.put(key, value);
    }
    StringBuilder json = new StringBuilder("{");
    fields.forEach((k, v) -> json.append(json.length() > 1 ? ", " : "").append('"').append(k)
        .append("\": ").append(v));
    return json.append('}').toString();
  }

  private void assertZarrMetadataError(String key, String value, String... fragments)
      throws IOException {
    Path root = zarrArray(zarray(key, value));
    String[] all = Stream.concat(Stream.of(".zarray"), Arrays.stream(fragments))
        .toArray(String[]::new);
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(root).openDataset("a"), all);
  }

  @Test
  void malformedZarrMetadataNamesFileAndPosition() throws IOException {
    Path root = zarrArray("{\"zarr_format\": 2, \"shape\": [6, 13");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(root).openDataset("a"),
        ".zarray", "not valid JSON", "line 1");
    Path again = zarrArray("[1, 2]");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(again).openDataset("a"),
        ".zarray", "expected a JSON object");
  }

  @Test
  void incompleteZarrMetadataNamesTheKey() throws IOException {
    for (String key : List.of("zarr_format", "shape", "chunks", "dtype", "compressor",
        "fill_value", "order", "filters")) {
      assertZarrMetadataError(key, null, "'" + key + "'", "missing");
    }
  }

  @Test
  void invalidZarrValuesNameKeyValueAndExpectation() throws IOException {
    assertZarrMetadataError("dtype", "\"<c8\"", "'dtype'", "\"<c8\"", "expected a numeric");
    assertZarrMetadataError("dtype", "\"|b1\"", "'dtype'", "\"|b1\"");
    assertZarrMetadataError("dtype", "\"|u2\"", "'dtype'", "\"|u2\"");
    assertZarrMetadataError("zarr_format", "3", "'zarr_format'", "expected 2");
    assertZarrMetadataError("chunks", "[4, 5]", "'chunks'", "match 'shape'");
    assertZarrMetadataError("chunks", "[4, 0, 8]", "'chunks'", "at least 1");
    assertZarrMetadataError("shape", "[6, -1, 20]", "'shape'", "at least 0");
    assertZarrMetadataError("order", "\"X\"", "'order'", "\"C\" or \"F\"");
    assertZarrMetadataError("filters", "[{\"id\": \"delta\", \"dtype\": \"<u2\"}]", "'filters'",
        "not supported");
    assertZarrMetadataError("fill_value", "\"abc\"", "'fill_value'", "\"abc\"", "integer");
    assertZarrMetadataError("fill_value", "70000", "'fill_value'", "70000", "uint16");
    assertZarrMetadataError("fill_value", "-1", "'fill_value'", "-1");
    assertZarrMetadataError("dimension_separator", "\"-\"", "'dimension_separator'");
  }

  @Test
  void unknownOrInvalidZarrCodecNamesTheKey() throws IOException {
    assertZarrMetadataError("compressor", "{\"id\": \"brotli\"}", "'compressor.id'",
        "'brotli'", "expected gzip, zlib, zstd");
    assertZarrMetadataError("compressor", "{\"level\": 1}", "'compressor.id'", "missing");
    assertZarrMetadataError("compressor", "{\"id\": \"gzip\", \"level\": 42}", "'compressor'",
        "gzip level is 42");
    assertZarrMetadataError("compressor", "{\"id\": \"blosc\", \"cname\": \"lzf\"}",
        "'compressor'", "'lzf'");
    assertZarrMetadataError("compressor", "{\"id\": \"lzma\", \"format\": 3}",
        "'compressor.format'", "FORMAT_XZ");
  }

  private Path n5Dataset(String attributes) throws IOException {
    Path root = tmp.resolve("n");
    Container.create(root, StorageFormat.N5);
    Path dir = Files.createDirectories(root.resolve("a"));
    Files.writeString(dir.resolve("attributes.json"), attributes);
    return root;
  }

  @Test
  void badN5MetadataNamesFileAndKey() throws IOException {
    String good = "\"dimensions\": [20, 13, 6], \"dataType\": \"uint8\"";
    Path root = n5Dataset("{" + good + ", \"blockSize\": [8, 5, 4], \"compression\":"
        + " {\"type\": \"raw\"}}");
    assertEquals(DataType.UINT8, Container.open(root).openDataset("a").dataType());
    Path noBlocks = n5Dataset("{" + good + ", \"compression\": {\"type\": \"raw\"}}");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(noBlocks).openDataset("a"),
        "attributes.json", "'blockSize'", "missing");
    Path badType = n5Dataset("{\"dimensions\": [20, 13, 6], \"blockSize\": [8, 5, 4],"
        + " \"dataType\": \"float16\", \"compression\": {\"type\": \"raw\"}}");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(badType).openDataset("a"),
        "attributes.json", "'dataType'", "\"float16\"", "uint8");
    Path badCodec = n5Dataset("{" + good + ", \"blockSize\": [8, 5, 4],"
        + " \"compression\": {\"type\": \"lzf\"}}");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(badCodec).openDataset("a"),
        "attributes.json", "'compression.type'", "'lzf'");
    Path noCodec = n5Dataset("{" + good + ", \"blockSize\": [8, 5, 4]}");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> Container.open(noCodec).openDataset("a"),
        "attributes.json", "'compression'", "missing");
    Path oldStyle = n5Dataset("{" + good + ", \"blockSize\": [8, 5, 4],"
        + " \"compressionType\": \"gzip\"}");
    assertEquals(CodecSpec.gzip(6), Container.open(oldStyle).openDataset("a").spec().codec(),
        "N5 1.x compressionType, default level from memory of the N5 Java library");
  }

  // ------------------------------------------------------------ chunks

  private Dataset datasetWithChunk(StorageFormat format, CodecSpec codec) {
    Container container = Container.create(tmp.resolve(format.name()), format);
    Dataset dataset = container.createDataset("d",
        DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT16).withCodec(codec));
    short[] values = (short[]) SmoothVolumes.smooth(DataType.UINT16, new int[] {8, 3, 2},
        new java.util.Random(13));
    dataset.writeChunk(new long[] {1, 2, 1}, ArrayImgs.unsignedShorts(values, 8, 3, 2));
    return dataset;
  }

  private static void assertChunkError(Dataset dataset, String... fragments) {
    long[] grid = {1, 2, 1};
    String[] all = Stream.concat(Stream.of("[1, 2, 1]", dataset.chunkFile(grid).toString(),
        "'d'"), Arrays.stream(fragments)).toArray(String[]::new);
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.readChunk(grid), all);
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.read(new FinalInterval(SHAPE)), all);
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.write(ArrayImgs.unsignedShorts(2, 2, 2),
        new long[] {9, 11, 4}), all);
  }

  private static void rewrite(Path file, java.util.function.UnaryOperator<byte[]> change)
      throws IOException {
    Files.write(file, change.apply(Files.readAllBytes(file)));
  }

  @Test
  void truncatedChunksNameTheirGridPosition() throws IOException {
    for (CodecSpec codec : List.of(CodecSpec.raw(), CodecSpec.gzip(3), CodecSpec.zstd(3),
        CodecSpec.lz4(), CodecSpec.blosc("lz4", 5, 1), CodecSpec.xz(1), CodecSpec.bzip2(1))) {
      for (StorageFormat format : StorageFormat.values()) {
        Dataset dataset = datasetWithChunk(format, codec);
        rewrite(dataset.chunkFile(new long[] {1, 2, 1}),
            bytes -> Arrays.copyOf(bytes, bytes.length * 2 / 3));
        assertChunkError(dataset, "cannot be read");
        rewrite(dataset.chunkFile(new long[] {1, 2, 1}), bytes -> Arrays.copyOf(bytes, 3));
        assertChunkError(dataset);
        deleteTree(tmp.resolve(format.name()));
      }
    }
  }

  @Test
  void aWriteMeetingACorruptChunkChangesNoOtherChunk() throws IOException {
    Dataset dataset = datasetWithChunk(StorageFormat.ZARR, CodecSpec.zstd(3));
    rewrite(dataset.chunkFile(new long[] {1, 2, 1}), bytes -> Arrays.copyOf(bytes, 5));
    long[] neighbour = {0, 2, 1};
    assertFalse(dataset.chunkExists(neighbour));
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.write(
        ArrayImgs.unsignedShorts(10, 2, 2), new long[] {3, 11, 4}), "[1, 2, 1]");
    assertFalse(dataset.chunkExists(neighbour), "the whole write failed before any file changed");
  }

  @Test
  void wrongN5HeadersNameTheHeader() throws IOException {
    Dataset dataset = datasetWithChunk(StorageFormat.N5, CodecSpec.raw());
    Path file = dataset.chunkFile(new long[] {1, 2, 1});
    byte[] good = Files.readAllBytes(file);
    rewrite(file, bytes -> {
      ByteBuffer.wrap(bytes).order(ByteOrder.BIG_ENDIAN).putShort(2, (short) 2);
      return bytes;
    });
    assertChunkError(dataset, "2 dimensions, expected 3");
    Files.write(file, good);
    rewrite(file, bytes -> {
      ByteBuffer.wrap(bytes).order(ByteOrder.BIG_ENDIAN).putInt(8, 6);
      return bytes;
    });
    assertChunkError(dataset, "header size 6 in dimension 1", "outside 3 to 5");
    Files.write(file, good);
    rewrite(file, bytes -> {
      ByteBuffer.wrap(bytes).order(ByteOrder.BIG_ENDIAN).putShort(0, (short) 7);
      return bytes;
    });
    assertChunkError(dataset, "mode 7");
  }

  @Test
  void wrongBloscHeadersNameWhatIsWrong() throws IOException {
    Dataset dataset = datasetWithChunk(StorageFormat.ZARR, CodecSpec.blosc("zstd", 5, 1));
    Path file = dataset.chunkFile(new long[] {1, 2, 1});
    byte[] good = Files.readAllBytes(file);
    rewrite(file, bytes -> {
      ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN).putInt(4, 12);
      return bytes;
    });
    assertChunkError(dataset, "12 uncompressed bytes, expected " + (8 * 5 * 4 * 2));
    Files.write(file, good);
    rewrite(file, bytes -> {
      bytes[0] = 9;
      return bytes;
    });
    assertChunkError(dataset, "format version 9");
  }

  @Test
  void corruptCompressedDataNamesTheCodec() throws IOException {
    for (CodecSpec codec : List.of(CodecSpec.gzip(3), CodecSpec.zlib(3), CodecSpec.zstd(3),
        CodecSpec.lz4(), CodecSpec.bzip2(1), CodecSpec.xz(1), CodecSpec.blosc("lz4", 5, 1),
        CodecSpec.blosc("zlib", 5, 1), CodecSpec.blosc("snappy", 5, 0))) {
      Dataset dataset = datasetWithChunk(StorageFormat.ZARR, codec);
      rewrite(dataset.chunkFile(new long[] {1, 2, 1}), bytes -> {
        for (int i = bytes.length / 4; i < bytes.length; i += 3) {
          bytes[i] = (byte) (bytes[i] * 31 + 7);
        }
        return bytes;
      });
      assertChunkError(dataset, "codec " + codec);
      deleteTree(tmp.resolve("ZARR"));
    }
  }

  // ------------------------------------------------------------ boxes and arrays

  @Test
  void boxesOutsideTheVolumeAreRejected() {
    Dataset dataset = Container.create(tmp.resolve("c"), StorageFormat.ZARR)
        .createDataset("d", DatasetSpec.of(SHAPE, CHUNKS, DataType.FLOAT32));
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.read(new FinalInterval(
        new long[] {0, 0, 0}, new long[] {19, 13, 5})), "max [19, 13, 5]", "[20, 13, 6]");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.read(new FinalInterval(
        new long[] {-1, 0, 0}, new long[] {3, 3, 3})), "min [-1, 0, 0]");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.read(new FinalInterval(4, 4)),
        "3 dimensions");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.read(List.of(
        new FinalInterval(2, 2, 2), new FinalInterval(new long[] {0, 0, 0},
            new long[] {19, 13, 5}))), "max [19, 13, 5]");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.readChunk(new long[] {3, 0, 0}),
        "grid position [3, 0, 0]", "grid [3, 3, 2]");
  }

  @Test
  void mismatchedWritesAreRejectedAndWriteNothing() throws IOException {
    Dataset dataset = Container.create(tmp.resolve("c"), StorageFormat.N5)
        .createDataset("d", DatasetSpec.of(SHAPE, CHUNKS, DataType.FLOAT32));
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.write(ArrayImgs.floats(8, 8, 4),
        new long[] {16, 0, 0}), "max [23, 7, 3]");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.write(ArrayImgs.floats(8, 8),
        new long[] {0, 0}), "2 dimensions");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.write(ArrayImgs.doubles(4, 4, 4),
        new long[] {0, 0, 0}), "DoubleType", "FloatType");
    assertStoreError(ErrorKind.INVALID_INPUT, () -> dataset.writeChunk(new long[] {2, 2, 1},
        ArrayImgs.floats(8, 5, 4)), "grid position [2, 2, 1]", "[4, 3, 2]", "[8, 5, 4]");
    try (Stream<Path> files = Files.walk(tmp.resolve("c/d"))) {
      assertEquals(List.of("attributes.json"), files.filter(Files::isRegularFile)
          .map(p -> p.getFileName().toString()).toList());
    }
  }

  @Test
  void staleTemporariesAreRemovedAndNothingElse() throws IOException {
    for (StorageFormat format : StorageFormat.values()) {
      Dataset dataset = datasetWithChunk(format, CodecSpec.raw());
      Path chunk = dataset.chunkFile(new long[] {1, 2, 1});
      Path stale = chunk.resolveSibling("." + chunk.getFileName() + ".k3x9q0a1b2.tmp");
      Path userFile = chunk.resolveSibling(".notes.tmp.txt");
      Files.write(stale, new byte[] {1, 2, 3});
      Files.write(userFile, new byte[] {4});
      byte[] before = Files.readAllBytes(chunk);
      assertEquals(1, dataset.removeStaleTemporaries(), format.name());
      assertFalse(Files.exists(stale));
      assertTrue(Files.exists(userFile), "a file not of the temporary form stays");
      assertArrayEquals(before, Files.readAllBytes(chunk));
      assertEquals(0, dataset.removeStaleTemporaries());
      deleteTree(tmp.resolve(format.name()));
    }
  }

  @Test
  void aFailedChunkWriteLeavesNoTemporaryFile() throws IOException {
    Dataset dataset = Container.create(tmp.resolve("c"), StorageFormat.ZARR)
        .createDataset("d", DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT8)
            .withDimensionSeparator("."));
    Path target = dataset.chunkFile(new long[] {0, 0, 0});
    Files.createDirectories(target);
    Files.writeString(target.resolve("occupant"), "x", StandardCharsets.UTF_8);
    assertStoreError(ErrorKind.STORAGE, () -> dataset.writeChunk(new long[] {0, 0, 0},
        ArrayImgs.unsignedBytes(8, 5, 4)), "cannot write", target.toString());
    try (Stream<Path> files = Files.list(target.getParent())) {
      assertTrue(files.noneMatch(p -> p.getFileName().toString().endsWith(".tmp")));
    }
  }

  private static void deleteTree(Path root) throws IOException {
    try (Stream<Path> files = Files.walk(root)) {
      for (Path p : files.sorted(java.util.Comparator.reverseOrder()).toList()) {
        Files.delete(p);
      }
    }
  }
}
