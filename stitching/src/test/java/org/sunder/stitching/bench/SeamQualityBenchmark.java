package org.sunder.stitching.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImgs;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.config.PartitionMethod;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.store.codec.CodecSpec;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.stitching.InProcessRunner;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * Does each method stitch seamlessly on realistic predictions? For every chosen preset, seed
 * and method: the blockwise result against the same method run as one block over the whole
 * volume (variation of information, split and merge parts), both against ground truth, and the
 * blockwise result's {@link SeamAudit} (objects cut at block faces against objects cut at the
 * control planes half a block away; the one-block result's audit on the same planes beside it).
 * With {@code exact} the affinities are the exact ones, where blockwise must equal one block.
 *
 * <p>Arguments (all optional, in order): {@code x y z} volume shape, memory order (default
 * 128 128 48); blocks per axis (2); presets, comma-separated ({@code dense-neurites,
 * compact-cells}); seeds, comma-separated ({@code 1}); methods, comma-separated
 * ({@code fragments-agglomeration,fragments-multicut}); {@code exact} or {@code realistic}
 * (the default); the halo as a multiple of the longest offset per axis (1). Chunks are
 * 32 × 32 × 8.
 */
public final class SeamQualityBenchmark {
  private static final int[] CHUNK = {32, 32, 8};

  private SeamQualityBenchmark() {}

  public static void main(String[] args) throws Exception {
    long[] shape = args.length >= 3
        ? new long[] {Long.parseLong(args[0]), Long.parseLong(args[1]), Long.parseLong(args[2])}
        : new long[] {128, 128, 48};
    int perAxis = args.length >= 4 ? Integer.parseInt(args[3]) : 2;
    String[] presets = (args.length >= 5 ? args[4] : "dense-neurites,compact-cells").split(",");
    String[] seeds = (args.length >= 6 ? args[5] : "1").split(",");
    String[] methods = (args.length >= 7 ? args[6]
        : "fragments-agglomeration,fragments-multicut").split(",");
    boolean exact = args.length >= 8 && args[7].equals("exact");
    int haloFactor = args.length >= 9 ? Integer.parseInt(args[8]) : 1;
    Offsets offsets = TissuePreset.offsets();
    int[] block = new int[3];
    int[] halo = offsets.reach();
    for (int d = 0; d < 3; d++) {
      halo[d] *= haloFactor;
    }
    for (int d = 0; d < 3; d++) {
      int size = (int) ((shape[d] + perAxis - 1) / perAxis);
      block[d] = (size + CHUNK[d] - 1) / CHUNK[d] * CHUNK[d];
    }
    BlockGrid grid = BlockGrid.of(shape, CHUNK, block, halo);
    System.out.printf(Locale.ROOT, "volume %d x %d x %d (x y z), %d blocks of %d x %d x %d,"
        + " halo %d x %d x %d, %s affinities%n", shape[0], shape[1], shape[2],
        grid.blockCount(), block[0], block[1], block[2], halo[0], halo[1], halo[2],
        exact ? "exact" : "realistic");
    System.out.printf(Locale.ROOT, "%-20s %4s %-24s %8s %8s %8s %8s %8s %7s %7s %7s %7s%n",
        "preset", "seed", "method", "VOI~one", "split", "merge", "VOI~GT", "one~GT",
        "cut@F", "cut@C", "oneF", "oneC");
    List<String> rows = new ArrayList<>();
    for (String presetName : presets) {
      TissuePreset preset = TissuePreset.named(presetName);
      for (String seedText : seeds) {
        long seed = Long.parseLong(seedText);
        SyntheticVolume volume = preset.volume(seed, shape);
        long[] truth = volume.labels();
        float[] affinities = exact
            ? ExactAffinities.compute(truth, shape, offsets.vectors())
            : preset.affinities(volume, seed);
        Path root = Files.createTempDirectory("sunder-seam-bench");
        writeAffinities(root, shape, offsets, affinities);
        for (String methodName : methods) {
          PartitionConfig config = new PartitionConfig(PartitionMethod.fromName(
              methodName), null, null, null, null, null, null, null);
          long[] one = oneBlock(affinities, shape, offsets, config);
          StitchingSetup setup = StitchingSetup.of(root, "affinities", "", root,
              "blockwise-" + methodName, grid, offsets, config);
          InProcessRunner.run(setup);
          long[] blockwise = read(setup, shape);
          SegmentationScores vsOne = score(one, blockwise, false);
          SegmentationScores vsTruth = score(truth, blockwise, true);
          SegmentationScores oneVsTruth = score(truth, one, true);
          SeamAudit audit = SeamAudit.of(truth, blockwise, shape, block);
          SeamAudit oneAudit = SeamAudit.of(truth, one, shape, block);
          String row = String.format(Locale.ROOT,
              "%-20s %4d %-24s %8.4f %8.4f %8.4f %8.4f %8.4f %3d/%-3d %7d %7d %7d", presetName,
              seed, methodName, vsOne.voi(), vsOne.voiSplit(), vsOne.voiMerge(), vsTruth.voi(),
              oneVsTruth.voi(), audit.objectsCutAtFaces(), audit.objectsCrossingFaces(),
              audit.objectsCutAtControl(), oneAudit.objectsCutAtFaces(),
              oneAudit.objectsCutAtControl());
          System.out.println(row);
          rows.add(row);
        }
      }
    }
    System.out.println("VOI in bits; ~one: against the same method run as one block over the"
        + " whole volume; ~GT: against ground truth; cut@F objects cut at block faces / objects"
        + " crossing faces, cut@C at the control planes (SeamAudit); oneF, oneC: the one-block"
        + " result on the same planes");
  }

  private static long[] oneBlock(float[] affinities, long[] shape, Offsets offsets,
      PartitionConfig config) {
    int[] dims = {(int) shape[0], (int) shape[1], (int) shape[2]};
    int[] labels = config.create().partition(AffinityBlock.ofFloats(affinities, dims,
        new long[3], offsets, null)).labels();
    long[] out = new long[labels.length];
    for (int i = 0; i < labels.length; i++) {
      out[i] = labels[i];
    }
    return out;
  }

  private static void writeAffinities(Path root, long[] shape, Offsets offsets,
      float[] affinities) {
    Container container = Container.create(root, StorageFormat.ZARR);
    long[] dims = {shape[0], shape[1], shape[2], offsets.count()};
    int[] chunks = {CHUNK[0], CHUNK[1], CHUNK[2], offsets.count()};
    container.createDataset("affinities", DatasetSpec.of(dims, chunks, DataType.FLOAT32)
            .withCodec(CodecSpec.blosc("lz4", 5, 1)))
        .write(ArrayImgs.floats(affinities, dims), new long[4]);
  }

  private static long[] read(StitchingSetup setup, long[] shape) {
    long[] max = {shape[0] - 1, shape[1] - 1, shape[2] - 1};
    return ((LongArray) setup.openLabels().read(new FinalInterval(new long[3], max))
        .update(null)).getCurrentStorageArray();
  }

  private static SegmentationScores score(long[] reference, long[] labels, boolean truth) {
    ContingencyTable table = new ContingencyTable();
    table.add(reference, labels);
    return new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(truth)).score(table);
  }
}
