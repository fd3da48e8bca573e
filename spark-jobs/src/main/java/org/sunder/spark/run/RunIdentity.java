package org.sunder.spark.run;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.workdir.SunderVersion;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.workdir.Manifest;

/**
 * What identifies a run for resume: the canonical resolved configuration (file axis order, keys
 * sorted, every default written out, so two configurations that mean the same run have the same
 * hashes) with a SHA-256 per section, and a fingerprint of the input datasets' files (relative
 * path, size and modification time of every file, so an edited chunk shows; O(files)).
 */
public final class RunIdentity {
  private static final ObjectMapper JSON = new ObjectMapper();

  private RunIdentity() {}

  /** The manifest a run with these settings writes; {@code runId} is kept from an earlier run. */
  public static Manifest manifest(RunSettings settings, String runId) {
    ObjectNode config = canonicalConfig(settings);
    Map<String, String> sections = new TreeMap<>();
    Iterator<Map.Entry<String, JsonNode>> fields = config.fields();
    while (fields.hasNext()) {
      Map.Entry<String, JsonNode> field = fields.next();
      sections.put(field.getKey(), sha256(field.getValue().toString()));
    }
    Fingerprint input = fingerprint(settings);
    return new Manifest(Manifest.TOOL, SunderVersion.get(), runId, sha256(config.toString()),
        sections, config, input.hash(), input.summary());
  }

  /**
   * The resolved configuration in the file's axis order, keys sorted; the partition section is
   * the validated partition method with every default written out, not the text of the file.
   */
  public static ObjectNode canonicalConfig(RunSettings s) {
    AxisOrder axes = new AxisOrder(s.axes());
    ObjectNode root = JSON.createObjectNode();
    ObjectNode input = root.putObject("input");
    input.put("axes", s.axes());
    input.put("container", s.inputContainer());
    input.put("affinities", s.affinities());
    int[][] offsets = new int[s.offsets().length][];
    for (int k = 0; k < offsets.length; k++) {
      offsets[k] = axes.toFile(s.offsets()[k]);
    }
    input.set("offsets", JSON.valueToTree(offsets));
    input.put("mask", s.mask().orElse(null));
    ObjectNode output = root.putObject("output");
    output.put("container", s.outputContainer());
    output.put("dataset", s.outputDataset());
    ObjectNode blocks = root.putObject("blocks");
    blocks.set("shape", JSON.valueToTree(axes.toFile(s.blockShape())));
    blocks.set("halo", JSON.valueToTree(axes.toFile(s.halo())));
    root.set("partition", s.setup().partitionJson());
    root.putObject("solve").put("maxDriverEdges", s.maxDriverEdges());
    ObjectNode evaluate = root.putObject("evaluate");
    evaluate.put("container", s.truthContainer());
    evaluate.put("groundTruth", s.groundTruth());
    evaluate.put("ignoreBackground", s.ignoreBackground());
    return (ObjectNode) sorted(root);
  }

  private static JsonNode sorted(JsonNode node) {
    if (!node.isObject()) {
      return node;
    }
    ObjectNode out = JSON.createObjectNode();
    TreeMap<String, JsonNode> fields = new TreeMap<>();
    node.fields().forEachRemaining(e -> fields.put(e.getKey(), sorted(e.getValue())));
    fields.forEach(out::set);
    return out;
  }

  record Fingerprint(String hash, String summary) {}

  static Fingerprint fingerprint(RunSettings s) {
    Map<String, Path> datasets = new LinkedHashMap<>();
    datasets.put(s.affinities(), Path.of(s.inputContainer()).resolve(s.affinities()));
    s.mask().ifPresent(mask -> datasets.put(mask, Path.of(s.inputContainer()).resolve(mask)));
    MessageDigest digest = digest();
    long files = 0;
    long bytes = 0;
    long newest = 0;
    for (Map.Entry<String, Path> dataset : datasets.entrySet()) {
      List<Path> paths = new ArrayList<>();
      try (Stream<Path> walk = Files.walk(dataset.getValue())) {
        walk.filter(Files::isRegularFile).forEach(paths::add);
      } catch (IOException e) {
        throw new SunderException(ErrorKind.STORAGE, "cannot list dataset " + dataset.getValue()
            + ": " + e, e);
      }
      paths.sort(null);
      for (Path path : paths) {
        try {
          long size = Files.size(path);
          long modified = Files.getLastModifiedTime(path).toMillis();
          String line = dataset.getKey() + "/" + dataset.getValue().relativize(path) + "\t" + size
              + "\t" + modified + "\n";
          digest.update(line.getBytes(StandardCharsets.UTF_8));
          files++;
          bytes += size;
          newest = Math.max(newest, modified);
        } catch (IOException e) {
          throw new SunderException(ErrorKind.STORAGE, "cannot read " + path + ": " + e, e);
        }
      }
    }
    String summary = String.format(Locale.ROOT, "%d files, %d bytes, newest modified %s",
        files, bytes, java.time.Instant.ofEpochMilli(newest));
    return new Fingerprint(HexFormat.of().formatHex(digest.digest()), summary);
  }

  static String sha256(String text) {
    return HexFormat.of().formatHex(digest().digest(text.getBytes(StandardCharsets.UTF_8)));
  }

  private static MessageDigest digest() {
    try {
      return MessageDigest.getInstance("SHA-256");
    } catch (NoSuchAlgorithmException e) {
      throw new SunderException(ErrorKind.INTERNAL, "SHA-256 is not available", e);
    }
  }
}
