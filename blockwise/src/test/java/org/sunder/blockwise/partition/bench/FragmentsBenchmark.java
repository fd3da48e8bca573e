package org.sunder.blockwise.partition.bench;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.agglomeration.Agglomeration;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.fragments.BoundaryMap;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.partition.fragments.FragmentsAgglomerationPartitioner;
import org.sunder.blockwise.partition.fragments.FragmentsMulticutPartitioner;
import org.sunder.blockwise.partition.fragments.WatershedFragments;
import org.sunder.blockwise.partition.multicut.Multicut;
import org.sunder.blockwise.partition.multicut.MulticutResult;
import org.sunder.blockwise.partition.mutex.MutexWatershedPartitioner;

/**
 * Throughput and memory of the fragment-based partitioners on one synthetic 128×128×128 block
 * with 3 nearest-neighbour and 6 long-range offsets (cells of a random Voronoi tessellation,
 * affinities 1 inside a cell and 0 across, plus Gaussian noise σ = 0.2, clipped to [0, 1]).
 * Prints voxels per second on one thread (from the thread's CPU time, so that other load on the
 * machine does not count; wall time printed beside it), bytes allocated per voxel, peak heap above the input
 * per voxel, and the seconds of each sub-step; the Mutex Watershed on the same block is the
 * baseline measured in the same run (float affinities); the fragment methods also run on the
 * same affinities quantized to 8 bits. Run with one core, e.g.
 * {@code java -XX:ActiveProcessorCount=1 -XX:+UseSerialGC -Xmx3g -cp ... FragmentsBenchmark}.
 */
public final class FragmentsBenchmark {
  private static final int SIDE = 128;
  private static final int REPEATS = 2;
  private static final Offsets OFFSETS = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0},
      new int[] {0, 0, -1}, new int[] {-3, 0, 0}, new int[] {0, -3, 0}, new int[] {0, 0, -3},
      new int[] {-9, 0, 0}, new int[] {0, -9, 0}, new int[] {0, 0, -9});

  private FragmentsBenchmark() {}

  public static void main(String[] args) {
    int[] shape = {SIDE, SIDE, SIDE};
    int n = SIDE * SIDE * SIDE;
    long t0 = System.nanoTime();
    int[] truth = voronoi(shape, 400, new Random(13));
    float[] values = affinities(truth, shape, 0.2f, new Random(17));
    System.out.printf("synthetic block %s, %d cells, %d offsets, generated in %.2f s%n",
        Arrays.toString(shape), 400, OFFSETS.count(), seconds(t0));
    AffinityBlock block = AffinityBlock.ofFloats(values, shape, new long[3], OFFSETS, null);
    WeightRule logit = WeightRule.byValue(WeightRule.Transform.LOGIT, null);
    Subsampling none = Subsampling.none();
    FragmentOptions options = FragmentOptions.defaults();
    Map<String, Partitioner> methods = new LinkedHashMap<>();
    methods.put("mutex watershed (baseline)",
        new MutexWatershedPartitioner(WeightRule.byChannelRole(), none));
    methods.put("mean linkage from fragments", new FragmentsAgglomerationPartitioner(options,
        new Agglomeration(Linkage.MEAN, false), logit, none));
    methods.put("fragments + multicut",
        new FragmentsMulticutPartitioner(options, Linkage.SUM, logit, none, false));
    byte[] quantized = new byte[values.length];
    for (int i = 0; i < values.length; i++) {
      quantized[i] = (byte) Math.round(values[i] * 255);
    }
    AffinityBlock bytes = AffinityBlock.ofBytes(quantized, shape, new long[3], OFFSETS, null);
    double baseline = 0;
    for (Map.Entry<String, Partitioner> method : methods.entrySet()) {
      Measurement m = measure(method.getValue(), block);
      if (baseline == 0) {
        baseline = n / m.cpuSeconds;
      }
      System.out.printf("%-28s wall %6.3f s, thread cpu %6.3f s: %,11.0f voxels/s per core"
          + " (%.3f x baseline); %6.1f bytes/voxel allocated, %6.1f bytes/voxel peak heap above"
          + " input; %d segments%n", method.getKey(), m.seconds, m.cpuSeconds,
          n / m.cpuSeconds, n / m.cpuSeconds / baseline, m.allocated / (double) n,
          m.peak / (double) n, m.segments);
      if (baseline != n / m.cpuSeconds) {
        Measurement q = measure(method.getValue(), bytes);
        System.out.printf("%-28s wall %6.3f s, thread cpu %6.3f s: %,11.0f voxels/s per core"
            + " (%.3f x baseline); %6.1f bytes/voxel allocated, %6.1f bytes/voxel peak heap"
            + " above input; %d segments%n", "  same, 8-bit affinities", q.seconds, q.cpuSeconds,
            n / q.cpuSeconds, n / q.cpuSeconds / baseline, q.allocated / (double) n,
            q.peak / (double) n, q.segments);
      }
    }
    subSteps(block, shape, options, logit, none);
  }

  private record Measurement(double seconds, double cpuSeconds, long allocated, long peak,
      int segments) {}

  private static Measurement measure(Partitioner p, AffinityBlock block) {
    p.partition(block);
    double[] times = new double[REPEATS];
    double[] cpu = new double[REPEATS];
    long allocated = 0;
    long peak = 0;
    int segments = 0;
    for (int r = 0; r < REPEATS; r++) {
      System.gc();
      long base = heapUsed();
      resetPeaks();
      long a0 = allocatedBytes();
      long t0 = System.nanoTime();
      long c0 = cpuNanos();
      Segmentation s = p.partition(block);
      times[r] = seconds(t0);
      cpu[r] = (cpuNanos() - c0) / 1e9;
      allocated = allocatedBytes() - a0;
      peak = Math.max(peak, peakHeap() - base);
      segments = s.segmentCount();
    }
    Arrays.sort(times);
    Arrays.sort(cpu);
    return new Measurement(times[0], cpu[0], allocated, peak, segments);
  }

  private static void subSteps(AffinityBlock block, int[] shape, FragmentOptions options,
      WeightRule logit, Subsampling none) {
    List<String> lines = new ArrayList<>();
    for (int r = 0; r <= REPEATS; r++) {
      lines.clear();
      long t = cpuNanos();
      float[] boundary = BoundaryMap.of(block.floatValuesOrNull(), shape,
          OFFSETS.vectors(), null, -1);
      lines.add(step("boundary map", t));
      t = cpuNanos();
      WatershedFragments fragments = new WatershedFragments(options.forDimension(3));
      fragments.seeds(boundary, shape, null);
      lines.add(step("seeds alone (distance transform, smoothing, maxima)", t));
      t = cpuNanos();
      int[] labels = fragments.label(boundary, shape, null);
      int count = Arrays.stream(labels).max().orElse(0);
      lines.add(step("fragments: seeds + flood of the rounded map (" + count + " fragments)",
          t));
      t = cpuNanos();
      EdgeStatistics stats = RegionGraph.of(labels, GridGraph.of(block, logit, none))
          .statistics();
      lines.add(step("region graph (" + stats.size() + " fragment pairs)", t));
      t = cpuNanos();
      new Agglomeration(Linkage.MEAN, false).run(count + 1, stats);
      lines.add(step("mean-linkage agglomeration of fragments", t));
      int m = stats.size();
      int[] u = new int[m];
      int[] v = new int[m];
      double[] w = new double[m];
      for (int i = 0; i < m; i++) {
        u[i] = (int) stats.u(i) - 1;
        v[i] = (int) stats.v(i) - 1;
        w[i] = stats.sum(i);
      }
      t = cpuNanos();
      MulticutResult greedy = Multicut.greedyAdditive(count, u, v, w);
      lines.add(step(String.format("greedy additive contraction (objective %.1f, %d clusters)",
          greedy.objective(), greedy.clusterCount()), t));
      t = cpuNanos();
      MulticutResult refined = Multicut.refine(count, u, v, w, greedy.labels());
      lines.add(step(String.format("Kernighan-Lin refinement (objective %.1f, %d clusters)",
          refined.objective(), refined.clusterCount()), t));
    }
    System.out.println("sub-steps (last of " + (REPEATS + 1) + " runs):");
    lines.forEach(System.out::println);
  }

  private static String step(String name, long cpu0) {
    return String.format("  %-72s %7.3f s cpu", name, (cpuNanos() - cpu0) / 1e9);
  }

  private static long cpuNanos() {
    return ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
  }

  private static double seconds(long t0) {
    return (System.nanoTime() - t0) / 1e9;
  }

  private static long allocatedBytes() {
    return ((com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean())
        .getCurrentThreadAllocatedBytes();
  }

  private static long heapUsed() {
    long used = 0;
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP) {
        used += pool.getUsage().getUsed();
      }
    }
    return used;
  }

  private static void resetPeaks() {
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      pool.resetPeakUsage();
    }
  }

  /** Sum of the heap pools' peaks: an upper bound of the simultaneous peak. */
  private static long peakHeap() {
    long peak = 0;
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP) {
        peak += pool.getPeakUsage().getUsed();
      }
    }
    return peak;
  }

  /** Labels of the nearest of {@code cells} random points (a Voronoi tessellation), from 1. */
  static int[] voronoi(int[] shape, int cells, Random random) {
    int[][] points = new int[cells][3];
    for (int[] p : points) {
      for (int d = 0; d < 3; d++) {
        p[d] = random.nextInt(shape[d]);
      }
    }
    int bucket = 16;
    int[] grid = {shape[0] / bucket, shape[1] / bucket, shape[2] / bucket};
    List<List<Integer>> near = new ArrayList<>();
    for (int g = 0; g < grid[0] * grid[1] * grid[2]; g++) {
      near.add(new ArrayList<>());
    }
    for (int s = 0; s < cells; s++) {
      for (int g = 0; g < near.size(); g++) {
        int gx = g % grid[0];
        int gy = (g / grid[0]) % grid[1];
        int gz = g / (grid[0] * grid[1]);
        double dx = Math.max(0, Math.max(gx * bucket - points[s][0],
            points[s][0] - (gx + 1) * bucket));
        double dy = Math.max(0, Math.max(gy * bucket - points[s][1],
            points[s][1] - (gy + 1) * bucket));
        double dz = Math.max(0, Math.max(gz * bucket - points[s][2],
            points[s][2] - (gz + 1) * bucket));
        if (dx * dx + dy * dy + dz * dz < 64 * 64) {
          near.get(g).add(s);
        }
      }
    }
    int[] labels = new int[shape[0] * shape[1] * shape[2]];
    int i = 0;
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++) {
          int g = x / bucket + grid[0] * (y / bucket + grid[1] * (z / bucket));
          int best = 0;
          long bestDistance = Long.MAX_VALUE;
          for (int s : near.get(g)) {
            long ddx = x - points[s][0];
            long ddy = y - points[s][1];
            long ddz = z - points[s][2];
            long d = ddx * ddx + ddy * ddy + ddz * ddz;
            if (d < bestDistance) {
              bestDistance = d;
              best = s;
            }
          }
          labels[i++] = best + 1;
        }
      }
    }
    return labels;
  }

  /** Channel-last affinities: 1 where both ends share a label, else 0, plus noise, clipped. */
  static float[] affinities(int[] labels, int[] shape, float noise, Random random) {
    int n = labels.length;
    float[] values = new float[n * OFFSETS.count()];
    int[] strides = {1, shape[0], shape[0] * shape[1]};
    for (int k = 0; k < OFFSETS.count(); k++) {
      int[] o = OFFSETS.vector(k);
      int delta = o[0] * strides[0] + o[1] * strides[1] + o[2] * strides[2];
      int i = 0;
      for (int z = 0; z < shape[2]; z++) {
        for (int y = 0; y < shape[1]; y++) {
          for (int x = 0; x < shape[0]; x++, i++) {
            boolean inside = x + o[0] >= 0 && x + o[0] < shape[0] && y + o[1] >= 0
                && y + o[1] < shape[1] && z + o[2] >= 0 && z + o[2] < shape[2];
            float a = inside && labels[i + delta] == labels[i] ? 1f : 0f;
            a += (float) (random.nextGaussian() * noise);
            values[k * n + i] = Math.min(1f, Math.max(0f, a));
          }
        }
      }
    }
    return values;
  }
}
