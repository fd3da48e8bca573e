package org.sunder.spark.demo;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.stitching.demo.DemoVolume;

/**
 * The demo's run: its volume ({@link DemoVolume}), written once into the demo directory, plus a
 * run configuration that segments it with the default method and scores it.
 */
public final class DemoScenario {
  private static final ObjectMapper JSON = new ObjectMapper()
      .enable(SerializationFeature.INDENT_OUTPUT);

  private DemoScenario() {}

  /**
   * Writes the volume unless its container already holds it, and the configuration file.
   *
   * @param zyx volume shape, slowest axis first
   * @return the configuration file
   */
  public static Path prepare(Path dir, DemoVolume volume, String tissue, long[] zyx, long seed) {
    if (!volume.isWritten()) {
      volume.write(tissue, zyx, seed);
    }
    Path config = dir.resolve("demo-run.json").toAbsolutePath().normalize();
    ObjectNode root = JSON.createObjectNode();
    root.put("axes", "zyx");
    root.putObject("input").put("container", volume.container().toString())
        .put("affinities", DemoVolume.AFFINITIES);
    root.putObject("output").put("dataset", "segmentation");
    root.putObject("blocks").set("shape", JSON.valueToTree(DemoVolume.blockShape(zyx)));
    root.putObject("evaluate").put("groundTruth", DemoVolume.GROUND_TRUTH);
    try {
      Files.createDirectories(dir);
      Files.write(config, JSON.writeValueAsBytes(root));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot write " + config + ": " + e, e);
    }
    return config;
  }
}
