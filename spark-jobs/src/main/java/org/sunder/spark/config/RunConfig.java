package org.sunder.spark.config;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * A run configuration as written in its JSON file. Every coordinate list is in the order that
 * {@code axes} names (default {@code "zyx"}, slowest axis first). Only {@code input.container}
 * is required; {@link #withDefaults()} fills in everything else that does not need the input
 * dataset, and {@link RunResolver} the rest (offsets from the dataset's attributes, block shape
 * and halo from its chunks and offsets).
 *
 * @param axes order of every coordinate list in the file
 * @param input where the affinities are
 * @param output where the segmentation goes (default: dataset {@code segmentation} in the input container)
 * @param workDir manifest and checkpoints (default: beside the output container, see {@link RunResolver})
 * @param blocks block shape and halo
 * @param partition the partition method and its parameters (the partition module's configuration)
 * @param solve global solve settings
 * @param evaluate optional ground truth to score the result against
 */
public record RunConfig(String axes, InputSection input, OutputSection output, String workDir,
    BlockSection blocks, JsonNode partition, SolveSection solve, EvaluateSection evaluate) {

  /** Default output dataset name. */
  public static final String DEFAULT_OUTPUT_DATASET = "segmentation";
  /** Default name of the affinity dataset. */
  public static final String DEFAULT_AFFINITIES = "affinities";
  /** Partition method when the configuration names none: parameter-free. */
  public static final String DEFAULT_METHOD = StitchingSetup.DEFAULT_METHOD;
  /** Default bound on the reduced graph's edges gathered on the driver. */
  public static final long DEFAULT_MAX_DRIVER_EDGES = 20_000_000L;

  /**
   * @param container N5 or Zarr container (required)
   * @param affinities affinity dataset inside it (default {@code affinities})
   * @param offsets one offset per channel, in {@code axes} order (default: the dataset's {@code "offsets"} attribute)
   * @param mask optional uint8 mask dataset in the same container, 1 = inside
   * @param missingChunks {@value #MISSING_REFUSE} (default): a run refuses affinities with
   *     missing chunk files; {@value #MISSING_FILL}: a missing chunk reads as the fill value
   */
  public record InputSection(String container, String affinities, int[][] offsets, String mask,
      String missingChunks) {}

  /** {@code input.missingChunks}: refuse an affinity dataset with missing chunk files. */
  public static final String MISSING_REFUSE = "refuse";
  /** {@code input.missingChunks}: missing chunk files read as the fill value (usually 0). */
  public static final String MISSING_FILL = "fill";

  /**
   * @param container container for the segmentation (default: the input container)
   * @param dataset dataset path (default {@code segmentation})
   */
  public record OutputSection(String container, String dataset) {}

  /**
   * @param shape block core shape in voxels, whole chunks (default: chosen from the chunk shape,
   *     the halo and {@code memoryPerTask}, see {@code RunResolver})
   * @param halo context around each core per axis (default: the largest offset along each axis)
   * @param memoryPerTask memory one partition task may hold, for the default shape (default: the
   *     executor memory divided by the executor's cores, see {@code TaskBudget})
   */
  public record BlockSection(int[] shape, int[] halo, ByteSize memoryPerTask) {}

  /** @param maxDriverEdges largest reduced graph (edges) that may be gathered on the driver */
  public record SolveSection(Long maxDriverEdges) {}

  /**
   * @param container container of the ground truth (default: the input container)
   * @param groundTruth uint64 ground-truth dataset; evaluation is skipped when absent
   * @param ignoreBackground ignore ground-truth label 0 (default true)
   */
  public record EvaluateSection(String container, String groundTruth, Boolean ignoreBackground) {}

  /** This configuration with every default filled in that does not need the input dataset. */
  public RunConfig withDefaults() {
    if (input == null) {
      throw new ConfigException("missing key 'input': the section naming the affinities,"
          + " e.g. \"input\": {\"container\": \"volume.n5\"}");
    }
    if (input.container() == null || input.container().isBlank()) {
      throw new ConfigException("missing key 'input.container': the N5 or Zarr container"
          + " holding the affinities");
    }
    AxisOrder order = new AxisOrder(axes == null ? AxisOrder.ZYX.letters() : axes);
    String missing = orDefault(input.missingChunks(), MISSING_REFUSE);
    if (!missing.equals(MISSING_REFUSE) && !missing.equals(MISSING_FILL)) {
      throw new ConfigException("input.missingChunks: expected \"" + MISSING_REFUSE + "\" or \""
          + MISSING_FILL + "\", got \"" + missing + "\"");
    }
    InputSection in = new InputSection(input.container(),
        orDefault(input.affinities(), DEFAULT_AFFINITIES), input.offsets(), input.mask(), missing);
    OutputSection out = output == null ? new OutputSection(null, null) : output;
    out = new OutputSection(orDefault(out.container(), in.container()),
        orDefault(out.dataset(), DEFAULT_OUTPUT_DATASET));
    BlockSection b = blocks == null ? new BlockSection(null, null, null) : blocks;
    JsonNode p = partition == null || partition.isNull()
        ? JsonNodeFactory.instance.objectNode() : partition.deepCopy();
    if (!p.isObject()) {
      throw new ConfigException("partition: expected an object such as {\"method\": \""
          + DEFAULT_METHOD + "\"}, got " + p);
    }
    SolveSection s = solve == null || solve.maxDriverEdges() == null
        ? new SolveSection(DEFAULT_MAX_DRIVER_EDGES) : solve;
    if (s.maxDriverEdges() < 1) {
      throw new ConfigException("solve.maxDriverEdges: expected a positive number of edges, got "
          + s.maxDriverEdges());
    }
    EvaluateSection e = evaluate == null ? new EvaluateSection(null, null, true) : evaluate;
    e = new EvaluateSection(orDefault(e.container(), in.container()), e.groundTruth(),
        e.ignoreBackground() == null ? Boolean.TRUE : e.ignoreBackground());
    return new RunConfig(order.letters(), in, out, workDir, b, p, s, e);
  }

  /**
   * This configuration with every relative path (containers and work dir) resolved against
   * {@code folder}, the configuration file's folder; absolute paths and unset keys stay as they
   * are.
   */
  public RunConfig relativeTo(java.nio.file.Path folder) {
    InputSection in = new InputSection(against(folder, input.container()), input.affinities(),
        input.offsets(), input.mask(), input.missingChunks());
    OutputSection out = output == null ? null
        : new OutputSection(against(folder, output.container()), output.dataset());
    EvaluateSection e = evaluate == null ? null : new EvaluateSection(
        against(folder, evaluate.container()), evaluate.groundTruth(), evaluate.ignoreBackground());
    return new RunConfig(axes, in, out, against(folder, workDir), blocks, partition, solve, e);
  }

  private static String against(java.nio.file.Path folder, String path) {
    if (path == null || path.isBlank() || folder == null) {
      return path;
    }
    return folder.resolve(path).normalize().toString();
  }

  /** The axis order ({@link #withDefaults()} first). */
  public AxisOrder axisOrder() {
    return new AxisOrder(axes == null ? AxisOrder.ZYX.letters() : axes);
  }

  private static String orDefault(String value, String fallback) {
    return value == null || value.isBlank() ? fallback : value;
  }
}
