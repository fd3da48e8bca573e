package org.sunder.stitching.bench;

import static org.sunder.stitching.bench.BlockwiseRuns.AFFINITIES;
import static org.sunder.stitching.bench.BlockwiseRuns.cpuNanos;
import static org.sunder.stitching.bench.BlockwiseRuns.read;
import static org.sunder.stitching.bench.BlockwiseRuns.runStages;
import static org.sunder.stitching.bench.BlockwiseRuns.score;
import static org.sunder.stitching.bench.BlockwiseRuns.toInts;
import static org.sunder.stitching.bench.BlockwiseRuns.wholeVolume;
import static org.sunder.stitching.bench.BlockwiseRuns.writeAffinities;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * Blockwise against whole-volume partitioning on a synthetic tissue volume, for the Mutex
 * Watershed and mean-linkage agglomeration with 8 and 27 blocks: CPU time of all tasks over the
 * whole-volume run's (both reading affinities from and writing labels to the same Zarr
 * container; affinities in blosc-lz4 chunks), reduced-graph size over the voxel count, and
 * scores (variation of information, adapted Rand error) against ground truth and against the
 * whole-volume result, beside the naive halo-overlap join ({@link HaloOverlapJoin}).
 * Everything runs on one thread.
 *
 * <p>Arguments (optional): {@code x y z} volume shape (default 192 192 48), seed (11),
 * degradation: {@code mild} (default: the synth package's moderate mix without corrupted
 * slices), {@code moderate} or {@code none}; halo as a multiple of the longest offset per axis
 * (default 1); methods, comma-separated ({@code mutex-watershed,mean}, the default).
 */
public final class StitchingBenchmark {
  private static final int[] CHUNK = {32, 32, 8};
  private static final int[][] OFFSETS = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {-3, 0, 0},
      {0, -3, 0}, {0, 0, -2}, {-9, 0, 0}, {0, -9, 0}, {-4, -4, 0}};

  private StitchingBenchmark() {}

  public static void main(String[] args) throws IOException {
    long[] shape = args.length >= 3
        ? new long[] {Long.parseLong(args[0]), Long.parseLong(args[1]), Long.parseLong(args[2])}
        : new long[] {192, 192, 48};
    long seed = args.length >= 4 ? Long.parseLong(args[3]) : 11;
    long voxels = shape[0] * shape[1] * shape[2];
    double scale = voxels / (64.0 * 56 * 20);
    SynthSpec spec = SynthSpec.small(seed).withShape(shape)
        .withCounts((int) (30 * scale / 3), (int) Math.max(4, 4 * scale / 3),
            (int) Math.max(1, scale / 6));
    SyntheticVolume volume = SyntheticVolume.generate(spec);
    long[] truth = volume.labels();
    float[] exact = ExactAffinities.compute(truth, shape, OFFSETS);
    String preset = args.length >= 5 ? args[4] : "mild";
    int haloFactor = args.length >= 6 ? Integer.parseInt(args[5]) : 1;
    Degradation degradation = switch (preset) {
      case "moderate" -> Degradation.moderate(seed);
      case "none" -> Degradation.none();
      default -> new Degradation(seed, 0.7, 0.08, 0.01, 0.0005, 0);
    };
    float[] affinities = degradation.apply(truth, shape, spec.voxelSize(), OFFSETS, exact);
    Path root = Files.createTempDirectory("sunder-stitching-bench");
    writeAffinities(root, shape, CHUNK, OFFSETS.length, affinities);
    System.out.printf(Locale.ROOT, "volume %d x %d x %d (x y z) = %d voxels, %d objects,"
        + " %d offsets, degradation %s, chunks %d x %d x %d, halo %d x longest offset%n",
        shape[0], shape[1], shape[2], voxels, volume.objectCount(), OFFSETS.length, degradation,
        CHUNK[0], CHUNK[1], CHUNK[2], haloFactor);
    Offsets offsets = Offsets.of(OFFSETS);
    List<String> rows = new ArrayList<>();
    PartitionConfig[] configs = {PartitionConfig.mutexWatershed(null, null),
        PartitionConfig.agglomeration(Linkage.MEAN, false, null, null)};
    String[] names = {"mutex-watershed", "mean"};
    List<String> chosen = List.of((args.length >= 7 ? args[6] : String.join(",", names))
        .split(","));
    for (int m = 0; m < configs.length; m++) {
      PartitionConfig config = configs[m];
      if (!chosen.contains(names[m])) {
        continue;
      }
      long start = cpuNanos();
      long[] whole = wholeVolume(root, shape, CHUNK, offsets, config, "whole-" + names[m]);
      double wholeSeconds = (cpuNanos() - start) / 1e9;
      SegmentationScores wholeVsTruth = score(truth, whole, true);
      rows.add(String.format(Locale.ROOT, "%-16s %6s %8.2f %8s %9s %9s %7.4f %7.4f %9s %9s",
          names[m], "whole", wholeSeconds, "-", "-", "-", wholeVsTruth.voi(),
          wholeVsTruth.adaptedRandError(), "-", "-"));
      for (int g : new int[] {2, 3}) {
        int[] block = BlockwiseRuns.blockShape(shape, CHUNK, g);
        int[] halo = BlockwiseRuns.halo(OFFSETS, haloFactor);
        BlockGrid grid = BlockGrid.of(shape, CHUNK, block, halo);
        String labels = "blockwise-" + names[m] + "-" + grid.blockCount();
        StitchingSetup setup = StitchingSetup.of(root, AFFINITIES, "", root, labels, grid,
            offsets, config);
        BlockwiseRuns.Stages stages = runStages(setup);
        long[] blockwise = read(setup.openLabels(), shape);
        SegmentationScores vsTruth = score(truth, blockwise, true);
        SegmentationScores vsWhole = score(whole, blockwise, false);
        long naiveStart = cpuNanos();
        long[] naive = HaloOverlapJoin.run(grid, affinities, toInts(shape), offsets,
            config.create());
        double naiveSeconds = (cpuNanos() - naiveStart) / 1e9;
        SegmentationScores naiveVsTruth = score(truth, naive, true);
        SegmentationScores naiveVsWhole = score(whole, naive, false);
        double total = stages.total();
        System.out.printf(Locale.ROOT, "%s, %d blocks %s halo %s: CPU partition %.2f s, seams"
            + " %.2f s, solve %.3f s, relabel %.2f s, total %.2f s = %.3f x whole (%.2f s);"
            + " reduced graph %d nodes (%.5f per voxel), %d edges (%.5f per voxel) of %d"
            + " segments%n", names[m], grid.blockCount(), java.util.Arrays.toString(block),
            java.util.Arrays.toString(halo), stages.partition(), stages.seams(), stages.solve(),
            stages.relabel(), total, total / wholeSeconds, wholeSeconds,
            stages.result().report().nodeCount(),
            stages.result().report().nodeCount() / (double) voxels,
            stages.result().report().edgeCount(),
            stages.result().report().edgeCount() / (double) voxels,
            stages.result().report().segmentCount());
        rows.add(String.format(Locale.ROOT, "%-16s %6d %8.2f %8.3f %9.4f %9.4f %7.4f %7.4f"
            + " %9.4f %9.4f", names[m], grid.blockCount(), total, total / wholeSeconds,
            vsWhole.voi(), vsWhole.adaptedRandError(), vsTruth.voi(),
            vsTruth.adaptedRandError(), relative(vsTruth.voi(), wholeVsTruth.voi()),
            relative(vsTruth.adaptedRandError(), wholeVsTruth.adaptedRandError())));
        rows.add(String.format(Locale.ROOT, "%-16s %6d %8.2f %8s %9.4f %9.4f %7.4f %7.4f"
            + " %9.4f %9.4f", "  naive overlap", grid.blockCount(), naiveSeconds, "-",
            naiveVsWhole.voi(), naiveVsWhole.adaptedRandError(), naiveVsTruth.voi(),
            naiveVsTruth.adaptedRandError(), relative(naiveVsTruth.voi(), wholeVsTruth.voi()),
            relative(naiveVsTruth.adaptedRandError(), wholeVsTruth.adaptedRandError())));
      }
    }
    System.out.println();
    System.out.printf(Locale.ROOT, "%-16s %6s %8s %8s %9s %9s %7s %7s %9s %9s%n", "method",
        "blocks", "cpu s", "/whole", "VOI~whole", "ARE~whole", "VOI~GT", "ARE~GT", "dVOI~GT",
        "dARE~GT");
    rows.forEach(System.out::println);
    System.out.println("VOI in bits; ARE = adapted Rand error; ~whole: against the whole-volume"
        + " result; ~GT: against ground truth; dX~GT: (blockwise - whole) / whole");
  }

  private static double relative(double value, double base) {
    return base == 0 ? (value == 0 ? 0 : Double.POSITIVE_INFINITY) : (value - base) / base;
  }
}
