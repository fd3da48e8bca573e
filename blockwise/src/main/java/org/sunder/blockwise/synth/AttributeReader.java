package org.sunder.blockwise.synth;

import java.util.List;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/** Typed reads of JSON-shaped attribute maps, with errors that name the key. */
final class AttributeReader {
  private final String what;
  private final Map<String, ?> map;

  AttributeReader(String what, Map<String, ?> map) {
    this.what = what;
    this.map = map;
  }

  Number number(String key) {
    Object v = map.get(key);
    if (!(v instanceof Number n)) {
      throw fail(key, "a number", v);
    }
    return n;
  }

  long longValue(String key) {
    return number(key).longValue();
  }

  int intValue(String key) {
    Number n = number(key);
    if (n.longValue() != n.intValue() || n.doubleValue() != n.longValue()) {
      throw fail(key, "an integer", n);
    }
    return n.intValue();
  }

  double doubleValue(String key) {
    return number(key).doubleValue();
  }

  /** The integer at {@code key}, or {@code fallback} when the key is absent. */
  int intValueOr(String key, int fallback) {
    return map.containsKey(key) ? intValue(key) : fallback;
  }

  /** The number at {@code key}, or {@code fallback} when the key is absent. */
  double doubleValueOr(String key, double fallback) {
    return map.containsKey(key) ? doubleValue(key) : fallback;
  }

  boolean booleanValue(String key) {
    Object v = map.get(key);
    if (!(v instanceof Boolean b)) {
      throw fail(key, "true or false", v);
    }
    return b;
  }

  long[] longs(String key, int length) {
    List<?> list = list(key, length);
    long[] out = new long[length];
    for (int i = 0; i < length; i++) {
      if (!(list.get(i) instanceof Number n)) {
        throw fail(key, "a list of " + length + " numbers", list);
      }
      out[i] = n.longValue();
    }
    return out;
  }

  double[] doubles(String key, int length) {
    List<?> list = list(key, length);
    double[] out = new double[length];
    for (int i = 0; i < length; i++) {
      if (!(list.get(i) instanceof Number n)) {
        throw fail(key, "a list of " + length + " numbers", list);
      }
      out[i] = n.doubleValue();
    }
    return out;
  }

  private List<?> list(String key, int length) {
    Object v = map.get(key);
    if (!(v instanceof List<?> list) || list.size() != length) {
      throw fail(key, "a list of " + length + " numbers", v);
    }
    return list;
  }

  private SunderException fail(String key, String expected, Object got) {
    return new SunderException(ErrorKind.INVALID_INPUT, what + ": key \"" + key + "\" must be "
        + expected + ", got " + (got == null ? "nothing" : got));
  }
}
