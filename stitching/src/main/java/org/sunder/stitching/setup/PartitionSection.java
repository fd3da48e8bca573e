package org.sunder.stitching.setup;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.stream.Collectors;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.config.PartitionMethod;
import org.sunder.blockwise.partition.fragments.FragmentOptions;

/**
 * A run configuration's {@code "partition"} section made into the validated
 * {@link PartitionConfig} of a run: a section naming no method gets
 * {@link PartitionConfig#robustDefault}'s method and, unless it sets one, its minimum segment
 * size for the voxel size; a fragment method without {@code fragments.voxelSize} or
 * {@code fragments.perSlice} gets them fitted to the input's voxel size
 * ({@link FragmentOptions#fittedTo}). Every mistake is a {@link SunderException} of kind
 * {@link ErrorKind#INVALID_CONFIG} whose message starts with the key path
 * ({@code partition.threshold: ...}, {@code unknown key 'partition.x'; known keys there: ...}).
 */
final class PartitionSection {
  private static final ObjectMapper JSON = new ObjectMapper();
  private static final ObjectMapper STRICT = new ObjectMapper()
      .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES);

  private PartitionSection() {}

  /**
   * The section (not changed) resolved against the input's voxel size (slowest axis first, or
   * null when unknown) and checked against the offsets.
   */
  static PartitionConfig resolve(JsonNode section, double[] voxelSizeSlowestFirst,
      Offsets offsets) {
    try {
      ObjectNode completed = section.deepCopy();
      completeDefault(completed, voxelSizeSlowestFirst);
      fitFragments(completed, voxelSizeSlowestFirst);
      String json = JSON.writeValueAsString(completed);
      requireKnownKeys(json);
      PartitionConfig partition = PartitionConfig.fromJson(json);
      partition.validate(offsets);
      return partition;
    } catch (JsonProcessingException e) {
      throw invalid("partition: cannot encode the section: " + e.getMessage(), e);
    } catch (SunderException e) {
      String message = e.getMessage();
      throw invalid(message.startsWith("partition") || message.startsWith("unknown key")
          ? message : "partition." + message, e);
    }
  }

  /**
   * Refuses an unknown key anywhere in the section in the words the reader uses for the rest of
   * the file: the key path and the keys known there.
   */
  private static void requireKnownKeys(String json) {
    try {
      STRICT.readValue(json, PartitionConfig.class);
    } catch (UnrecognizedPropertyException e) {
      StringBuilder path = new StringBuilder("partition");
      for (JsonMappingException.Reference ref : e.getPath()) {
        if (ref.getFieldName() != null) {
          path.append('.').append(ref.getFieldName());
        } else if (ref.getIndex() >= 0) {
          path.append('[').append(ref.getIndex()).append(']');
        }
      }
      String known = e.getKnownPropertyIds() == null ? "" : e.getKnownPropertyIds().stream()
          .map(Object::toString).sorted().collect(Collectors.joining(", "));
      throw invalid("unknown key '" + path + "'"
          + (known.isEmpty() ? "" : "; known keys there: " + known), e);
    } catch (JsonProcessingException e) {
      // Other mistakes are reported by PartitionConfig.fromJson, naming the key.
    }
  }

  private static void completeDefault(ObjectNode section, double[] voxelSizeSlowestFirst) {
    if (section.has("method")) {
      return;
    }
    section.put("method", PartitionConfig.robustDefault(null).method().jsonName());
    if (!section.has("minSegmentSize")) {
      section.put("minSegmentSize", PartitionConfig.defaultMinSegmentSize(voxelSizeSlowestFirst));
    }
  }

  private static void fitFragments(ObjectNode section, double[] voxelSizeSlowestFirst) {
    boolean fragmentMethod = PartitionMethod.byName(section.path("method").asText())
        .map(PartitionMethod::usesFragments).orElse(false);
    if (!fragmentMethod || voxelSizeSlowestFirst == null
        || (section.has("fragments") && !section.get("fragments").isObject())) {
      return;
    }
    ObjectNode fragments = section.has("fragments") ? (ObjectNode) section.get("fragments")
        : section.putObject("fragments");
    if (fragments.has("voxelSize")) {
      return;
    }
    ArrayNode size = fragments.putArray("voxelSize");
    for (double v : voxelSizeSlowestFirst) {
      size.add(v);
    }
    if (!fragments.has("perSlice")) {
      fragments.put("perSlice", FragmentOptions.fittedToZyx(voxelSizeSlowestFirst).perSlice());
    }
  }

  private static SunderException invalid(String message, Throwable cause) {
    return new SunderException(ErrorKind.INVALID_CONFIG, message, cause);
  }
}
