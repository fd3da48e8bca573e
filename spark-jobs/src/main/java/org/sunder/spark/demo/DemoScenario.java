package org.sunder.spark.demo;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;

/**
 * The demo's input: a synthetic tissue volume (fibres, cells, a large body, all touching) with
 * its ground truth and moderately degraded affinities, written once into a container in the
 * demo directory, plus a run configuration that segments and scores it.
 */
public final class DemoScenario {
  private static final ObjectMapper JSON = new ObjectMapper()
      .enable(SerializationFeature.INDENT_OUTPUT);

  private DemoScenario() {}

  /**
   * Writes the volume unless the container already holds it, and the configuration file.
   *
   * @param zyx volume shape, slowest axis first
   * @return the configuration file
   */
  public static Path prepare(Path dir, StorageFormat format, long[] zyx, long seed) {
    Path container = dir.resolve(format == StorageFormat.N5 ? "volume.n5" : "volume.zarr")
        .toAbsolutePath().normalize();
    if (!Files.isDirectory(container.resolve(SyntheticScenario.AFFINITIES))) {
      write(container, format, zyx, seed);
    }
    Path config = dir.resolve("demo-run.json").toAbsolutePath().normalize();
    ObjectNode root = JSON.createObjectNode();
    root.put("axes", "zyx");
    root.putObject("input").put("container", container.toString())
        .put("affinities", SyntheticScenario.AFFINITIES);
    root.putObject("output").put("dataset", "segmentation");
    root.putObject("blocks").set("shape", JSON.valueToTree(blockShape(zyx)));
    root.putObject("partition").put("method", "mutex-watershed");
    root.putObject("evaluate").put("groundTruth", SyntheticScenario.GROUND_TRUTH);
    try {
      Files.createDirectories(dir);
      Files.write(config, JSON.writeValueAsBytes(root));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot write " + config + ": " + e, e);
    }
    return config;
  }

  /** One chunk per block, so that even the small demo volume is stitched from several blocks. */
  static int[] blockShape(long[] zyx) {
    int[] xyz = chunks(new long[] {zyx[2], zyx[1], zyx[0]});
    return new int[] {xyz[2], xyz[1], xyz[0]};
  }

  private static int[] chunks(long[] xyz) {
    return new int[] {(int) Math.min(64, xyz[0]), (int) Math.min(64, xyz[1]),
        (int) Math.min(16, xyz[2])};
  }

  private static void write(Path root, StorageFormat format, long[] zyx, long seed) {
    long voxels = zyx[0] * zyx[1] * zyx[2];
    long[] xyz = {zyx[2], zyx[1], zyx[0]};
    double scale = voxels / (64.0 * 56 * 20);
    SynthSpec small = SynthSpec.small(seed);
    SynthSpec spec = small.withShape(xyz).withCounts((int) Math.max(8, Math.round(30 * scale)),
        (int) Math.max(1, Math.round(4 * scale)), (int) Math.max(1, Math.round(scale)));
    int[] chunks = chunks(xyz);
    ScenarioOptions options = ScenarioOptions.defaults()
        .withDegradation(Degradation.moderate(seed)).withChunkShape(chunks);
    SyntheticScenario.write(Container.create(root, format), spec, options);
  }
}
