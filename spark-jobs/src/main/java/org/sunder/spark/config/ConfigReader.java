package org.sunder.spark.config;

import com.fasterxml.jackson.core.JsonParseException;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.exc.MismatchedInputException;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.stream.Collectors;

/**
 * Reads a {@link RunConfig} from JSON. Unknown keys, values of the wrong type and malformed JSON
 * become {@link ConfigException}s whose message names the file and the key path
 * ({@code input.offsets[2]}), and says what was expected.
 */
public final class ConfigReader {
  private final ObjectMapper mapper = new ObjectMapper()
      .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
      .enable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES)
      .disable(DeserializationFeature.ACCEPT_FLOAT_AS_INT);

  /** Reads and fills in the defaults ({@link RunConfig#withDefaults()}). */
  public RunConfig read(Path file) {
    String text;
    try {
      text = Files.readString(file, StandardCharsets.UTF_8);
    } catch (NoSuchFileException e) {
      throw new ConfigException("configuration file " + file + " does not exist");
    } catch (IOException e) {
      throw new ConfigException("cannot read configuration file " + file + ": " + e.getMessage(), e);
    }
    try {
      return parse(text).withDefaults();
    } catch (ConfigException e) {
      throw new ConfigException(file + ": " + e.getMessage(), e);
    }
  }

  /** Parses JSON text without filling in defaults. */
  public RunConfig parse(String json) {
    try {
      RunConfig config = mapper.readValue(json, RunConfig.class);
      if (config == null) {
        throw new ConfigException("the configuration is empty; expected a JSON object");
      }
      return config;
    } catch (UnrecognizedPropertyException e) {
      String known = e.getKnownPropertyIds() == null ? "" : e.getKnownPropertyIds().stream()
          .map(Object::toString).sorted().collect(Collectors.joining(", "));
      throw new ConfigException("unknown key '" + keyPath(e) + "'"
          + (known.isEmpty() ? "" : "; known keys there: " + known), e);
    } catch (JsonParseException e) {
      throw malformed(e);
    } catch (JsonMappingException e) {
      Throwable cause = e.getCause();
      if (cause instanceof ConfigException c) {
        throw new ConfigException(keyPath(e) + ": " + c.getMessage(), c);
      }
      if (cause instanceof JsonParseException p) {
        throw malformed(p);
      }
      Class<?> type = typeAt(e.getPath());
      if (type == null && e instanceof MismatchedInputException m) {
        type = m.getTargetType();
      }
      throw new ConfigException("key '" + keyPath(e) + "': expected " + describe(type)
          + (e.getLocation() == null ? "" : " (line " + e.getLocation().getLineNr() + ")"), e);
    } catch (JsonProcessingException e) {
      throw new ConfigException("not valid JSON: " + e.getOriginalMessage(), e);
    }
  }

  /** The mapper this reader uses, for reading nested sections such as {@code partition}. */
  public ObjectMapper mapper() {
    return mapper;
  }

  private static ConfigException malformed(JsonParseException e) {
    return new ConfigException("not valid JSON at line " + e.getLocation().getLineNr()
        + ", column " + e.getLocation().getColumnNr() + ": " + e.getOriginalMessage(), e);
  }

  static String keyPath(JsonMappingException e) {
    StringBuilder path = new StringBuilder();
    for (JsonMappingException.Reference ref : e.getPath()) {
      if (ref.getFieldName() != null) {
        if (path.length() > 0) {
          path.append('.');
        }
        path.append(ref.getFieldName());
      } else if (ref.getIndex() >= 0) {
        path.append('[').append(ref.getIndex()).append(']');
      }
    }
    return path.length() == 0 ? "(top level)" : path.toString();
  }

  /** The Java type the configuration expects at a key path, or null if unknown there. */
  static Class<?> typeAt(java.util.List<JsonMappingException.Reference> path) {
    java.lang.reflect.Type type = RunConfig.class;
    for (JsonMappingException.Reference ref : path) {
      Class<?> raw = type instanceof Class<?> c ? c : null;
      if (raw == null) {
        return null;
      }
      if (ref.getFieldName() != null && raw.isRecord()) {
        java.lang.reflect.Type next = null;
        for (java.lang.reflect.RecordComponent component : raw.getRecordComponents()) {
          if (component.getName().equals(ref.getFieldName())) {
            next = component.getGenericType();
          }
        }
        type = next;
      } else if (ref.getIndex() >= 0 && raw.isArray()) {
        type = raw.getComponentType();
      } else {
        return null;
      }
      if (type == null) {
        return null;
      }
    }
    return type instanceof Class<?> c && c != RunConfig.class ? c : null;
  }

  private static String describe(Class<?> type) {
    if (type == null) {
      return "a different kind of value";
    }
    if (type == int[][].class) {
      return "a list of integer lists";
    }
    if (type == int[].class) {
      return "a list of integers";
    }
    if (type == int.class || type == Integer.class || type == long.class || type == Long.class) {
      return "an integer";
    }
    if (type == String.class) {
      return "a string";
    }
    if (type == Boolean.class || type == boolean.class) {
      return "true or false";
    }
    if (type.isRecord()) {
      return "an object with keys " + java.util.Arrays.stream(type.getRecordComponents())
          .map(java.lang.reflect.RecordComponent::getName).collect(Collectors.joining(", "));
    }
    return "a value of type " + type.getSimpleName();
  }
}
