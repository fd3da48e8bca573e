package org.sunder.blockwise.partition.bench;

import java.lang.management.ManagementFactory;
import java.util.Locale;
import java.util.Random;
import java.util.function.Supplier;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Agglomeration;
import org.sunder.blockwise.partition.AgglomerationPartitioner;
import org.sunder.blockwise.partition.Linkage;
import org.sunder.blockwise.partition.MutexWatershed;
import org.sunder.blockwise.partition.Segmentation;

/**
 * Throughput (voxels per second of the calling thread's CPU time, i.e. on one core; wall time is
 * printed too but depends on other load of the machine) and heap allocated per voxel of the block partitioners on a synthetic 128 x 128 x 128 block with 3 nearest-neighbour
 * and 6 long-range offsets. Ground truth: Voronoi cells of random seeds; affinities: 1 inside a
 * cell, 0 across a cell border, plus Gaussian noise, clipped to [0, 1]; 8-bit copy = round(255 a).
 * Baseline in the same run: the same Mutex Watershed on an explicit CSR copy of the edges
 * ({@link BaselineMutexWatershed}).
 *
 * <p>Run: {@code java -Xmx8g -cp <test classpath> org.sunder.blockwise.partition.bench.PartitionBenchmark [size] [repeats]}.
 */
public final class PartitionBenchmark {
  static final Offsets OFFSETS = Offsets.fromZyx(new int[][] {
      {-1, 0, 0}, {0, -1, 0}, {0, 0, -1},
      {-2, 0, 0}, {0, -9, 0}, {0, 0, -9}, {-4, 0, 0}, {0, -27, 0}, {0, 0, -27}});
  private static final double PUBLISHED_VOXELS_PER_SECOND = 30.0 * 512 * 512 / 43.3;

  private PartitionBenchmark() {}

  public static void main(String[] args) {
    int size = args.length > 0 ? Integer.parseInt(args[0]) : 128;
    int repeats = args.length > 1 ? Integer.parseInt(args[1]) : 3;
    int[] shape = {size, size, size};
    Random random = new Random(13);
    int[] truth = voronoi(shape, 300, random);
    float[] floats = affinities(truth, shape, 0.15, random);
    byte[] bytes = new byte[floats.length];
    for (int i = 0; i < floats.length; i++) {
      bytes[i] = (byte) Math.round(floats[i] * 255);
    }
    AffinityBlock floatBlock = AffinityBlock.ofFloats(floats, shape, new long[3], OFFSETS, null);
    AffinityBlock byteBlock = AffinityBlock.ofBytes(bytes, shape, new long[3], OFFSETS, null);
    int voxels = floatBlock.voxelCount();
    System.out.printf(Locale.ROOT, "block %d x %d x %d = %d voxels, %d offsets (3 nearest, 6 "
        + "long-range), %d ground-truth cells, %d available processors, max heap %d MiB%n",
        size, size, size, voxels, OFFSETS.count(), 300,
        Runtime.getRuntime().availableProcessors(), Runtime.getRuntime().maxMemory() >> 20);
    GridGraph floatGraph = GridGraph.of(floatBlock, WeightRule.byChannelRole(), Subsampling.none());
    GridGraph byteGraph = GridGraph.of(byteBlock, WeightRule.byChannelRole(), Subsampling.none());
    // a pipeline JVM runs several edge visitors (statistics, seams, copies): run some first so
    // that no measured method profits from a call site that has seen only its own visitor
    double[] sink = new double[1];
    for (GridGraph g : new GridGraph[] {floatGraph, byteGraph}) {
      g.forEachEdge((source, target, k, w) -> sink[0] += w);
      g.forEachEdge((source, target, k, w) -> sink[0] = Math.max(sink[0], w));
      sink[0] += g.presentEdgeCount();
    }
    double mwsFloat = measure("mutex watershed, float32 affinities", voxels, repeats,
        () -> MutexWatershed.partition(floatGraph));
    measure("mutex watershed, uint8 affinities", voxels, repeats,
        () -> MutexWatershed.partition(byteGraph));
    double baseline = measure("baseline: mutex watershed, float32, explicit CSR copy", voxels,
        repeats, () -> BaselineMutexWatershed.partition(floatGraph));
    System.out.printf(Locale.ROOT, "ratio implicit grid / explicit CSR baseline: %.2fx; "
        + "vs published 0.18 Mvox/s (43.3 s for 30x512x512): %.1fx%n", mwsFloat / baseline,
        mwsFloat / PUBLISHED_VOXELS_PER_SECOND);
    measure("mean linkage agglomeration from voxels, logit weights", voxels,
        1, () -> new AgglomerationPartitioner(
            new Agglomeration(Linkage.MEAN, false),
            WeightRule.byValue(WeightRule.Transform.LOGIT, null), Subsampling.none())
            .partition(floatBlock));
  }

  private static double measure(String name, int voxels, int repeats,
      Supplier<Segmentation> run) {
    com.sun.management.ThreadMXBean threads =
        (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
    long thread = Thread.currentThread().getId();
    double bestSeconds = Double.MAX_VALUE;
    double bestCpu = Double.MAX_VALUE;
    long bestBytes = Long.MAX_VALUE;
    int segments = 0;
    for (int r = 0; r < repeats + 1; r++) {
      System.gc();
      long bytes0 = threads.getThreadAllocatedBytes(thread);
      long cpu0 = threads.getCurrentThreadCpuTime();
      long t0 = System.nanoTime();
      Segmentation s = run.get();
      long t1 = System.nanoTime();
      long cpu1 = threads.getCurrentThreadCpuTime();
      long bytes1 = threads.getThreadAllocatedBytes(thread);
      segments = s.segmentCount();
      if (r == 0) {
        continue;  // warm-up
      }
      bestSeconds = Math.min(bestSeconds, (t1 - t0) / 1e9);
      bestCpu = Math.min(bestCpu, (cpu1 - cpu0) / 1e9);
      bestBytes = Math.min(bestBytes, bytes1 - bytes0);
      System.out.printf(Locale.ROOT, "  %s run %d: wall %.3f s, thread cpu %.3f s%n", name, r,
          (t1 - t0) / 1e9, (cpu1 - cpu0) / 1e9);
    }
    double rate = voxels / bestCpu;
    System.out.printf(Locale.ROOT, "%s: %.2f Mvoxels/s per core (best thread cpu time of %d), "
        + "%.2f Mvoxels/s wall, %.1f bytes/voxel allocated, %d segments%n", name, rate / 1e6,
        repeats, voxels / bestSeconds / 1e6, bestBytes / (double) voxels, segments);
    return rate;
  }

  /** Labels of the Voronoi cells of {@code seeds} random points (Euclidean, memory order). */
  static int[] voronoi(int[] shape, int seeds, Random random) {
    int[][] points = new int[seeds][3];
    for (int[] p : points) {
      for (int d = 0; d < 3; d++) {
        p[d] = random.nextInt(shape[d]);
      }
    }
    int[] labels = new int[shape[0] * shape[1] * shape[2]];
    int i = 0;
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++) {
          int best = 0;
          long bestDistance = Long.MAX_VALUE;
          for (int s = 0; s < seeds; s++) {
            long dx = x - points[s][0];
            long dy = y - points[s][1];
            long dz = z - points[s][2];
            long distance = dx * dx + dy * dy + dz * dz;
            if (distance < bestDistance) {
              bestDistance = distance;
              best = s;
            }
          }
          labels[i++] = best + 1;
        }
      }
    }
    return labels;
  }

  /** Exact affinities (same cell or not) plus Gaussian noise, clipped to [0, 1]. */
  static float[] affinities(int[] truth, int[] shape, double noise, Random random) {
    int n = truth.length;
    float[] a = new float[n * OFFSETS.count()];
    for (int k = 0; k < OFFSETS.count(); k++) {
      int ox = OFFSETS.component(k, 0);
      int oy = OFFSETS.component(k, 1);
      int oz = OFFSETS.component(k, 2);
      int i = 0;
      for (int z = 0; z < shape[2]; z++) {
        for (int y = 0; y < shape[1]; y++) {
          for (int x = 0; x < shape[0]; x++, i++) {
            int tx = x + ox;
            int ty = y + oy;
            int tz = z + oz;
            boolean inside = tx >= 0 && ty >= 0 && tz >= 0 && tx < shape[0] && ty < shape[1]
                && tz < shape[2];
            double exact = inside && truth[i] == truth[tx + shape[0] * (ty + shape[1] * tz)]
                ? 1 : 0;
            double value = exact + noise * random.nextGaussian();
            a[i + k * n] = (float) Math.min(1, Math.max(0, value));
          }
        }
      }
    }
    return a;
  }
}
