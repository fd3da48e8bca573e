package org.sunder.stitching.bench;

import static org.sunder.stitching.bench.BlockwiseRuns.AFFINITIES;
import static org.sunder.stitching.bench.BlockwiseRuns.cpuNanos;
import static org.sunder.stitching.bench.BlockwiseRuns.read;
import static org.sunder.stitching.bench.BlockwiseRuns.runStages;
import static org.sunder.stitching.bench.BlockwiseRuns.score;
import static org.sunder.stitching.bench.BlockwiseRuns.toInts;
import static org.sunder.stitching.bench.BlockwiseRuns.toLongs;
import static org.sunder.stitching.bench.BlockwiseRuns.wholeVolume;
import static org.sunder.stitching.bench.BlockwiseRuns.writeAffinities;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.SortedSet;
import java.util.TreeSet;
import java.util.function.ToDoubleFunction;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.config.FragmentsAgglomerationMethod;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BaselineWatershed;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The quality benchmark: for every chosen partition method, each realistic tissue kind
 * ({@link TissuePreset}) and several seeds, the whole-volume run and blockwise runs of 8 and 27
 * blocks, scored against ground truth beside the naive watershed ({@link BaselineWatershed}) on
 * the same affinities. Everything runs on one thread; CPU seconds are this thread's CPU time.
 *
 * <p>Per case (printed as it finishes): adapted Rand error (ARE) and variation of information
 * (VOI, split + merge, bits) against ground truth (ground-truth background not evaluated,
 * {@code ScoreOptions.DEFAULT}); segments against ground-truth objects (both counted among
 * evaluated voxels); for blockwise runs the seam audit ({@link SeamAudit}: objects cut at block
 * faces against objects cut at as many control planes half a block away, and beside them the
 * objects the method's whole-volume result cuts at the same face planes: what the planes cut
 * with no block at all) and the VOI between
 * the blockwise and the whole-volume result of the same method; CPU seconds (whole volume:
 * read affinities, partition, write labels; blockwise: all four stages, same container).
 *
 * <p>The naive watershed runs on the whole volume (no seams: its best case), at every threshold
 * of {@link #TUNING_THRESHOLDS}. It is reported two ways: at the fixed threshold
 * {@value #FIXED_THRESHOLD} (its mean-based boundary map reads 1/3 across a face in 3D, so at
 * 0.5 it merges touching objects), and tuned: per volume, the threshold with the lowest ARE, an
 * oracle choice and so the strongest fair yardstick; its VOI is the VOI at that threshold. The
 * targets are judged against the tuned baseline.
 *
 * <p>Summary, per tissue kind and averaged over seeds, for each method given (the default
 * first) at the largest block count given: its figures, both baselines', and
 * the targets: ARE at most 1/3 of the tuned baseline's, VOI at most 1/2 of it, objects cut at
 * faces at most the control + {@value SeamAudit#OBJECT_TOLERANCE}, blockwise against whole at
 * most {@value #MAX_VOI_VS_WHOLE} bits, segments between 1/2 and 2 times the objects. Ratios are
 * of the means over seeds. Printed as text and as Markdown.
 *
 * <p>Arguments (all optional, positional): {@code x y z} shape (default
 * {@code TissuePreset.STANDARD_SHAPE}: 256 256 96), seeds
 * (comma-separated, default 1,2,3), methods (comma-separated from {@code default},
 * {@code fragments-agglomeration}, {@code mutex-watershed}, {@code mean}, or the path of a file
 * ending {@code .json} that holds a {@code "partition"} section to measure; default
 * {@code default}: the Mutex Watershed and voxel-level mean agglomeration take tens of seconds
 * to minutes per 6 M voxels), block counts (comma-separated cubes, default 1,8,27; 1 = the
 * whole volume, which is always run since the blockwise runs are compared with it), the halo
 * as a multiple of the longest offset per axis (default 1, what a run uses). Blocks are
 * {@code ceil(shape / n)} rounded up to whole chunks ({@link BlockwiseRuns#blockShape}), so a
 * short axis can hold fewer than {@code n} blocks; each line prints the grid actually used.
 * {@code -Dpresets=dense-neurites,...} measures only the named tissue kinds (default: all).
 */
public final class QualityBenchmark {
  /** Chunks of the affinity and label datasets, memory order. */
  private static final int[] CHUNK = {32, 32, 8};
  /** Thresholds the naive watershed is run at; the tuned baseline is the best of them. */
  private static final double[] TUNING_THRESHOLDS = {0.1, 0.15, 0.2, 0.3, 0.5};
  /** The naive watershed's documented fixed threshold. */
  private static final double FIXED_THRESHOLD = 0.2;
  /** Target: ARE at most this share of the tuned baseline's. */
  private static final double ARE_RATIO_TARGET = 1.0 / 3;
  /** Target: VOI at most this share of the tuned baseline's. */
  private static final double VOI_RATIO_TARGET = 0.5;
  /** Target: VOI between blockwise and whole-volume result, bits. */
  private static final double MAX_VOI_VS_WHOLE = 0.02;
  /** Target: segments within this factor of the objects, either way. */
  private static final double SEGMENT_FACTOR = 2;
  private static final List<String> METHODS =
      List.of("default", "fragments-agglomeration", "mutex-watershed", "mean");

  private QualityBenchmark() {}

  /**
   * One run of a method: {@code requestedBlocks} 1 for the whole volume (no audit, no VOI
   * against it); {@code actualBlocks} may be fewer when an axis is short (see
   * {@link BlockwiseRuns#blockShape}).
   */
  private record Run(TissuePreset preset, long seed, String method, int requestedBlocks,
      int actualBlocks, SegmentationScores scores, SeamAudit audit, long wholeCutAtFaces,
      double voiVsWhole, double cpuSeconds) {}

  /** The naive watershed at its fixed threshold and tuned, on one volume. */
  private record Baselines(TissuePreset preset, long seed, SegmentationScores fixed,
      double tunedThreshold, SegmentationScores tuned) {}

  public static void main(String[] args) throws IOException {
    long[] shape = args.length >= 3 ? new long[] {Long.parseLong(args[0]),
        Long.parseLong(args[1]), Long.parseLong(args[2])} : TissuePreset.STANDARD_SHAPE.clone();
    long[] seeds = Arrays.stream((args.length >= 4 ? args[3] : "1,2,3").split(","))
        .mapToLong(Long::parseLong).toArray();
    List<String> methods = List.of((args.length >= 5 ? args[4] : "default").split(","));
    for (String m : methods) {
      if (!METHODS.contains(m) && !m.endsWith(".json")) {
        throw new SunderException(ErrorKind.INVALID_CONFIG, "method \"" + m
            + "\": unknown; expected a comma-separated list from " + METHODS);
      }
    }
    int[] blockCounts = Arrays.stream((args.length >= 6 ? args[5] : "1,8,27").split(","))
        .mapToInt(Integer::parseInt).sorted().distinct().toArray();
    int[] perAxis = new int[blockCounts.length];
    for (int i = 0; i < blockCounts.length; i++) {
      perAxis[i] = (int) Math.round(Math.cbrt(blockCounts[i]));
      if (blockCounts[i] < 1 || perAxis[i] * perAxis[i] * perAxis[i] != blockCounts[i]) {
        throw new SunderException(ErrorKind.INVALID_CONFIG, "block count " + blockCounts[i]
            + ": expected a cube (1, 8, 27, 64, ...): blocks per axis, cubed");
      }
    }
    Offsets offsets = TissuePreset.offsets();
    int[][] vectors = offsets.vectors();
    int haloFactor = args.length >= 7 ? Integer.parseInt(args[6]) : 1;
    int[] halo = BlockwiseRuns.halo(vectors, haloFactor);
    System.out.printf(Locale.ROOT, "quality benchmark: volume %d x %d x %d (x y z), seeds %s,"
        + " methods %s, block counts %s, chunks %s, halo %s (" + haloFactor
        + " x the longest offset per axis),"
        + " %d offsets; one thread%n", shape[0], shape[1], shape[2], Arrays.toString(seeds),
        methods, Arrays.toString(blockCounts), Arrays.toString(CHUNK), Arrays.toString(halo),
        vectors.length);

    List<Run> runs = new ArrayList<>();
    List<Baselines> baselines = new ArrayList<>();
    String presets = System.getProperty("presets");
    for (TissuePreset preset : TissuePreset.values()) {
      if (presets != null && !List.of(presets.split(",")).contains(preset.presetName())) {
        continue;
      }
      for (long seed : seeds) {
        long t0 = cpuNanos();
        SyntheticVolume volume = preset.volume(seed, shape);
        float[] affinities = preset.affinities(volume, seed);
        long[] truth = volume.labels();
        double[] voxelSize = volume.spec().voxelSize();
        System.out.printf(Locale.ROOT, "%n%s seed %d: voxels %s nm, generated in %.1f s%n",
            preset.presetName(), seed, Arrays.toString(voxelSize), (cpuNanos() - t0) / 1e9);
        baselines.add(baselines(preset, seed, truth, affinities, shape, offsets));
        Path root = Files.createTempDirectory("sunder-quality-bench");
        try {
          writeAffinities(root, shape, CHUNK, vectors.length, affinities);
          for (String method : methods) {
            PartitionConfig config = config(method, voxelSize);
            long start = cpuNanos();
            long[] whole = wholeVolume(root, shape, CHUNK, offsets, config, "whole-" + method);
            Run wholeRun = new Run(preset, seed, method, 1, 1, score(truth, whole, true), null,
                -1, Double.NaN, (cpuNanos() - start) / 1e9);
            runs.add(wholeRun);
            print(wholeRun, null);
            for (int i = 0; i < blockCounts.length; i++) {
              if (blockCounts[i] == 1) {
                continue;
              }
              int[] block = BlockwiseRuns.blockShape(shape, CHUNK, perAxis[i]);
              BlockGrid grid = BlockGrid.of(shape, CHUNK, block, halo);
              StitchingSetup setup = StitchingSetup.of(root, AFFINITIES, "", root,
                  "blockwise-" + method + "-" + blockCounts[i], grid, offsets, config);
              BlockwiseRuns.Stages stages = runStages(setup);
              long[] labels = read(setup.openLabels(), shape);
              Run run = new Run(preset, seed, method, blockCounts[i], grid.blockCount(),
                  score(truth, labels, true), SeamAudit.of(truth, labels, shape, block),
                  SeamAudit.of(truth, whole, shape, block).objectsCutAtFaces(),
                  score(whole, labels, false).voi(), stages.total());
              runs.add(run);
              print(run, grid);
            }
          }
        } finally {
          BlockwiseRuns.deleteTree(root);
        }
      }
    }
    List<String> summarised = new ArrayList<>(methods);
    if (summarised.remove("default")) {
      summarised.add(0, "default");
    }
    for (String method : summarised) {
      summary(runs, baselines, method, blockCounts[blockCounts.length - 1], seeds.length);
    }
  }

  /** The configuration a method name stands for; fragments fitted to the voxel size. */
  private static PartitionConfig config(String method, double[] voxelSize) {
    return switch (method) {
      case "default" -> PartitionConfig.robustDefault(voxelSize);
      case "fragments-agglomeration" -> new PartitionConfig(
          new FragmentsAgglomerationMethod(), null, null, null, null, null,
          FragmentOptions.fittedTo(voxelSize), null);
      case "mutex-watershed" -> PartitionConfig.fromJson("{\"method\":\"mutex-watershed\"}");
      case "mean" ->
          PartitionConfig.fromJson("{\"method\":\"agglomeration\",\"linkage\":\"mean\"}");
      default -> {
        if (!method.endsWith(".json")) {
          throw new SunderException(ErrorKind.INVALID_CONFIG, "method \"" + method
              + "\": unknown; expected one of " + METHODS + " or a .json partition section");
        }
        try {
          yield PartitionConfig.fromJson(Files.readString(Path.of(method)));
        } catch (IOException e) {
          throw new UncheckedIOException(e);
        }
      }
    };
  }

  /** Runs the naive watershed on the whole volume at every tuning threshold; prints each. */
  private static Baselines baselines(TissuePreset preset, long seed, long[] truth,
      float[] affinities, long[] shape, Offsets offsets) {
    AffinityBlock block = AffinityBlock.ofFloats(affinities, toInts(shape), new long[3],
        offsets, null);
    SegmentationScores fixed = null;
    SegmentationScores tuned = null;
    double tunedThreshold = Double.NaN;
    for (double threshold : TUNING_THRESHOLDS) {
      long start = cpuNanos();
      long[] labels = toLongs(new BaselineWatershed(threshold).partition(block).labels());
      double seconds = (cpuNanos() - start) / 1e9;
      SegmentationScores scores = score(truth, labels, true);
      System.out.printf(Locale.ROOT, "  %-24s %5s  %s%n", "naive " + threshold, "whole",
          figures(scores, null, seconds));
      if (threshold == FIXED_THRESHOLD) {
        fixed = scores;
      }
      if (tuned == null || scores.adaptedRandError() < tuned.adaptedRandError()) {
        tuned = scores;
        tunedThreshold = threshold;
      }
    }
    System.out.printf(Locale.ROOT, "  naive tuned: threshold %s (lowest ARE)%n", tunedThreshold);
    return new Baselines(preset, seed, fixed, tunedThreshold, tuned);
  }

  private static void print(Run run, BlockGrid grid) {
    String blocks = grid == null ? "whole" : String.valueOf(run.requestedBlocks);
    String layout = grid == null ? ""
        : String.format(Locale.ROOT, "; grid %s of %s = %d blocks",
            Arrays.toString(grid.gridShape()), Arrays.toString(grid.blockShape()),
            grid.blockCount());
    System.out.printf(Locale.ROOT, "  %-24s %5s  %s%s%n", run.method, blocks,
        figures(run.scores, run, run.cpuSeconds), layout);
  }

  /** The scores, and a blockwise run's seam audit and distance to the whole-volume result. */
  private static String figures(SegmentationScores s, Run blockwiseOrNull, double seconds) {
    Run r = blockwiseOrNull;
    String seams = r == null || r.audit == null ? "" : String.format(Locale.ROOT,
        "  cut at faces %d (control %d, whole-volume result %d), ~whole %.4f bits",
        r.audit.objectsCutAtFaces(), r.audit.objectsCutAtControl(), r.wholeCutAtFaces,
        r.voiVsWhole);
    return String.format(Locale.ROOT, "ARE %.4f  VOI %.4f (split %.4f merge %.4f)  segments %d"
        + " / objects %d%s  CPU %.2f s", s.adaptedRandError(), s.voi(), s.voiSplit(),
        s.voiMerge(), s.segmentCount(), s.groundTruthObjectCount(), seams, seconds);
  }

  /** Means over seeds per tissue kind; the targets against the tuned baseline. */
  private static void summary(List<Run> runs, List<Baselines> baselines, String method,
      int blocks, int seedCount) {
    String[] header = {"tissue", "ARE", "naive " + FIXED_THRESHOLD + " ARE", "tuned ARE",
        "ARE / tuned", "VOI", "naive " + FIXED_THRESHOLD + " VOI", "tuned VOI", "VOI / tuned",
        "cut faces", "control", "whole-volume result", "~whole bits", "segments", "objects",
        "seg / obj", "targets"};
    List<String[]> rows = new ArrayList<>();
    List<String[]> targets = new ArrayList<>();
    SortedSet<Integer> actual = new TreeSet<>();
    List<String> verdicts = new ArrayList<>();
    for (TissuePreset preset : TissuePreset.values()) {
      List<Run> mine = runs.stream().filter(r -> r.preset == preset && r.method.equals(method)
          && r.requestedBlocks == blocks).toList();
      List<Baselines> base = baselines.stream().filter(b -> b.preset == preset).toList();
      if (mine.isEmpty()) {
        continue;
      }
      actual.addAll(mine.stream().map(r -> r.actualBlocks).toList());
      double are = mean(mine, r -> r.scores.adaptedRandError());
      double voi = mean(mine, r -> r.scores.voi());
      double fixedAre = mean(base, b -> b.fixed.adaptedRandError());
      double fixedVoi = mean(base, b -> b.fixed.voi());
      double tunedAre = mean(base, b -> b.tuned.adaptedRandError());
      double tunedVoi = mean(base, b -> b.tuned.voi());
      double segments = mean(mine, r -> r.scores.segmentCount());
      double objects = mean(mine, r -> r.scores.groundTruthObjectCount());
      boolean blockwise = blocks > 1;
      double cut = blockwise ? mean(mine, r -> r.audit.objectsCutAtFaces()) : Double.NaN;
      double control = blockwise ? mean(mine, r -> r.audit.objectsCutAtControl()) : Double.NaN;
      double wholeCut = blockwise ? mean(mine, r -> r.wholeCutAtFaces) : Double.NaN;
      double vsWhole = blockwise ? mean(mine, r -> r.voiVsWhole) : Double.NaN;
      double areRatio = are / tunedAre;
      double voiRatio = voi / tunedVoi;
      double segmentRatio = segments / objects;
      String[] marks = {
          mark("ARE <= 1/3 tuned", areRatio <= ARE_RATIO_TARGET),
          mark("VOI <= 1/2 tuned", voiRatio <= VOI_RATIO_TARGET),
          blockwise ? mark("cut <= control + " + SeamAudit.OBJECT_TOLERANCE,
              cut <= control + SeamAudit.OBJECT_TOLERANCE) : "cut n/a (whole volume)",
          blockwise ? mark("~whole <= " + MAX_VOI_VS_WHOLE, vsWhole <= MAX_VOI_VS_WHOLE)
              : "~whole n/a (whole volume)",
          mark("segments within " + (int) SEGMENT_FACTOR + "x",
              segmentRatio <= SEGMENT_FACTOR && segmentRatio >= 1 / SEGMENT_FACTOR)};
      targets.add(marks);
      long passed = Arrays.stream(marks).filter(m -> m.startsWith("PASS")).count();
      rows.add(new String[] {preset.presetName(), f4(are), f4(fixedAre), f4(tunedAre),
          f3(areRatio), f4(voi), f4(fixedVoi), f4(tunedVoi), f3(voiRatio), f1(cut), f1(control),
          f1(wholeCut), f4(vsWhole), f1(segments), f1(objects), f3(segmentRatio),
          passed + "/" + marks.length});
      verdicts.add(preset.presetName() + ": " + String.join("; ", marks)
          + String.format(Locale.ROOT, "  (tuned thresholds %s; ARE / naive %s: %.3f,"
              + " VOI / naive %s: %.3f)", base.stream().map(b -> String.valueOf(
                  b.tunedThreshold)).toList(), FIXED_THRESHOLD, are / fixedAre,
              FIXED_THRESHOLD, voi / fixedVoi));
    }
    System.out.printf(Locale.ROOT, "%nsummary: method %s, %s, mean over %d seeds; naive"
        + " watershed on the whole volume at threshold %s and tuned (lowest ARE of %s per"
        + " volume); VOI in bits%n", method, blocks == 1 ? "whole volume"
            : blocks + " blocks requested (grids of " + actual + " blocks)", seedCount,
        FIXED_THRESHOLD, Arrays.toString(TUNING_THRESHOLDS));
    int[] widths = new int[header.length];
    for (int c = 0; c < header.length; c++) {
      widths[c] = header[c].length();
      for (String[] row : rows) {
        widths[c] = Math.max(widths[c], row[c].length());
      }
    }
    System.out.println(textRow(header, widths));
    rows.forEach(row -> System.out.println(textRow(row, widths)));
    System.out.println();
    verdicts.forEach(System.out::println);
    System.out.println();
    System.out.println("Markdown:");
    System.out.println();
    System.out.println("| " + String.join(" | ", header) + " |");
    System.out.println("|" + "---|".repeat(header.length));
    for (int r = 0; r < rows.size(); r++) {
      String[] row = rows.get(r).clone();
      row[row.length - 1] = String.join("<br>", targets.get(r));
      System.out.println("| " + String.join(" | ", row) + " |");
    }
  }

  private static String mark(String target, boolean met) {
    return (met ? "PASS " : "MISS ") + target;
  }

  private static String textRow(String[] cells, int[] widths) {
    StringBuilder line = new StringBuilder();
    for (int c = 0; c < cells.length; c++) {
      line.append(c == 0 ? String.format("%-" + widths[c] + "s", cells[c])
          : String.format("  %" + widths[c] + "s", cells[c]));
    }
    return line.toString();
  }

  private static <T> double mean(List<T> items, ToDoubleFunction<T> value) {
    return items.stream().mapToDouble(value).average().orElse(Double.NaN);
  }

  private static String f1(double v) {
    return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.1f", v);
  }

  private static String f3(double v) {
    return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.3f", v);
  }

  private static String f4(double v) {
    return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.4f", v);
  }
}
