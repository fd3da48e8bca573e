package org.sunder.blockwise.store;

import java.util.Map;
import java.util.function.Supplier;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;

/** Typed reads of a codec's JSON object with messages that name the file and key. */
final class CodecJson {
  private final Map<String, ?> json;
  private final String where;
  private final String key;

  CodecJson(Map<String, ?> json, String where, String key) {
    this.json = json;
    this.where = where;
    this.key = key;
  }

  boolean has(String name) {
    return json.get(name) != null;
  }

  Object raw(String name) {
    return json.get(name);
  }

  String string(String name) {
    Object value = json.get(name);
    if (!(value instanceof String s)) {
      throw invalid(name, value == null ? "missing" : "'" + value + "'", "a string");
    }
    return s;
  }

  int integer(String name, int fallback) {
    Object value = json.get(name);
    if (value == null) {
      return fallback;
    }
    if (value instanceof Integer || value instanceof Long || value instanceof Short) {
      long v = ((Number) value).longValue();
      if (v == (int) v) {
        return (int) v;
      }
    }
    throw invalid(name, "'" + value + "'", "an integer");
  }

  boolean bool(String name, boolean fallback) {
    Object value = json.get(name);
    if (value == null) {
      return fallback;
    }
    if (value instanceof Boolean b) {
      return b;
    }
    throw invalid(name, "'" + value + "'", "true or false");
  }

  StoreException unknown(String name, String value, String expected) {
    return invalid(name, "'" + value + "'", expected);
  }

  /** Runs {@code parse}, adding the file and key to a spec's range errors. */
  <T> T wrap(Supplier<T> parse) {
    try {
      return parse.get();
    } catch (StoreException e) {
      if (e.getMessage().startsWith(where)) {
        throw e;
      }
      throw new StoreException(ErrorKind.INVALID_INPUT,
          where + ": key '" + key + "': " + e.getMessage(), e);
    }
  }

  private StoreException invalid(String name, String found, String expected) {
    return new StoreException(ErrorKind.INVALID_INPUT, where + ": key '" + key + "." + name
        + "' is " + found + "; expected " + expected);
  }
}
