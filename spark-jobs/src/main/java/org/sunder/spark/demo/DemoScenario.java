package org.sunder.spark.demo;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.metrics.TunedBaseline;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * The demo's input: a realistic synthetic prediction ({@link TissuePreset}) with its ground
 * truth, written once into a container in the demo directory, plus a run configuration that
 * segments it with the default method and scores it.
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
  public static Path prepare(Path dir, StorageFormat format, TissuePreset tissue, long[] zyx,
      long seed) {
    Path container = container(dir, format);
    if (!Files.isDirectory(container.resolve(SyntheticScenario.AFFINITIES))) {
      write(container, format, tissue, zyx, seed);
    }
    Path config = dir.resolve("demo-run.json").toAbsolutePath().normalize();
    ObjectNode root = JSON.createObjectNode();
    root.put("axes", "zyx");
    root.putObject("input").put("container", container.toString())
        .put("affinities", SyntheticScenario.AFFINITIES);
    root.putObject("output").put("dataset", "segmentation");
    root.putObject("blocks").set("shape", JSON.valueToTree(blockShape(zyx)));
    root.putObject("evaluate").put("groundTruth", SyntheticScenario.GROUND_TRUTH);
    try {
      Files.createDirectories(dir);
      Files.write(config, JSON.writeValueAsBytes(root));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot write " + config + ": " + e, e);
    }
    return config;
  }

  /** The container the demo volume lives in. */
  public static Path container(Path dir, StorageFormat format) {
    return dir.resolve(format == StorageFormat.N5 ? "volume.n5" : "volume.zarr")
        .toAbsolutePath().normalize();
  }

  /**
   * The naive watershed, tuned on the ground truth, of the demo volume in {@code container}:
   * the yardstick printed beside the run's scores.
   */
  public static TunedBaseline baseline(Path container) {
    Container c = Container.open(container);
    Dataset affinities = c.openDataset(SyntheticScenario.AFFINITIES);
    return TunedBaseline.of(affinities, TissuePreset.offsets(),
        c.openDataset(SyntheticScenario.GROUND_TRUTH));
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

  private static void write(Path root, StorageFormat format, TissuePreset tissue, long[] zyx,
      long seed) {
    long[] xyz = {zyx[2], zyx[1], zyx[0]};
    ScenarioOptions options = tissue.scenarioOptions(seed).withChunkShape(chunks(xyz));
    SyntheticScenario.write(Container.create(root, format), tissue.volume(seed, xyz), options);
  }
}
