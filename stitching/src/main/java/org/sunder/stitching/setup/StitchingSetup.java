package org.sunder.stitching.setup;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.Serializable;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Optional;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.config.PartitionMethod;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.stitching.task.SeamEdges;

/**
 * Everything a task of a blockwise run needs to know, validated once where the run is set up and
 * sent once to every worker: where the affinities (and optional mask) are, where the labels go,
 * the block grid, the offsets and the partition configuration. Java-serialisable (the Spark jobs
 * broadcast it as it is). Tasks open the containers themselves. The in-process runner and the
 * Spark jobs prepare a run with the same two calls, {@link #validateInputs()} and
 * {@link #createLabels()}.
 *
 * @param inputRoot the container holding the affinities (and mask)
 * @param affinitiesPath affinity dataset, dims {@code (x, y, z, channel)}, FLOAT32 or UINT8
 * @param maskPath mask dataset (non-zero = inside, same spatial shape) or {@code ""} for none
 * @param outputRoot the container the label dataset is written to
 * @param labelsPath the UINT64 label dataset: provisional ids after the partition stage, final
 *     ids after the relabel stage
 * @param grid the block grid; its chunk shape is the label dataset's chunk shape
 * @param offsets one per affinity channel, memory order
 * @param partition the partition configuration, validated against the offsets
 */
public record StitchingSetup(String inputRoot, String affinitiesPath, String maskPath,
    String outputRoot, String labelsPath, BlockGrid grid, Offsets offsets,
    PartitionConfig partition) implements Serializable {
  /** The partition method of a configuration that names none. */
  public static final String DEFAULT_METHOD = PartitionMethod.robustDefault().jsonName();
  private static final ObjectMapper JSON = new ObjectMapper();

  /** A setup; validates the partition configuration against the offsets. */
  public static StitchingSetup of(Path inputRoot, String affinitiesPath, String maskPathOrEmpty,
      Path outputRoot, String labelsPath, BlockGrid grid, Offsets offsets,
      PartitionConfig partition) {
    partition.validate(offsets);
    offsets.requireDimension(grid.numDimensions(), "offsets");
    return new StitchingSetup(inputRoot.toString(), affinitiesPath, maskPathOrEmpty,
        outputRoot.toString(), labelsPath, grid, offsets, partition);
  }

  /**
   * The setup of a run from its configuration's values: {@code offsets} one per channel in
   * memory order, {@code partitionSection} the configuration's {@code "partition"} section,
   * resolved and validated here (see {@link PartitionSection}) against the input's voxel size
   * (slowest axis first, or null when unknown).
   *
   * @throws SunderException INVALID_CONFIG naming the key at fault
   */
  public static StitchingSetup resolve(Path inputRoot, String affinitiesPath,
      String maskPathOrEmpty, Path outputRoot, String labelsPath, BlockGrid grid, int[][] offsets,
      JsonNode partitionSection, double[] voxelSizeSlowestFirst) {
    Offsets vectors = new Offsets(offsets);
    return of(inputRoot, affinitiesPath, maskPathOrEmpty, outputRoot, labelsPath, grid, vectors,
        PartitionSection.resolve(partitionSection, voxelSizeSlowestFirst, vectors));
  }

  /** One offset vector per affinity channel, memory order. */
  public int[][] offsetVectors() {
    return offsets.vectors();
  }

  /** The longest of {@code offsets} (memory order) along each axis: the default halo. */
  public static int[] longestOffsets(int[][] offsets) {
    return new Offsets(offsets).reach();
  }

  /**
   * The partition configuration with every default written out, as JSON: what a run records
   * and fingerprints, so two configurations that mean the same partition give the same text.
   */
  public JsonNode partitionJson() {
    return JSON.valueToTree(partition);
  }

  /** The same run writing its labels to {@code otherLabelsPath} in the output container. */
  public StitchingSetup withLabels(String otherLabelsPath) {
    return new StitchingSetup(inputRoot, affinitiesPath, maskPath, outputRoot, otherLabelsPath,
        grid, offsets, partition);
  }

  /** The provisional/final id layout of this grid. */
  public IdLayout idLayout() {
    return IdLayout.forGrid(grid);
  }

  public boolean hasMask() {
    return !maskPath.isEmpty();
  }

  /** The mask dataset in the input container, if the run has one. */
  public Optional<String> mask() {
    return hasMask() ? Optional.of(maskPath) : Optional.empty();
  }

  public Container openInput() {
    return Container.open(Path.of(inputRoot));
  }

  public Container openOutput() {
    return Container.open(Path.of(outputRoot));
  }

  public Dataset openLabels() {
    return openOutput().openDataset(labelsPath);
  }

  /**
   * Whether the run records where pieces continue across faces: for the fragment methods, whose
   * blocks give back the fragments of clusters they could not settle, so that the solve can
   * first rejoin the halves of a fragment that a face cut (see {@link SeamEdges#continued()}).
   */
  public boolean tracksContinuations() {
    return partition.method().usesFragments();
  }

  /**
   * The UINT8 dataset beside the labels, {@code <labels>-continuations}, that the partition
   * stage writes and the seam stage reads when {@link #tracksContinuations()}: per voxel, the
   * block sides across which its piece continues (bit {@code 2 * axis + upper}; non-zero only
   * in a core's outermost layers).
   */
  public String continuationsPath() {
    return labelsPath + "-continuations";
  }

  public Dataset openContinuations() {
    return openOutput().openDataset(continuationsPath());
  }

  /**
   * The one preparation step of a run, in-process or on Spark: {@link #validateInputs()}, then
   * {@link #createLabels()}.
   */
  public void prepare() {
    validateInputs();
    createLabels();
  }

  /**
   * Checks the input datasets against the grid and offsets, before anything is written: the
   * affinities' shape (the volume plus one channel per offset) and data type (FLOAT32 or UINT8),
   * the mask's shape and data type (UINT8). Shapes in messages are slowest axis first.
   *
   * @throws SunderException INVALID_INPUT naming the dataset and what was expected
   */
  public void validateInputs() {
    Container input = openInput();
    Dataset affinities = input.openDataset(affinitiesPath);
    long[] shape = affinities.shape();
    long[] volume = grid.volumeShape();
    int n = volume.length;
    if (shape.length != n + 1 || !Arrays.equals(Arrays.copyOf(shape, n), volume)
        || shape[n] != offsets.count()) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "affinities '" + affinitiesPath
          + "' in " + inputRoot + " have shape " + slowestFirst(shape) + " (slowest axis first);"
          + " expected " + offsets.count() + " channels (one per offset) and the volume "
          + slowestFirst(volume));
    }
    if (affinities.dataType() != DataType.FLOAT32 && affinities.dataType() != DataType.UINT8) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "affinities '" + affinitiesPath
          + "' are " + affinities.dataType() + "; expected FLOAT32 or UINT8");
    }
    if (hasMask()) {
      Dataset mask = input.openDataset(maskPath);
      if (!Arrays.equals(mask.shape(), volume)) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "mask '" + maskPath + "' has shape "
            + slowestFirst(mask.shape()) + "; expected the volume's " + slowestFirst(volume)
            + " (slowest axis first)");
      }
      if (mask.dataType() != DataType.UINT8) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "mask '" + maskPath + "' is "
            + mask.dataType() + "; expected UINT8 (1 = inside)");
      }
    }
  }

  private static String slowestFirst(long[] memoryOrder) {
    long[] reversed = new long[memoryOrder.length];
    for (int d = 0; d < reversed.length; d++) {
      reversed[d] = memoryOrder[memoryOrder.length - 1 - d];
    }
    return Arrays.toString(reversed);
  }

  /**
   * Creates the label dataset (UINT64, the grid's volume and chunk shape), or opens it if it
   * exists with exactly that shape, chunk shape and type (a resumed run).
   *
   * @throws SunderException CONFLICT if a dataset of another shape or type is in the way
   */
  public Dataset createLabels() {
    if (tracksContinuations()) {
      createContinuations();
    }
    return create(labelsPath, DataType.UINT64, "label dataset");
  }

  /**
   * Creates (or opens, as {@link #createLabels()} does) the continuation dataset
   * ({@link #continuationsPath()}); {@link #createLabels()} calls it when the run tracks
   * continuations.
   *
   * @throws SunderException CONFLICT if a dataset of another shape or type is in the way
   */
  public Dataset createContinuations() {
    return create(continuationsPath(), DataType.UINT8, "continuation dataset");
  }

  private Dataset create(String path, DataType type, String what) {
    Container output = openOutput();
    DatasetSpec spec = DatasetSpec.of(grid.volumeShape(), grid.chunkShape(), type);
    if (output.datasetExists(path)) {
      Dataset existing = output.openDataset(path);
      if (!Arrays.equals(existing.shape(), spec.shape())
          || !Arrays.equals(existing.chunkShape(), spec.chunkShape())
          || existing.dataType() != type) {
        throw new SunderException(ErrorKind.CONFLICT, what + " '" + path + "' in "
            + outputRoot + " exists with shape " + Arrays.toString(existing.shape())
            + ", chunks " + Arrays.toString(existing.chunkShape()) + ", " + existing.dataType()
            + "; expected " + Arrays.toString(spec.shape()) + ", "
            + Arrays.toString(spec.chunkShape()) + ", " + type);
      }
      return existing;
    }
    return output.createDataset(path, spec);
  }
}
