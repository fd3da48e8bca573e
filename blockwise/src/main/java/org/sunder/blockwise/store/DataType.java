package org.sunder.blockwise.store;

import java.util.Optional;

/**
 * The element types of a dataset. Each maps to one imglib2 type and one primitive Java array:
 * {@code UINT8}/{@code INT8} to {@code byte[]}, 16-bit to {@code short[]}, 32-bit integers to
 * {@code int[]}, 64-bit integers to {@code long[]}, {@code FLOAT32} to {@code float[]},
 * {@code FLOAT64} to {@code double[]}. Unsigned values keep their bits in the signed array.
 */
public enum DataType {
  UINT8("uint8", 'u', 1),
  UINT16("uint16", 'u', 2),
  UINT32("uint32", 'u', 4),
  UINT64("uint64", 'u', 8),
  INT8("int8", 'i', 1),
  INT16("int16", 'i', 2),
  INT32("int32", 'i', 4),
  INT64("int64", 'i', 8),
  FLOAT32("float32", 'f', 4),
  FLOAT64("float64", 'f', 8);

  private final String n5Name;
  private final char numpyKind;
  private final int bytes;

  DataType(String n5Name, char numpyKind, int bytes) {
    this.n5Name = n5Name;
    this.numpyKind = numpyKind;
    this.bytes = bytes;
  }

  /** Bytes per element. */
  public int bytes() {
    return bytes;
  }

  /** The name N5's {@code dataType} uses, also NumPy's name: {@code "uint8"}, {@code "float32"}. */
  public String n5Name() {
    return n5Name;
  }

  /** NumPy's kind character: {@code 'u'}, {@code 'i'} or {@code 'f'}. */
  public char numpyKind() {
    return numpyKind;
  }

  /** Whether this is {@code FLOAT32} or {@code FLOAT64}. */
  public boolean isFloat() {
    return numpyKind == 'f';
  }

  /** Whether this is an unsigned integer type. */
  public boolean isUnsigned() {
    return numpyKind == 'u';
  }

  /** The type with this N5 name, if any. */
  public static Optional<DataType> ofN5Name(String name) {
    for (DataType type : values()) {
      if (type.n5Name.equals(name)) {
        return Optional.of(type);
      }
    }
    return Optional.empty();
  }

  /** The type of a NumPy kind and size ({@code 'u'}, 2 is {@code UINT16}), if any. */
  public static Optional<DataType> ofNumpy(char kind, int bytes) {
    for (DataType type : values()) {
      if (type.numpyKind == kind && type.bytes == bytes) {
        return Optional.of(type);
      }
    }
    return Optional.empty();
  }
}
