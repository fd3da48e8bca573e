package org.sunder.blockwise.store;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * Writes the arrays of the Java-to-Python interop check: every codec, element type, byte and
 * chunk order, separator, fill value and a multi-channel array, some only in part so that
 * chunks are missing; records for each the values as little-endian C-order bytes.
 */
final class JavaWrites {
  private static final long[] SHAPE = {33, 19, 7};
  private static final int[] CHUNKS = {10, 8, 3};

  private final Path root;
  private final Random random;
  private final List<Map<String, Object>> manifest = new ArrayList<>();
  private final Container zarr;
  private final Container n5;

  JavaWrites(Path root, Random random) {
    this.root = root;
    this.random = random;
    this.zarr = Container.create(root.resolve("zarr"), StorageFormat.ZARR);
    this.n5 = Container.create(root.resolve("n5"), StorageFormat.N5);
  }

  int count() {
    return manifest.size();
  }

  String describe(String name) {
    for (Map<String, Object> entry : manifest) {
      if (entry.get("name").equals(name)) {
        return entry.get("format") + " " + entry.get("path") + " [" + entry.get("spec") + "]";
      }
    }
    return name;
  }

  void writeAll() throws IOException {
    List<CodecSpec> codecs = new ArrayList<>(List.of(CodecSpec.raw(), CodecSpec.gzip(5),
        CodecSpec.zlib(3), CodecSpec.zstd(3), CodecSpec.lz4(), CodecSpec.bzip2(9),
        CodecSpec.xz(3)));
    for (String cname : List.of("lz4", "lz4hc", "zstd", "zlib", "snappy")) {
      for (int shuffle = 0; shuffle <= 2; shuffle++) {
        codecs.add(CodecSpec.blosc(cname, 5, shuffle));
      }
    }
    DataType[] types = DataType.values();
    for (int i = 0; i < codecs.size(); i++) {
      DataType type = types[(i * 3) % types.length];
      DatasetSpec spec = DatasetSpec.of(SHAPE, CHUNKS, type).withCodec(codecs.get(i))
          .withDimensionSeparator(i % 2 == 0 ? "." : "/");
      write(zarr, "codec/" + i, spec, i % 3 == 0);
      if (!codecs.get(i).name().equals("lz4")) {
        write(n5, "codec/" + i, spec.withCodec(codecs.get(i)), i % 3 == 1);
      }
    }
    long[] big = {90, 60, 5};
    int[] bigChunks = {70, 48, 3};
    for (DataType type : List.of(DataType.UINT16, DataType.FLOAT32, DataType.UINT64)) {
      write(zarr, "blosc-big/lz4-" + type, DatasetSpec.of(big, bigChunks, type)
          .withCodec(CodecSpec.blosc("lz4", 5, CodecSpec.BYTE_SHUFFLE)), false);
      write(zarr, "blosc-big/zstd-" + type, DatasetSpec.of(big, bigChunks, type)
          .withCodec(CodecSpec.blosc("zstd", 3, CodecSpec.BIT_SHUFFLE, 4096)), true);
    }
    for (int i = 0; i < types.length; i++) {
      for (ChunkOrder order : ChunkOrder.values()) {
        for (Endianness endianness : Endianness.values()) {
          DatasetSpec spec = DatasetSpec.of(SHAPE, CHUNKS, types[i]).withCodec(CodecSpec.zstd(1))
              .withChunkOrder(order).withEndianness(endianness)
              .withDimensionSeparator((i + order.ordinal()) % 2 == 0 ? "/" : ".")
              .withFillValue(fill(types[i], i + order.ordinal() + endianness.ordinal()));
          write(zarr, "layout/" + types[i] + "-" + order + "-" + endianness, spec, true);
        }
      }
      write(n5, "types/" + types[i], DatasetSpec.of(SHAPE, new int[] {12, 8, 3}, types[i])
          .withCodec(CodecSpec.gzip(1)), i % 2 == 0);
    }
    write(zarr, "layout/fill-null", DatasetSpec.of(SHAPE, CHUNKS, DataType.INT32)
        .withFillValue(FillValue.undefined()), false);
    write(zarr, "affinities", DatasetSpec.of(new long[] {26, 20, 9, 3}, new int[] {8, 8, 4, 3},
        DataType.FLOAT32).withCodec(CodecSpec.blosc("lz4", 5, 1)), false);
    write(n5, "affinities", DatasetSpec.of(new long[] {26, 20, 9, 3}, new int[] {8, 8, 4, 3},
        DataType.UINT8).withCodec(CodecSpec.zstd(3)), true);
  }

  private static FillValue fill(DataType type, int variant) {
    if (!type.isFloat()) {
      if (variant % 2 == 1) {
        return FillValue.zero();
      }
      return type == DataType.UINT64 ? FillValue.ofInteger(-1L)
          : FillValue.ofInteger(type.isUnsigned() ? 9 : -7);
    }
    return switch (variant % 4) {
      case 0 -> FillValue.ofReal(Double.NaN);
      case 1 -> FillValue.ofReal(Double.POSITIVE_INFINITY);
      case 2 -> FillValue.ofReal(Double.NEGATIVE_INFINITY);
      default -> FillValue.ofReal(-2.5);
    };
  }

  /** Writes content in three boxes (two if partial, leaving chunks missing). */
  private void write(Container container, String path, DatasetSpec spec, boolean partial)
      throws IOException {
    Dataset dataset = container.createDataset(path, spec);
    DataType type = spec.dataType();
    long[] shape = spec.shape();
    int n = shape.length;
    int[] dims = new int[n];
    int total = 1;
    for (int d = 0; d < n; d++) {
      dims[d] = (int) shape[d];
      total *= dims[d];
    }
    Object content = SmoothVolumes.smooth(type, dims, random);
    Object expected = ElementArrays.allocate(type, total, dataset.spec().fillValue());
    int[] cut = dims.clone();
    cut[0] = dims[0] * 2 / 3;
    int boxes = partial ? 1 : 2;
    for (int box = 0; box < boxes; box++) {
      int[] min = new int[n];
      int[] size = dims.clone();
      if (box == 0) {
        size[0] = cut[0];
        if (partial) {
          size[1] = Math.max(1, dims[1] / 2);
        }
      } else {
        min[0] = cut[0];
        size[0] = dims[0] - cut[0];
      }
      Object part = ElementArrays.allocate(type, product(size));
      BoxCopy.copy(content, dims, min, part, size, new int[n], size);
      dataset.write(ElementArrays.wrap(part, type, toLong(size)), toLong(min));
      BoxCopy.copy(part, size, new int[n], expected, dims, min, size);
    }
    String name = "a" + manifest.size();
    Files.createDirectories(root.resolve("expected"));
    Files.write(root.resolve("expected").resolve(name + ".bin"),
        ElementArrays.toBytes(expected, ByteOrder.LITTLE_ENDIAN));
    Map<String, Object> entry = new LinkedHashMap<>();
    entry.put("name", name);
    entry.put("format", container.format() == StorageFormat.N5 ? "n5" : "zarr");
    entry.put("container", container.format() == StorageFormat.N5 ? "n5" : "zarr");
    entry.put("path", path);
    entry.put("dtype", type.n5Name());
    long[] zarrShape = new long[n];
    for (int d = 0; d < n; d++) {
      zarrShape[d] = shape[n - 1 - d];
    }
    entry.put("shape", zarrShape);
    entry.put("spec", dataset.spec().toString());
    Map<String, Object> attributes = new LinkedHashMap<>();
    attributes.put("axes", "zyx");
    attributes.put("offsets", List.of(List.of(-1, 0, 0), List.of(0, -3, 0)));
    container.mergeAttributes(path, attributes);
    container.mergeAttributes(path, Map.of("resolution", List.of(40.0, 4.0, 4.5), "axes", "ZYX"));
    entry.put("attrs", container.readAttributes(path));
    if (container.format() == StorageFormat.ZARR) {
      entry.put("order", spec.chunkOrder().name());
      entry.put("byteorder", type.bytes() == 1 ? "|="
          : spec.endianness() == Endianness.LITTLE ? "<=" : ">");
      entry.put("fill", fillJson(dataset.spec().fillValue(), type));
    }
    manifest.add(entry);
  }

  private static Object fillJson(FillValue fill, DataType type) {
    if (fill.kind() == FillValue.Kind.UNDEFINED) {
      return null;
    }
    if (type.isFloat()) {
      double v = fill.asDouble();
      return Double.isNaN(v) ? "NaN" : Double.isInfinite(v) ? (v > 0 ? "Infinity" : "-Infinity")
          : (Object) v;
    }
    return type == DataType.UINT64
        ? new java.math.BigInteger(Long.toUnsignedString(fill.asLong())) : (Object) fill.asLong();
  }

  void saveManifest() throws IOException {
    new ObjectMapper().writeValue(root.resolve("manifest.json").toFile(), manifest);
  }

  private static int product(int[] dims) {
    int p = 1;
    for (int size : dims) {
      p *= size;
    }
    return p;
  }

  private static long[] toLong(int[] dims) {
    long[] out = new long[dims.length];
    for (int d = 0; d < dims.length; d++) {
      out[d] = dims[d];
    }
    return out;
  }
}
