package org.sunder.spark.run;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Map;
import org.apache.spark.SparkConf;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.BlockShapeChoice;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.config.ByteSize;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.config.RunConfig;
import org.sunder.stitching.setup.InputDataset;
import org.sunder.stitching.setup.PartitionEstimate;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.setup.VoxelSize;

/**
 * Checks a {@link RunConfig} against the input containers and fills in what depends on them:
 * offsets from the affinity dataset's {@code "offsets"} attribute, a halo as deep as the longest
 * offset along each axis, a block shape of whole chunks ({@link BlockShapeChoice}: grown until
 * the extended boxes hold at most {@value BlockShapeChoice#TARGET_OVERHEAD} times the volume's
 * voxels, while one partition task fits its memory ({@link TaskBudget}) and there are at least
 * twice as many blocks as cores), the work dir. Everything is checked before any output is
 * touched; each error names the configuration key and the value at fault. A block that does not
 * fit one Java array, or whose partition task needs more than one executor's memory, is refused.
 */
public final class RunResolver {
  /** Most values one Java array holds. */
  static final long MAX_ARRAY_VALUES = Integer.MAX_VALUE - 8L;

  private static final ObjectMapper JSON = new ObjectMapper();

  private RunResolver() {}

  /**
   * Resolves {@code config} (with defaults filled in); relative paths against the current
   * directory ({@link RunLoader} first resolves a file's paths against the file's folder).
   */
  public static RunSettings resolve(RunConfig config) {
    return resolve(config, TaskBudget.of(new SparkConf(), config.blocks().memoryPerTask()));
  }

  /** Resolves {@code config} for a run with {@code budget} (cores and memory per task). */
  public static RunSettings resolve(RunConfig config, TaskBudget budget) {
    AxisOrder axes = config.axisOrder();
    int n = axes.dimensions();
    Path inputPath = absolute(config.input().container());
    String affName = config.input().affinities();
    InputDataset affinities =
        InputDataset.read(inputPath, "input.container", affName, "input.affinities");
    long[] shape = affinities.shape();
    if (shape.length != n + 1) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "input.affinities: dataset '" + affName
          + "' in " + inputPath + " is not an affinity dataset: expected " + (n + 1)
          + " dimensions (" + axes + " and channels), it has shape "
          + Arrays.toString(Shapes.reversed(shape)) + " (slowest axis first)");
    }
    long[] volume = Arrays.copyOf(shape, n);
    long channels = shape[n];
    if (Arrays.stream(shape).anyMatch(size -> size <= 0)) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "input.affinities: dataset '" + affName
          + "' in " + inputPath + " is empty: its shape is " + Arrays.toString(axes.toFile(volume))
          + " (" + axes + ") with " + channels + " channels; every size must be at least 1");
    }
    if (!affinities.holdsAffinityValues()) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "input.affinities: dataset '" + affName
          + "' in " + inputPath + " has data type " + affinities.dataType()
          + "; affinities must be float32 in [0, 1] or uint8 (value / 255)");
    }
    int[] chunks = Arrays.copyOf(affinities.chunkShape(), n);
    int[][] offsets = offsets(config, affinities, axes, channels);
    int[] halo = halo(config, axes, offsets);
    long bytesPerVoxel = PartitionEstimate.bytesPerExtendedVoxel(method(config), (int) channels,
        affinities.isUint8() ? 1 : 4);
    BlockShapeOrigin origin;
    int[] blockShape;
    if (config.blocks().shape() == null) {
      BlockShapeChoice choice = BlockShapeChoice.choose(volume, chunks, halo, bytesPerVoxel,
          budget.memoryPerTask(), budget.minBlocks(), budget.cores());
      blockShape = choice.blockShape();
      origin = new BlockShapeOrigin(BlockShapeOrigin.CHOSEN, choice.overhead(),
          choice.limitedBy(), bytesPerVoxel, budget, null);
    } else {
      blockShape = blockShape(config, axes, volume, chunks);
      origin = new BlockShapeOrigin(BlockShapeOrigin.CONFIGURED,
          BlockShapeChoice.overhead(volume, blockShape, halo), null, bytesPerVoxel, budget, null);
    }
    requireArraySized(config, axes, volume, blockShape, halo, channels);
    requireTaskFits(config, axes, volume, blockShape, halo, bytesPerVoxel, budget);
    String mask = config.input().mask();
    if (mask != null) {
      InputDataset m = InputDataset.read(inputPath, "input.container", mask, "input.mask");
      requireVolumeShape(m, volume, "input.mask", mask, axes);
      if (!m.isUint8()) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "input.mask: dataset '" + mask
            + "' has data type " + m.dataType() + "; expected uint8 (1 = inside)");
      }
    }
    Path outputPath = absolute(config.output().container());
    String outputDataset = config.output().dataset();
    Path workDir = config.workDir() == null ? defaultWorkDir(outputPath, outputDataset)
        : absolute(config.workDir());
    requireOutsideInput(inputPath, affName, outputPath, outputDataset, workDir, config);
    if (config.input().missingChunks().equals(RunConfig.MISSING_REFUSE)) {
      MissingChunks.refuse(affinities, axes);
    }
    String truth = config.evaluate().groundTruth();
    Path truthPath = absolute(config.evaluate().container());
    if (truth != null) {
      InputDataset gt = InputDataset.read(truthPath, truthPath.equals(inputPath)
          ? "input.container" : "evaluate.container", truth, "evaluate.groundTruth");
      requireVolumeShape(gt, volume, "evaluate.groundTruth", truth, axes);
      if (gt.isFloat()) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "evaluate.groundTruth: dataset '"
            + truth + "' has data type " + gt.dataType() + "; expected integer labels");
      }
    }
    StitchingSetup setup;
    try {
      setup = StitchingSetup.resolve(inputPath, affName, mask == null ? "" : mask, outputPath,
          outputDataset, BlockGrid.of(volume, chunks, blockShape, halo), offsets,
          config.partition(), voxelSizeSlowestFirst(affinities.attributes(), axes));
    } catch (SunderException e) {
      throw e.kind() == ErrorKind.INVALID_CONFIG && !(e instanceof ConfigException)
          ? new ConfigException(e.getMessage(), e) : e;
    }
    return new RunSettings(axes.letters(), setup, workDir.toString(),
        config.solve().maxDriverEdges(), truthPath.toString(), truth,
        config.evaluate().ignoreBackground(), origin);
  }

  /** The partition method's JSON name as the configuration writes it, or null. */
  private static String method(RunConfig config) {
    JsonNode name = config.partition() == null ? null : config.partition().get("method");
    return name == null || !name.isTextual() ? null : name.asText();
  }

  /**
   * Refuses a block whose partition task, by {@link PartitionEstimate}'s figure, needs more than
   * one executor's memory (this JVM's heap in local mode): it could never run.
   */
  private static void requireTaskFits(RunConfig config, AxisOrder axes, long[] volume,
      int[] blockShape, int[] halo, long bytesPerVoxel, TaskBudget budget) {
    long voxels = BlockShapeChoice.largestExtendedVoxels(volume, blockShape, halo);
    long bytes = voxels > Long.MAX_VALUE / bytesPerVoxel ? Long.MAX_VALUE : voxels * bytesPerVoxel;
    if (bytes <= budget.executorMemory()) {
      return;
    }
    throw new ConfigException("blocks.shape: a block of " + Arrays.toString(axes.toFile(
        blockShape)) + " (" + axes + ") with its halo holds " + voxels + " voxels; its partition"
        + " task needs about " + ByteSize.format(bytes) + " (" + bytesPerVoxel + " bytes per"
        + " voxel), more than the " + ByteSize.format(budget.executorMemory()) + " of "
        + (budget.memorySource().startsWith("spark.") ? "one executor (spark.executor.memory)"
        : "this JVM's heap") + "; choose a smaller " + (config.blocks().shape() == null
        ? "blocks.memoryPerTask" : "blocks.shape") + " or give " + (budget.memorySource()
        .startsWith("spark.") ? "executors more memory (--executor-memory)"
        : "the JVM more heap (-Xmx, SUNDER_JAVA_OPTS)"));
  }

  /**
   * Refuses a block whose affinities, halo included and clipped to the volume, do not fit one
   * Java array (2^31 - 9 values): partition reads each block into one.
   */
  private static void requireArraySized(RunConfig config, AxisOrder axes, long[] volume,
      int[] blockShape, int[] halo, long channels) {
    long voxels = 1;
    long[] extent = new long[volume.length];
    for (int d = 0; d < volume.length; d++) {
      extent[d] = Math.min(volume[d], blockShape[d] + 2L * halo[d]);
      voxels *= extent[d];
    }
    long values = voxels * channels;
    if (values > MAX_ARRAY_VALUES) {
      throw new ConfigException("blocks.shape: a block of " + Arrays.toString(axes.toFile(
          blockShape)) + " (" + axes + ") with its halo spans " + Arrays.toString(axes.toFile(
          extent)) + " voxels, " + values + " affinity values with " + channels + " channels;"
          + " one block must hold at most 2^31 - 9 (" + MAX_ARRAY_VALUES + "): choose a smaller "
          + (config.blocks().shape() == null ? "blocks.shape (the default grew from the chunk"
          + " shape, which is too large)" : "blocks.shape"));
    }
  }

  /** Refuses an output container, output dataset or work dir inside the input's datasets. */
  private static void requireOutsideInput(Path input, String affinities, Path output,
      String outputDataset, Path workDir, RunConfig config) {
    Path affinityDir = input.resolve(affinities).normalize();
    if (!output.equals(input) && output.startsWith(input)) {
      throw new ConfigException("output.container: " + output + " is inside the input container "
          + input + "; choose a path outside it (the default is the input container itself,"
          + " with output.dataset beside the affinities)");
    }
    if (output.equals(input)) {
      Path target = input.resolve(outputDataset).normalize();
      if (!target.startsWith(input) || target.startsWith(affinityDir)
          || affinityDir.startsWith(target)) {
        throw new ConfigException("output.dataset: '" + outputDataset + "' in the input container"
            + " would be inside or around the affinity dataset '" + affinities + "'; choose a"
            + " name beside it, e.g. \"segmentation\"");
      }
    }
    if (workDir.startsWith(input)) {
      throw new ConfigException((config.workDir() == null ? "workDir (from output.container)"
          : "workDir") + ": " + workDir + " is inside the input container " + input
          + "; choose a directory outside it");
    }
  }

  /** The input's voxel size (see {@link VoxelSize}) slowest axis first, or null. */
  private static double[] voxelSizeSlowestFirst(Map<String, Object> attributes, AxisOrder axes) {
    double[] memory = VoxelSize.fromAttributes(attributes, axes.dimensions(), axes.letters());
    return memory == null ? null : Shapes.reversed(memory);
  }

  /** {@code <container>.sunder-work/<dataset>} beside the output container. */
  public static Path defaultWorkDir(Path outputContainer, String dataset) {
    Path container = outputContainer.toAbsolutePath().normalize();
    return container.resolveSibling(container.getFileName() + ".sunder-work").resolve(dataset);
  }

  static Path absolute(String path) {
    return Path.of(path).toAbsolutePath().normalize();
  }

  private static void requireVolumeShape(InputDataset dataset, long[] volume, String key, String name,
      AxisOrder axes) {
    if (!Arrays.equals(dataset.shape(), volume)) {
      throw new SunderException(ErrorKind.INVALID_INPUT, key + ": dataset '" + name + "' has shape "
          + Arrays.toString(axes.toFile(dataset.shape())) + ", expected the affinities' shape "
          + Arrays.toString(axes.toFile(volume)) + " (" + axes + ")");
    }
  }

  /**
   * The offsets in memory order, from {@code input.offsets} or the dataset's attribute. Every
   * error names where the offset came from and shows it as written there (file order).
   */
  private static int[][] offsets(RunConfig config, InputDataset affinities, AxisOrder axes,
      long channels) {
    String affName = affinities.name();
    int[][] fileOrder = config.input().offsets();
    String source = "input.offsets";
    AxisOrder order = axes;
    if (fileOrder == null) {
      Map<String, Object> attributes = affinities.attributes();
      Object stored = attributes.get("offsets");
      if (stored == null) {
        throw new ConfigException("input.offsets: missing, and dataset '" + affName
            + "' has no \"offsets\" attribute; give one offset per channel, e.g. "
            + example(axes) + " (" + axes + ")");
      }
      source = "the \"offsets\" attribute of dataset '" + affName + "' in "
          + affinities.container();
      try {
        fileOrder = JSON.convertValue(stored, int[][].class);
      } catch (IllegalArgumentException e) {
        throw new SunderException(ErrorKind.INVALID_INPUT, source + ": expected a list of"
            + " integer lists, got " + stored + "; or give input.offsets", e);
      }
      Object storedAxes = attributes.get("axes");
      if (storedAxes instanceof String letters) {
        try {
          order = new AxisOrder(letters);
        } catch (ConfigException e) {
          throw new SunderException(ErrorKind.INVALID_INPUT, "the \"axes\" attribute of dataset '"
              + affName + "': " + e.getMessage(), e);
        }
        if (order.dimensions() != axes.dimensions()) {
          throw new SunderException(ErrorKind.INVALID_INPUT, "the \"axes\" attribute of dataset '"
              + affName + "' is \"" + letters + "\", but the configuration's axes are \"" + axes
              + "\"; set axes to match the data, or give input.offsets");
        }
      }
    }
    boolean fromConfig = config.input().offsets() != null;
    if (fileOrder.length != channels) {
      throw new ConfigException((fromConfig ? "input.offsets: " : "")
          + fileOrder.length + " offsets (" + source + "), but dataset '" + affName + "' has "
          + channels + " channels; give one offset per channel" + (fromConfig ? ""
          : " in input.offsets"));
    }
    int[][] memory = new int[fileOrder.length][];
    for (int k = 0; k < fileOrder.length; k++) {
      int[] offset = fileOrder[k];
      String where = fromConfig ? "input.offsets[" + k + "]" : "offset " + k + " of " + source;
      if (offset == null || offset.length != order.dimensions()) {
        throw new ConfigException(where + ": expected " + order.dimensions()
            + " integers (" + order + "), got " + Arrays.toString(offset)
            + (fromConfig ? "" : "; the attribute is read in " + (order == axes
                ? "the configuration's axes" : "the dataset's \"axes\"") + " order, or give"
                + " input.offsets"));
      }
      if (Arrays.stream(offset).allMatch(v -> v == 0)) {
        throw new ConfigException(where + ": the zero offset connects a voxel"
            + " to itself; every offset needs a non-zero entry");
      }
      for (int j = 0; j < k; j++) {
        if (Arrays.equals(fileOrder[j], offset)) {
          throw new ConfigException(where + ": " + Arrays.toString(offset) + " (" + order
              + ") repeats " + (fromConfig ? "input.offsets[" + j + "]" : "offset " + j)
              + "; every channel needs its own offset");
        }
      }
      memory[k] = order.toMemory(offset);
    }
    return memory;
  }

  private static String example(AxisOrder axes) {
    return axes.dimensions() == 2 ? "[[-1, 0], [0, -1]]" : "[[-1, 0, 0], [0, -1, 0], [0, 0, -1]]";
  }

  private static int[] blockShape(RunConfig config, AxisOrder axes, long[] volume, int[] chunks) {
    int n = volume.length;
    int[] fileShape = config.blocks().shape();
    if (fileShape.length != n) {
      throw new ConfigException("blocks.shape: expected " + n + " integers (" + axes + "), got "
          + Arrays.toString(fileShape));
    }
    int[] shape = axes.toMemory(fileShape);
    int[] fileChunks = axes.toFile(chunks);
    for (int d = 0; d < n; d++) {
      if (shape[d] <= 0 || shape[d] % chunks[d] != 0) {
        int[] below = new int[n];
        int[] above = new int[n];
        for (int e = 0; e < n; e++) {
          int c = fileChunks[e];
          below[e] = Math.max(c, fileShape[e] / c * c);
          above[e] = Math.max(c, (fileShape[e] + c - 1) / c * c);
        }
        throw new ConfigException("blocks.shape: " + Arrays.toString(fileShape) + " (" + axes
            + ") is not a multiple of the chunk shape " + Arrays.toString(fileChunks)
            + " along every axis; nearest valid: " + Arrays.toString(below)
            + (Arrays.equals(below, above) ? "" : " or " + Arrays.toString(above)));
      }
    }
    return shape;
  }

  private static int[] halo(RunConfig config, AxisOrder axes, int[][] offsets) {
    int n = axes.dimensions();
    int[] fileHalo = config.blocks().halo();
    if (fileHalo == null) {
      return StitchingSetup.longestOffsets(offsets);
    }
    if (fileHalo.length != n || Arrays.stream(fileHalo).anyMatch(h -> h < 0)) {
      throw new ConfigException("blocks.halo: expected " + n + " integers >= 0 (" + axes
          + "), got " + Arrays.toString(fileHalo));
    }
    return axes.toMemory(fileHalo);
  }
}
