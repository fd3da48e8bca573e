package org.sunder.spark.workdir;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.Map;

/**
 * What a work dir belongs to: the run's id, the tool version that started it, the hash of the
 * resolved configuration (whole and per section) and a fingerprint of the input dataset.
 *
 * @param tool always {@code "sunder"}
 * @param version tool version that wrote the manifest
 * @param runId random id of this run, also written into the output dataset's attributes
 * @param configHash SHA-256 of the canonical resolved configuration
 * @param sectionHashes SHA-256 per configuration section
 * @param config the canonical resolved configuration (for naming what changed)
 * @param inputFingerprint SHA-256 over the input dataset's metadata and chunk files
 * @param inputSummary a readable line describing the input (shape, chunks, files, bytes)
 */
public record Manifest(String tool, String version, String runId, String configHash,
    Map<String, String> sectionHashes, JsonNode config, String inputFingerprint,
    String inputSummary) {
  /** Value of {@link #tool()}. */
  public static final String TOOL = "sunder";
}
