package org.sunder.spark.config;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * A number of bytes as a configuration writes it: a JSON integer (bytes), or a string of an
 * integer with an optional unit in the form Spark's memory settings use ({@code "4g"},
 * {@code "512m"}, {@code "1536k"}, {@code "2gb"}, {@code "100b"}; binary multiples, 1k = 1024
 * bytes, case ignored). A string without a unit is bytes. Immutable.
 *
 * @param bytes the size, at least 1
 */
public record ByteSize(long bytes) {
  private static final Pattern TEXT =
      Pattern.compile("([0-9]+)\\s*([kmgtp]?)b?", Pattern.CASE_INSENSITIVE);

  public ByteSize {
    if (bytes < 1) {
      throw new ConfigException("expected a size of at least 1 byte, got " + bytes);
    }
  }

  /** From a JSON integer: bytes. */
  @JsonCreator
  public static ByteSize ofBytes(long bytes) {
    return new ByteSize(bytes);
  }

  /**
   * Parses {@code "4g"}, {@code "512m"}, {@code "1073741824"}; refuses anything else with a
   * {@link ConfigException} that shows the text.
   */
  @JsonCreator
  public static ByteSize parse(String text) {
    Matcher m = TEXT.matcher(text == null ? "" : text.strip());
    if (!m.matches()) {
      throw new ConfigException("expected a size such as 4g, 512m or a number of bytes, got \""
          + text + "\"");
    }
    int shift = switch (m.group(2).toLowerCase(Locale.ROOT)) {
      case "k" -> 10;
      case "m" -> 20;
      case "g" -> 30;
      case "t" -> 40;
      case "p" -> 50;
      default -> 0;
    };
    long value;
    try {
      value = Long.parseLong(m.group(1));
    } catch (NumberFormatException e) {
      throw new ConfigException("size \"" + text + "\" is too large", e);
    }
    if (value > (Long.MAX_VALUE >> shift)) {
      throw new ConfigException("size \"" + text + "\" is too large");
    }
    return new ByteSize(value << shift);
  }

  /** As written back into a manifest: bytes. */
  @JsonValue
  public long jsonValue() {
    return bytes;
  }

  /** {@code 512.0 MiB}, {@code 4.0 GiB}. */
  public static String format(long bytes) {
    if (bytes >= 1L << 30) {
      return String.format(Locale.ROOT, "%.1f GiB", bytes / (double) (1L << 30));
    }
    return String.format(Locale.ROOT, "%.1f MiB", bytes / (double) (1L << 20));
  }

  @Override
  public String toString() {
    return format(bytes);
  }
}
