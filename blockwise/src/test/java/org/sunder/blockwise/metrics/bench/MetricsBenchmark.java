package org.sunder.blockwise.metrics.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Comparator;
import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import java.util.function.LongSupplier;
import net.imglib2.img.array.ArrayImgs;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.EvaluationRegion;
import org.sunder.blockwise.metrics.Evaluator;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ExactAffinities;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.blockwise.synth.SyntheticVolume;

/**
 * Prints the speed of scoring (voxels per second through the contingency table and the
 * scorer, in memory and from an N5 container) and of the synthetic generator (ground truth,
 * exact affinities, degradation), each the best of a few repetitions on one thread, beside
 * baselines measured in the same run: one pass summing the label arrays (memory speed) and a
 * boxed {@code HashMap} contingency count (the naive way). Each line gives wall time and the
 * measuring thread's CPU time (meaningful on a shared machine); the 2-thread evaluator line
 * gives wall time only.
 *
 * <p>Run: {@code java -cp <test classpath> org.sunder.blockwise.metrics.bench.MetricsBenchmark
 * [x y z]} (default 192 160 64 voxels).
 */
public final class MetricsBenchmark {
  private static final int REPEATS = 3;
  private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();
  private static double lastCpu;

  private MetricsBenchmark() {}

  public static void main(String[] args) throws IOException {
    long[] shape = args.length == 3
        ? new long[] {Long.parseLong(args[0]), Long.parseLong(args[1]), Long.parseLong(args[2])}
        : new long[] {192, 160, 64};
    long n = shape[0] * shape[1] * shape[2];
    SynthSpec spec = SynthSpec.small(7).scaledTo(shape);
    System.out.printf("volume %s (x y z) = %d voxels, %d fibres, %d cells, %d bodies; %d cores%n",
        Arrays.toString(shape), n, spec.fibreCount(), spec.cellCount(), spec.bodyCount(),
        Runtime.getRuntime().availableProcessors());
    SyntheticVolume.generate(SynthSpec.small(1));

    SyntheticVolume[] volume = new SyntheticVolume[1];
    double gtSeconds = best(() -> {
      volume[0] = SyntheticVolume.generate(spec);
      return volume[0].objectCount();
    });
    long[] gt = volume[0].labels();
    report("generator: ground truth", n, gtSeconds);
    System.out.printf("    (%d objects)%n", volume[0].objectCount());
    int[][] offsets = SyntheticScenario.defaultOffsets().vectors();
    float[][] exact = new float[1][];
    double affSeconds = best(() -> {
      exact[0] = ExactAffinities.compute(gt, shape, offsets);
      return exact[0].length;
    });
    report("generator: exact affinities, " + offsets.length + " channels", n, affSeconds);
    Degradation moderate = Degradation.moderate(7);
    double degradeSeconds = best(() -> moderate.apply(gt, shape, spec.voxelSize(), offsets,
        exact[0]).length);
    report("generator: degradation (moderate, all five kinds)", n, degradeSeconds);
    System.out.println("    " + moderate);
    exact[0] = null;

    long[] typical = splitsAndMerges(gt, shape);
    long[] noise = noiseLabels(n, 100_000);
    double memory = best(() -> sum(gt, typical));
    report("baseline: one pass over both label arrays", n, memory);
    for (Map.Entry<String, long[]> c : Map.of("typical segmentation",
        typical, "random segmentation (10^5 labels)", noise).entrySet().stream()
        .sorted(Map.Entry.comparingByKey(Comparator.reverseOrder())).toList()) {
      scoreBenchmark(c.getKey(), gt, c.getValue(), n, memory);
    }
    evaluatorBenchmark(gt, typical, shape);
  }

  private static void scoreBenchmark(String name, long[] gt, long[] seg, long n,
      double memory) {
    ContingencyTable[] table = new ContingencyTable[1];
    double add = best(() -> {
      table[0] = new ContingencyTable();
      table[0].add(gt, seg);
      return table[0].pairCount();
    });
    double addCpu = lastCpu;
    Scorer scorer = new Scorer(ScoreOptions.DEFAULT);
    SegmentationScores[] scores = new SegmentationScores[1];
    double score = best(() -> {
      scores[0] = scorer.score(table[0]);
      return scores[0].segmentCount();
    });
    double cpu = addCpu + lastCpu;
    lastCpu = cpu;
    report("scores, " + name, n, add + score);
    System.out.printf("    table %.3f s (%d pairs), scorer %.3f s; %.1fx the memory pass;"
        + " VOI split %.4f merge %.4f ARE %.4f ARI %.4f%n", add, table[0].pairCount(), score,
        (add + score) / memory, scores[0].voiSplit(), scores[0].voiMerge(),
        scores[0].adaptedRandError(), scores[0].adjustedRandIndex());
    int subset = (int) Math.min(n, 2_000_000);
    long[] gtPart = Arrays.copyOf(gt, subset);
    long[] segPart = Arrays.copyOf(seg, subset);
    best(() -> boxedCount(gtPart, segPart, subset));
    double naiveCpu = lastCpu;
    best(() -> {
      ContingencyTable t = new ContingencyTable();
      t.add(gtPart, segPart);
      return t.pairCount();
    });
    System.out.printf("    baseline boxed HashMap count on %d voxels: CPU %.3f s = %,.0f voxels/s;"
        + " primitive table %.1fx faster (CPU)%n", subset, naiveCpu, subset / naiveCpu,
        naiveCpu / lastCpu);
  }

  private static void evaluatorBenchmark(long[] gt, long[] seg, long[] shape)
      throws IOException {
    Path dir = Files.createTempDirectory("sunder-metrics-bench");
    try {
      Container c = Container.create(dir, StorageFormat.N5);
      int[] chunk = {64, 64, 32};
      Dataset g = c.createDataset("gt", DatasetSpec.of(shape, chunk, DataType.UINT64));
      g.write(ArrayImgs.unsignedLongs(gt, shape), new long[3]);
      Dataset s = c.createDataset("seg", DatasetSpec.of(shape, chunk, DataType.UINT64));
      s.write(ArrayImgs.unsignedLongs(seg, shape), new long[3]);
      long n = gt.length;
      for (int threads : new int[] {1, 2}) {
        Evaluator evaluator = new Evaluator(g, s, EvaluationRegion.whole(), null);
        double seconds = best(() -> evaluator.evaluate(ScoreOptions.DEFAULT, threads)
            .segmentCount());
        if (threads > 1) {
          lastCpu = Double.NaN;
        }
        report("evaluator, N5 zstd 64x64x32 chunks, " + threads + " thread(s)", n, seconds);
      }
    } finally {
      try (var files = Files.walk(dir)) {
        files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
      }
    }
  }

  /** Splits every object at the mid-plane in x and merges objects in threes. */
  private static long[] splitsAndMerges(long[] gt, long[] shape) {
    long[] seg = new long[gt.length];
    int nx = (int) shape[0];
    for (int i = 0; i < gt.length; i++) {
      long merged = gt[i] / 3;
      seg[i] = merged * 2 + (i % nx < nx / 2 ? 0 : 1) + 1;
    }
    return seg;
  }

  private static long[] noiseLabels(long n, int labels) {
    Random random = new Random(13);
    long[] out = new long[(int) n];
    for (int i = 0; i < out.length; i++) {
      out[i] = random.nextInt(labels);
    }
    return out;
  }

  private static long sum(long[] a, long[] b) {
    long s = 0;
    for (int i = 0; i < a.length; i++) {
      s += a[i] ^ b[i];
    }
    return s;
  }

  private static long boxedCount(long[] gt, long[] seg, int n) {
    Map<Long, Map<Long, Long>> table = new HashMap<>();
    for (int i = 0; i < n; i++) {
      table.computeIfAbsent(gt[i], k -> new HashMap<>()).merge(seg[i], 1L, Long::sum);
    }
    return table.size();
  }

  /** Best wall time of a few runs, in seconds; the CPU time of that run goes to lastCpu. */
  private static double best(LongSupplier run) {
    double best = Double.MAX_VALUE;
    long sink = 0;
    for (int r = 0; r < REPEATS; r++) {
      long c0 = THREADS.getCurrentThreadCpuTime();
      long t0 = System.nanoTime();
      sink += run.getAsLong();
      double wall = (System.nanoTime() - t0) / 1e9;
      if (wall < best) {
        best = wall;
        lastCpu = (THREADS.getCurrentThreadCpuTime() - c0) / 1e9;
      }
    }
    if (sink == Long.MIN_VALUE) {
      System.out.println(sink);
    }
    return best;
  }

  private static void report(String what, long voxels, double seconds) {
    if (Double.isNaN(lastCpu)) {
      System.out.printf("%-58s wall %7.3f s %,13.0f voxels/s%n", what, seconds, voxels / seconds);
      return;
    }
    System.out.printf("%-58s wall %7.3f s %,13.0f voxels/s | this thread's CPU %7.3f s"
        + " %,13.0f voxels/s%n", what, seconds, voxels / seconds, lastCpu, voxels / lastCpu);
  }
}
