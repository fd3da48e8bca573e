package org.sunder.blockwise.store;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.store.codec.Codec;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * N5 on the file system (the N5 specification's "file-system specification"): every group and
 * dataset keeps {@code attributes.json}; the root's holds {@code "n5": "4.0.0"}; a dataset's
 * holds {@code dimensions}, {@code blockSize}, {@code dataType} and {@code compression} (or the
 * 1.x {@code compressionType}) beside user attributes.
 */
final class N5Layout implements ContainerLayout {
  static final String ATTRIBUTES = "attributes.json";
  static final String VERSION = "4.0.0";
  private static final Set<String> DATASET_KEYS =
      Set.of("dimensions", "blockSize", "dataType", "compression", "compressionType");
  private static final String VERSION_KEY = "n5";

  @Override
  public StorageFormat format() {
    return StorageFormat.N5;
  }

  @Override
  public boolean isRoot(Path root) {
    return Files.isRegularFile(root.resolve(ATTRIBUTES));
  }

  @Override
  public void checkRoot(Path root) {
    Path file = root.resolve(ATTRIBUTES);
    Map<String, Object> attributes = JsonFiles.readOrEmpty(file);
    Object version = attributes.get(VERSION_KEY);
    if (version == null) {
      return;
    }
    String text = version instanceof String s ? s : "";
    int dot = text.indexOf('.');
    String major = dot < 0 ? text : text.substring(0, dot);
    if (!major.matches("[0-9]+") || Integer.parseInt(major) > 4) {
      throw new StoreException(ErrorKind.INVALID_INPUT, file + ": key '" + VERSION_KEY + "' is "
          + JsonFields.describe(version) + "; expected an N5 version of major 4 or older, such"
          + " as \"4.0.0\" or \"2.0.0\"");
    }
  }

  @Override
  public void createRoot(Path root) {
    Map<String, Object> attributes = JsonFiles.readOrEmpty(root.resolve(ATTRIBUTES));
    if (!attributes.containsKey(VERSION_KEY)) {
      attributes.put(VERSION_KEY, VERSION);
      JsonFiles.write(root.resolve(ATTRIBUTES), attributes);
    }
  }

  @Override
  public boolean isDataset(Path dir) {
    Path file = dir.resolve(ATTRIBUTES);
    if (!Files.isRegularFile(file)) {
      return false;
    }
    Map<String, Object> attributes = JsonFiles.readOrEmpty(file);
    return attributes.containsKey("dimensions") && attributes.containsKey("dataType");
  }

  @Override
  public boolean isGroup(Path dir) {
    return Files.isDirectory(dir) && !isDataset(dir);
  }

  @Override
  public void createGroup(Path dir) {
    Path file = dir.resolve(ATTRIBUTES);
    if (!Files.exists(file)) {
      JsonFiles.write(file, Map.of());
    }
  }

  @Override
  public DatasetSpec normalize(DatasetSpec spec) {
    return spec.withEndianness(Endianness.BIG).withChunkOrder(ChunkOrder.C)
        .withDimensionSeparator("/").withFillValue(FillValue.zero());
  }

  @Override
  public void writeDatasetMetadata(Path dir, DatasetSpec spec) {
    Path file = dir.resolve(ATTRIBUTES);
    Map<String, Object> attributes = JsonFiles.readOrEmpty(file);
    attributes.put("dimensions", spec.shape());
    attributes.put("blockSize", spec.chunkShape());
    attributes.put("dataType", spec.dataType().n5Name());
    attributes.put("compression", Codecs.toN5(spec.codec()));
    JsonFiles.write(file, attributes);
  }

  @Override
  public DatasetSpec readDatasetMetadata(Path dir) {
    Path file = dir.resolve(ATTRIBUTES);
    Map<String, Object> json = JsonFiles.readIfExists(file);
    if (json == null) {
      throw new StoreException(ErrorKind.INVALID_INPUT, file + " is missing; expected N5"
          + " dataset attributes");
    }
    JsonFields fields = new JsonFields(json, file);
    long[] shape = fields.longArray("dimensions", 0);
    int[] chunks = fields.positiveIntArray("blockSize");
    if (shape.length != chunks.length || shape.length == 0) {
      throw fields.invalid("blockSize", Arrays.toString(chunks), shape.length
          + " block sizes to match 'dimensions' " + Arrays.toString(shape));
    }
    String typeName = fields.string("dataType");
    DataType type = DataType.ofN5Name(typeName).orElseThrow(() -> fields.invalid("dataType",
        "\"" + typeName + "\"", "one of uint8, uint16, uint32, uint64, int8, int16, int32, int64,"
            + " float32, float64"));
    CodecSpec codec = readCodec(fields);
    return new DatasetSpec(shape, chunks, type, codec, FillValue.zero(), Endianness.BIG,
        ChunkOrder.C, "/");
  }

  private static CodecSpec readCodec(JsonFields fields) {
    String where = fields.file().toString();
    if (fields.has("compression")) {
      Map<String, Object> compression = fields.objectOrNull("compression");
      if (compression == null) {
        throw fields.invalid("compression", "null", "an object with \"type\"");
      }
      return Codecs.fromN5(compression, where);
    }
    if (fields.has("compressionType")) {
      return Codecs.fromN5(Map.of("type", fields.string("compressionType")), where);
    }
    throw fields.invalid("compression", "missing", "an object with \"type\"");
  }

  @Override
  public Map<String, Object> readAttributes(Path dir, boolean isRoot) {
    Map<String, Object> attributes = JsonFiles.readOrEmpty(dir.resolve(ATTRIBUTES));
    boolean dataset = attributes.containsKey("dimensions") && attributes.containsKey("dataType");
    Map<String, Object> user = new LinkedHashMap<>();
    attributes.forEach((key, value) -> {
      if (!(dataset && DATASET_KEYS.contains(key)) && !(isRoot && key.equals(VERSION_KEY))) {
        user.put(key, value);
      }
    });
    return user;
  }

  @Override
  public void mergeAttributes(Path dir, Map<String, ?> attributes, boolean isRoot) {
    Path file = dir.resolve(ATTRIBUTES);
    Map<String, Object> current = JsonFiles.readOrEmpty(file);
    boolean dataset = current.containsKey("dimensions") && current.containsKey("dataType");
    for (String key : attributes.keySet()) {
      if ((dataset && DATASET_KEYS.contains(key)) || (isRoot && key.equals(VERSION_KEY))) {
        throw new StoreException(ErrorKind.INVALID_INPUT, file + ": attribute '" + key
            + "' is N5 metadata and cannot be set as a user attribute; N5 reserves "
            + (dataset ? List.copyOf(DATASET_KEYS) : List.of(VERSION_KEY)));
      }
    }
    current.putAll(attributes);
    JsonFiles.write(file, current);
  }

  @Override
  public ChunkFormat chunkFormat(DatasetSpec spec, Codec codec) {
    return new N5ChunkFormat(spec, codec);
  }
}
