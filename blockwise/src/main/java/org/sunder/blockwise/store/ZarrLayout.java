package org.sunder.blockwise.store;

import java.math.BigInteger;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.store.codec.Codec;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * Zarr v2 on the file system ("Zarr Storage Specification Version 2"): groups hold
 * {@code .zgroup}, arrays {@code .zarray}, user attributes are in {@code .zattrs}. Shapes are
 * stored slowest axis first and reversed to memory order here. No filters are supported.
 */
final class ZarrLayout implements ContainerLayout {
  static final String ZGROUP = ".zgroup";
  static final String ZARRAY = ".zarray";
  static final String ZATTRS = ".zattrs";
  private static final Pattern DTYPE = Pattern.compile("([<>|=])([uif])([1248])");
  private static final BigInteger UINT64_LIMIT = BigInteger.ONE.shiftLeft(64);

  @Override
  public StorageFormat format() {
    return StorageFormat.ZARR;
  }

  @Override
  public boolean isRoot(Path root) {
    return Files.isRegularFile(root.resolve(ZGROUP)) || Files.isRegularFile(root.resolve(ZARRAY));
  }

  @Override
  public void checkRoot(Path root) {
    Path file = root.resolve(isDataset(root) ? ZARRAY : ZGROUP);
    JsonFields fields = new JsonFields(JsonFiles.readOrEmpty(file), file);
    long format = fields.longValue("zarr_format");
    if (format != 2) {
      throw fields.invalid("zarr_format", String.valueOf(format), "2");
    }
  }

  @Override
  public void createRoot(Path root) {
    if (!isRoot(root)) {
      createGroup(root);
    }
  }

  @Override
  public boolean isDataset(Path dir) {
    return Files.isRegularFile(dir.resolve(ZARRAY));
  }

  @Override
  public boolean isGroup(Path dir) {
    return Files.isRegularFile(dir.resolve(ZGROUP));
  }

  @Override
  public void createGroup(Path dir) {
    if (!isGroup(dir)) {
      JsonFiles.write(dir.resolve(ZGROUP), Map.of("zarr_format", 2));
    }
  }

  @Override
  public DatasetSpec normalize(DatasetSpec spec) {
    DatasetSpec out = spec.withFillValue(fillForType(spec.fillValue(), spec.dataType()));
    return spec.dataType().bytes() == 1 ? out.withEndianness(Endianness.LITTLE) : out;
  }

  private static FillValue fillForType(FillValue fill, DataType type) {
    return switch (fill.kind()) {
      case UNDEFINED -> fill;
      case INTEGER -> type.isFloat() ? FillValue.ofReal(fill.asDouble()) : fill;
      case REAL -> type.isFloat() ? fill : FillValue.ofInteger(fill.asLong());
    };
  }

  @Override
  public void writeDatasetMetadata(Path dir, DatasetSpec spec) {
    Map<String, Object> json = new LinkedHashMap<>();
    json.put("zarr_format", 2);
    json.put("shape", Shapes.reversed(spec.shape()));
    json.put("chunks", Shapes.reversed(spec.chunkShape()));
    DataType type = spec.dataType();
    char order = type.bytes() == 1 ? '|' : spec.endianness().numpyCode();
    json.put("dtype", "" + order + type.numpyKind() + type.bytes());
    json.put("compressor", Codecs.toZarr(spec.codec()));
    json.put("fill_value", fillJson(spec.fillValue(), type));
    json.put("order", spec.chunkOrder().name());
    json.put("filters", null);
    json.put("dimension_separator", spec.dimensionSeparator());
    JsonFiles.write(dir.resolve(ZARRAY), json);
  }

  private static Object fillJson(FillValue fill, DataType type) {
    if (fill.kind() == FillValue.Kind.UNDEFINED) {
      return null;
    }
    if (type.isFloat()) {
      double value = fill.asDouble();
      if (Double.isNaN(value)) {
        return "NaN";
      }
      if (Double.isInfinite(value)) {
        return value > 0 ? "Infinity" : "-Infinity";
      }
      return value;
    }
    long bits = fill.asLong();
    return type == DataType.UINT64 && bits < 0
        ? new BigInteger(Long.toUnsignedString(bits)) : (Object) bits;
  }

  @Override
  public DatasetSpec readDatasetMetadata(Path dir) {
    Path file = dir.resolve(ZARRAY);
    Map<String, Object> json = JsonFiles.readIfExists(file);
    if (json == null) {
      throw new StoreException(ErrorKind.INVALID_INPUT, file + " is missing; expected Zarr"
          + " array metadata");
    }
    JsonFields fields = new JsonFields(json, file);
    long format = fields.longValue("zarr_format");
    if (format != 2) {
      throw fields.invalid("zarr_format", String.valueOf(format), "2");
    }
    long[] shape = Shapes.reversed(fields.longArray("shape", 0));
    int[] chunks = Shapes.reversed(fields.positiveIntArray("chunks"));
    if (shape.length != chunks.length || shape.length == 0) {
      throw fields.invalid("chunks", Arrays.toString(Shapes.reversed(chunks)), shape.length
          + " chunk sizes to match 'shape' " + Arrays.toString(Shapes.reversed(shape)));
    }
    String dtype = fields.string("dtype");
    Matcher m = DTYPE.matcher(dtype);
    DataType type = m.matches()
        ? DataType.ofNumpy(m.group(2).charAt(0), Integer.parseInt(m.group(3))).orElse(null)
        : null;
    if (type == null || (m.group(1).equals("|") && type.bytes() != 1)) {
      throw fields.invalid("dtype", "\"" + dtype + "\"", "a numeric NumPy dtype such as"
          + " \"<u8\", \">i2\", \"|u1\" or \"<f4\" (u1 u2 u4 u8 i1 i2 i4 i8 f4 f8)");
    }
    Endianness endianness = m.group(1).equals(">") ? Endianness.BIG : Endianness.LITTLE;
    CodecSpec codec = Codecs.fromZarr(fields.objectOrNull("compressor"), file.toString());
    FillValue fill = readFill(fields, type);
    String order = fields.string("order");
    if (!order.equals("C") && !order.equals("F")) {
      throw fields.invalid("order", "\"" + order + "\"", "\"C\" or \"F\"");
    }
    Object filters = fields.required("filters");
    if (filters != null && !(filters instanceof List<?> list && list.isEmpty())) {
      throw fields.invalid("filters", JsonFields.describe(filters), "null or [] (filters are"
          + " not supported)");
    }
    String separator = ".";
    if (fields.has("dimension_separator")) {
      separator = fields.string("dimension_separator");
      if (!separator.equals(".") && !separator.equals("/")) {
        throw fields.invalid("dimension_separator", "\"" + separator + "\"", "\".\" or \"/\"");
      }
    }
    return normalize(new DatasetSpec(shape, chunks, type, codec, fill, endianness,
        ChunkOrder.valueOf(order), separator));
  }

  private static FillValue readFill(JsonFields fields, DataType type) {
    Object value = fields.required("fill_value");
    if (value == null) {
      return FillValue.undefined();
    }
    String expected = type.isFloat()
        ? "a number, \"NaN\", \"Infinity\", \"-Infinity\" or null"
        : "an integer in the range of " + type.n5Name() + ", or null";
    if (type.isFloat()) {
      if (value instanceof String s) {
        return switch (s) {
          case "NaN" -> FillValue.ofReal(Double.NaN);
          case "Infinity" -> FillValue.ofReal(Double.POSITIVE_INFINITY);
          case "-Infinity" -> FillValue.ofReal(Double.NEGATIVE_INFINITY);
          default -> throw fields.invalid("fill_value", JsonFields.describe(value), expected);
        };
      }
      if (value instanceof Number number) {
        return FillValue.ofReal(number.doubleValue());
      }
      throw fields.invalid("fill_value", JsonFields.describe(value), expected);
    }
    BigInteger integer = integralValue(value);
    if (integer == null || !fitsInteger(integer, type)) {
      throw fields.invalid("fill_value", JsonFields.describe(value), expected);
    }
    return FillValue.ofInteger(integer.longValue());
  }

  private static BigInteger integralValue(Object value) {
    if (value instanceof BigInteger b) {
      return b;
    }
    if (value instanceof Integer || value instanceof Long || value instanceof Short) {
      return BigInteger.valueOf(((Number) value).longValue());
    }
    if (value instanceof Double d && d == Math.rint(d) && Math.abs(d) < 0x1p62) {
      return BigInteger.valueOf(d.longValue());
    }
    return null;
  }

  private static boolean fitsInteger(BigInteger value, DataType type) {
    int bits = type.bytes() * 8;
    if (type.isUnsigned()) {
      return value.signum() >= 0 && value.compareTo(UINT64_LIMIT.shiftRight(64 - bits)) < 0;
    }
    BigInteger limit = BigInteger.ONE.shiftLeft(bits - 1);
    return value.compareTo(limit.negate()) >= 0 && value.compareTo(limit) < 0;
  }

  @Override
  public Map<String, Object> readAttributes(Path dir, boolean isRoot) {
    return JsonFiles.readOrEmpty(dir.resolve(ZATTRS));
  }

  @Override
  public void mergeAttributes(Path dir, Map<String, ?> attributes, boolean isRoot) {
    Path file = dir.resolve(ZATTRS);
    Map<String, Object> current = JsonFiles.readOrEmpty(file);
    current.putAll(attributes);
    JsonFiles.write(file, current);
  }

  @Override
  public ChunkFormat chunkFormat(DatasetSpec spec, Codec codec) {
    return new ZarrChunkFormat(spec, codec);
  }
}
