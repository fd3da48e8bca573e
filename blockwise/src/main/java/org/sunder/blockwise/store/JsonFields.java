package org.sunder.blockwise.store;

import java.math.BigInteger;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;

/**
 * Typed reads of the keys of one metadata file. Every failure is a {@link StoreException}
 * (INVALID_INPUT) naming the file, the key, what was found and what was expected.
 */
final class JsonFields {
  private final Map<String, Object> json;
  private final Path file;

  JsonFields(Map<String, Object> json, Path file) {
    this.json = json;
    this.file = file;
  }

  Path file() {
    return file;
  }

  boolean has(String key) {
    return json.containsKey(key);
  }

  Object get(String key) {
    return json.get(key);
  }

  Object required(String key) {
    if (!json.containsKey(key)) {
      throw invalid(key, "missing", null);
    }
    return json.get(key);
  }

  String string(String key) {
    Object value = required(key);
    if (!(value instanceof String s)) {
      throw invalid(key, describe(value), "a string");
    }
    return s;
  }

  long longValue(String key) {
    Object value = required(key);
    if (!isIntegral(value)) {
      throw invalid(key, describe(value), "an integer");
    }
    return ((Number) value).longValue();
  }

  /** An integer array; {@code min} is the smallest allowed element. */
  long[] longArray(String key, long min) {
    Object value = required(key);
    if (!(value instanceof List<?> list)) {
      throw invalid(key, describe(value), "an array of integers");
    }
    long[] out = new long[list.size()];
    for (int i = 0; i < out.length; i++) {
      Object element = list.get(i);
      if (!isIntegral(element) || ((Number) element).longValue() < min) {
        throw invalid(key, describe(value), "an array of integers of at least " + min
            + " (element " + i + " is " + describe(element) + ")");
      }
      out[i] = ((Number) element).longValue();
    }
    return out;
  }

  int[] positiveIntArray(String key) {
    long[] values = longArray(key, 1);
    int[] out = new int[values.length];
    for (int i = 0; i < out.length; i++) {
      if (values[i] > Integer.MAX_VALUE) {
        throw invalid(key, describe(json.get(key)), "chunk sizes below 2^31");
      }
      out[i] = (int) values[i];
    }
    return out;
  }

  @SuppressWarnings("unchecked")
  Map<String, Object> objectOrNull(String key) {
    Object value = required(key);
    if (value == null) {
      return null;
    }
    if (!(value instanceof Map<?, ?>)) {
      throw invalid(key, describe(value), "an object or null");
    }
    return (Map<String, Object>) value;
  }

  static boolean isIntegral(Object value) {
    return value instanceof Integer || value instanceof Long || value instanceof Short
        || value instanceof Byte || (value instanceof BigInteger b && b.bitLength() < 64);
  }

  static String describe(Object value) {
    if (value == null) {
      return "null";
    }
    if (value instanceof String s) {
      return "\"" + s + "\"";
    }
    return String.valueOf(value);
  }

  StoreException invalid(String key, String found, String expected) {
    return new StoreException(ErrorKind.INVALID_INPUT, file + ": key '" + key + "' is " + found
        + (expected == null ? "" : "; expected " + expected));
  }
}
