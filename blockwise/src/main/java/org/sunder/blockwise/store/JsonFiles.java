package org.sunder.blockwise.store;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.json.JsonReadFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.json.JsonMapper;
import java.nio.ByteBuffer;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.files.AtomicWrites;

/**
 * Reads and writes the JSON metadata files of both formats as ordered maps. Reading accepts
 * {@code NaN} and {@code Infinity} as bare tokens (Python's {@code json} writes them). Writing is
 * atomic (see {@link AtomicWrites}) and indented.
 */
final class JsonFiles {
  private static final ObjectMapper MAPPER = JsonMapper.builder()
      .enable(JsonReadFeature.ALLOW_NON_NUMERIC_NUMBERS)
      .enable(SerializationFeature.INDENT_OUTPUT)
      .build();

  private JsonFiles() {}

  /** The JSON object in {@code file}, or null if the file does not exist. */
  @SuppressWarnings("unchecked")
  static Map<String, Object> readIfExists(Path file) {
    byte[] bytes = AtomicWrites.readIfExists(file);
    if (bytes == null) {
      return null;
    }
    Object value;
    try {
      value = MAPPER.readValue(bytes, Object.class);
    } catch (JsonProcessingException e) {
      throw new StoreException(ErrorKind.INVALID_INPUT, file + " is not valid JSON: "
          + e.getOriginalMessage() + " at line " + e.getLocation().getLineNr()
          + ", column " + e.getLocation().getColumnNr(), e);
    } catch (java.io.IOException e) {
      throw new StoreException(ErrorKind.STORAGE, "cannot read " + file + ": " + e.getMessage(), e);
    }
    if (!(value instanceof Map<?, ?> map)) {
      throw new StoreException(ErrorKind.INVALID_INPUT, file + " holds "
          + (value instanceof List ? "a JSON array" : "'" + value + "'")
          + "; expected a JSON object");
    }
    return (Map<String, Object>) map;
  }

  /** The JSON object in {@code file}, or an empty map if the file does not exist. */
  static Map<String, Object> readOrEmpty(Path file) {
    Map<String, Object> map = readIfExists(file);
    return map == null ? new LinkedHashMap<>() : map;
  }

  /** Writes {@code json} to {@code file} atomically. */
  static void write(Path file, Map<String, ?> json) {
    byte[] bytes;
    try {
      bytes = MAPPER.writeValueAsBytes(json);
    } catch (JsonProcessingException e) {
      throw new StoreException(ErrorKind.INVALID_INPUT, "cannot write " + file
          + ": a value is not representable in JSON: " + e.getOriginalMessage(), e);
    }
    AtomicWrites.write(file, ByteBuffer.wrap(bytes));
  }
}
