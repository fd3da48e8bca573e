package org.sunder.blockwise.synth;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import net.imglib2.img.array.ArrayImgs;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;

/**
 * One call that puts a synthetic scenario into a container: datasets {@value #GROUND_TRUTH}
 * (UINT64 labels) and {@value #AFFINITIES} (FLOAT32 or UINT8, memory dims {@code [x, y, z, c]},
 * channel last), with attributes
 *
 * <ul>
 *   <li>both: {@code "axes": "zyx"}, {@code "voxelSize"} (zyx, nm), {@code "unit": "nm"},
 *       {@code "synthetic"} (the {@link SynthSpec}, readable with {@link #readSpec});
 *   <li>{@value #AFFINITIES}: {@code "offsets"} (list of int lists, zyx), {@code "degradation"}
 *       ({@link Degradation}, readable with {@link #readDegradation}), {@code "encoding"}
 *       ({@code "probability"} or {@code "probability * 255"}), {@code "groundTruth"} (the
 *       ground-truth dataset's path);
 *   <li>{@value #GROUND_TRUTH}: {@code "objectCount"}.
 * </ul>
 *
 * <p>Everything is computed in memory first ({@code 8 + 4 * channels} bytes per voxel), and both
 * paths are checked to be free before the first byte is written. Deterministic: the same spec
 * and options give the same bytes.
 */
public final class SyntheticScenario {
  /** The ground-truth dataset's name inside the group. */
  public static final String GROUND_TRUTH = "ground-truth";
  /** The affinity dataset's name inside the group. */
  public static final String AFFINITIES = "affinities";

  /**
   * The default offsets, zyx: the three nearest neighbours, then long-range ones, shorter along
   * z (whose voxels are usually coarser).
   */
  private static final int[][] DEFAULT_OFFSETS_ZYX = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1},
      {-2, 0, 0}, {0, -3, 0}, {0, 0, -3}, {-3, 0, 0}, {0, -9, 0}, {0, 0, -9}};

  private SyntheticScenario() {}

  /** The written datasets, the volume they came from and what was used. */
  public record Written(Dataset groundTruth, Dataset affinities, SyntheticVolume volume,
      ScenarioOptions options) {}

  /**
   * The default offsets: zyx {@code [-1,0,0] [0,-1,0] [0,0,-1]} (nearest neighbours), then
   * {@code [-2,0,0] [0,-3,0] [0,0,-3] [-3,0,0] [0,-9,0] [0,0,-9]} (long-range).
   */
  public static Offsets defaultOffsets() {
    return Offsets.fromZyx(defaultOffsetsZyx());
  }

  /** The default offsets written slowest axis first (a fresh copy). */
  public static int[][] defaultOffsetsZyx() {
    int[][] copy = new int[DEFAULT_OFFSETS_ZYX.length][];
    for (int k = 0; k < copy.length; k++) {
      copy[k] = DEFAULT_OFFSETS_ZYX[k].clone();
    }
    return copy;
  }

  /** {@link SynthSpec#small} with seed 13 and {@link ScenarioOptions#defaults()}. */
  public static Written write(Container container) {
    return write(container, SynthSpec.small(13), ScenarioOptions.defaults());
  }

  /** A spec with the given offsets (zyx) and otherwise default options. */
  public static Written write(Container container, SynthSpec spec, int[][] offsetsZyx) {
    return write(container, spec,
        ScenarioOptions.defaults().withOffsets(Offsets.fromZyx(offsetsZyx)));
  }

  /**
   * Generates and writes a scenario.
   *
   * @throws StoreException {@link ErrorKind#CONFLICT} if either dataset exists already
   */
  public static Written write(Container container, SynthSpec spec, ScenarioOptions options) {
    return write(container, SyntheticVolume.generate(spec), options);
  }

  /**
   * Writes a scenario from a volume already built (e.g. a {@link TissuePreset}'s, which carves
   * an empty region after generation).
   *
   * @throws StoreException {@link ErrorKind#CONFLICT} if either dataset exists already
   */
  public static Written write(Container container, SyntheticVolume volume,
      ScenarioOptions options) {
    SynthSpec spec = volume.spec();
    String gtPath = join(options.group(), GROUND_TRUTH);
    String affPath = join(options.group(), AFFINITIES);
    for (String path : List.of(gtPath, affPath)) {
      if (container.datasetExists(path) || container.groupExists(path)) {
        throw new StoreException(ErrorKind.CONFLICT, "cannot write the synthetic scenario: '"
            + path + "' exists in " + container + "; expected a free path");
      }
    }
    long[] shape = volume.shape();
    int[][] offsets = options.offsets().vectors();
    float[] affinities = options.degradation().apply(volume.labels(), shape, spec.voxelSize(),
        offsets, ExactAffinities.compute(volume.labels(), shape, offsets));

    int[] chunk = clipped(options.chunkShape(), shape);
    Dataset gt = container.createDataset(gtPath, DatasetSpec.of(shape, chunk, DataType.UINT64));
    gt.write(ArrayImgs.unsignedLongs(volume.labels(), shape), new long[3]);
    long[] affShape = {shape[0], shape[1], shape[2], offsets.length};
    int[] affChunk = {chunk[0], chunk[1], chunk[2], offsets.length};
    Dataset aff = container.createDataset(affPath,
        DatasetSpec.of(affShape, affChunk, options.affinityType()));
    if (options.affinityType() == DataType.UINT8) {
      aff.write(ArrayImgs.unsignedBytes(ExactAffinities.toUint8(affinities), affShape),
          new long[4]);
    } else {
      aff.write(ArrayImgs.floats(affinities, affShape), new long[4]);
    }
    container.mergeAttributes(gtPath, groundTruthAttributes(volume));
    container.mergeAttributes(affPath, affinityAttributes(volume, options, gtPath));
    return new Written(gt, aff, volume, options);
  }

  /**
   * The spec recorded on a dataset written here.
   *
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} if it has none or it is malformed
   */
  public static SynthSpec readSpec(Container container, String datasetPath) {
    return SynthSpec.fromAttributes(section(container, datasetPath, "synthetic"));
  }

  /** The degradation recorded on an affinity dataset written here. */
  public static Degradation readDegradation(Container container, String affinitiesPath) {
    return Degradation.fromAttributes(section(container, affinitiesPath, "degradation"));
  }

  @SuppressWarnings("unchecked")
  private static Map<String, ?> section(Container container, String path, String key) {
    Object value = container.readAttributes(path).get(key);
    if (!(value instanceof Map<?, ?>)) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "dataset '" + path + "' in "
          + container + ": attribute \"" + key + "\" is missing or not an object; expected"
          + " what " + SyntheticScenario.class.getSimpleName() + " writes");
    }
    return (Map<String, ?>) value;
  }

  private static Map<String, Object> commonAttributes(SynthSpec spec) {
    Map<String, Object> m = new LinkedHashMap<>();
    double[] v = spec.voxelSize();
    m.put("axes", "zyx");
    m.put("voxelSize", List.of(v[2], v[1], v[0]));
    m.put("unit", "nm");
    m.put("synthetic", spec.toAttributes());
    return m;
  }

  private static Map<String, Object> groundTruthAttributes(SyntheticVolume volume) {
    Map<String, Object> m = commonAttributes(volume.spec());
    m.put("objectCount", volume.objectCount());
    return m;
  }

  private static Map<String, Object> affinityAttributes(SyntheticVolume volume,
      ScenarioOptions options, String gtPath) {
    Map<String, Object> m = commonAttributes(volume.spec());
    List<List<Integer>> offsets = new ArrayList<>();
    for (int[] zyx : options.offsets().toZyx()) {
      List<Integer> vector = new ArrayList<>();
      for (int c : zyx) {
        vector.add(c);
      }
      offsets.add(vector);
    }
    m.put("offsets", offsets);
    m.put("degradation", options.degradation().toAttributes());
    m.put("encoding", options.affinityType() == DataType.UINT8 ? "probability * 255"
        : "probability");
    m.put("groundTruth", gtPath);
    return m;
  }

  private static int[] clipped(int[] chunk, long[] shape) {
    int[] out = new int[3];
    for (int d = 0; d < 3; d++) {
      out[d] = (int) Math.min(chunk[d], shape[d]);
    }
    return out;
  }

  private static String join(String group, String name) {
    String g = group.replaceAll("^/+|/+$", "");
    return g.isEmpty() ? name : g + "/" + name;
  }
}
