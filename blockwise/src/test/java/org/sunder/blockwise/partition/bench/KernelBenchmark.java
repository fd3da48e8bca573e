package org.sunder.blockwise.partition.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import java.util.Random;
import java.util.Set;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.agglomeration.Agglomeration;
import org.sunder.blockwise.partition.agglomeration.AgglomerationPartitioner;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BlockFragments;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.partition.mutex.MutexWatershedPartitioner;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.testing.HeapPeak;

/**
 * Partition-stage figures of the kernels (the Mutex Watershed as configured by default, mean
 * linkage agglomeration from voxels, and the default method: fitted fragments + multicut + size
 * filter) on realistic data beside the clean block of
 * {@link PartitionBenchmark}: per input, Mvoxels/s per core (the calling thread's CPU time,
 * best of the repeats after one warm-up), bytes/voxel allocated by the thread during the call
 * (every array the call makes, an upper bound on its peak retained heap), the growth of the
 * heap pools' peak usage over the run after a full collection (retained plus not yet collected
 * garbage) and a hash of the labels (to compare implementations).
 *
 * <p>Inputs: the clean block (Voronoi cells, 9 offsets, float32, noise 0.15, seed 13), and one
 * block of each {@link TissuePreset} cut from the centre of its {@link
 * TissuePreset#STANDARD_SHAPE} volume (13 offsets, float32), cached under
 * {@code java.io.tmpdir/sunder-kernel-bench} because generating them takes a while.
 *
 * <p>Arguments: {@code [x y z] [repeats] [seed]}, default {@code 128 128 64 3 1}. System
 * properties: {@code -Dmethods=mws,mean,default} (which kernels; also {@code mws-all}, the Mutex
 * Watershed reading every long-range edge; {@code mean-sparse}, mean linkage reading a
 * hash-chosen {@code -DkeepFraction} of them, default 0.1; and {@code region-graph}, the
 * default's fragment graph alone: {@link RegionGraph#of} over the preset's fitted fragments,
 * every voxel inside, the pass a partition task makes),
 * {@code -Dinputs=clean,dense-neurites,...} (which inputs), {@code -DmeanRepeats=N} (repeats of
 * the slower linkage runs, default 1).
 */
public final class KernelBenchmark {
  private KernelBenchmark() {}

  public static void main(String[] args) throws IOException {
    int[] shape = args.length >= 3 ? new int[] {Integer.parseInt(args[0]),
        Integer.parseInt(args[1]), Integer.parseInt(args[2])} : new int[] {128, 128, 64};
    int repeats = args.length >= 4 ? Integer.parseInt(args[3]) : 3;
    long seed = args.length >= 5 ? Long.parseLong(args[4]) : 1;
    Set<String> methods = Set.of(
        System.getProperty("methods", "mws,mean,default").split(","));
    String inputs = System.getProperty("inputs",
        "clean,dense-neurites,compact-cells,bodies-and-neurites");
    int meanRepeats = Integer.getInteger("meanRepeats", 1);
    System.out.printf(Locale.ROOT, "preset blocks %d x %d x %d (x y z) cut from the standard "
        + "shape, seed %d; %d processors, max heap %d MiB%n", shape[0], shape[1], shape[2],
        seed, Runtime.getRuntime().availableProcessors(),
        Runtime.getRuntime().maxMemory() >> 20);
    Partitioner mws = PartitionConfig.fromJson("{\"method\": \"mutex-watershed\"}").create();
    Partitioner mwsAll = new MutexWatershedPartitioner(WeightRule.byChannelRole(),
        Subsampling.none());
    Partitioner mean = new AgglomerationPartitioner(new Agglomeration(Linkage.MEAN, false),
        WeightRule.byValue(WeightRule.Transform.LOGIT, null), Subsampling.none());
    double keep = Double.parseDouble(System.getProperty("keepFraction", "0.1"));
    Partitioner meanSparse = new AgglomerationPartitioner(new Agglomeration(Linkage.MEAN, false),
        WeightRule.byValue(WeightRule.Transform.LOGIT, null), Subsampling.hash(keep, 7));
    for (String input : inputs.split(",")) {
      AffinityBlock block = input.equals("clean") ? cleanBlock() : presetBlock(
          TissuePreset.named(input), seed, shape);
      System.out.printf(Locale.ROOT, "%s: %d voxels, %d offsets%n", input, block.voxelCount(),
          block.channelCount());
      if (methods.contains("mws")) {
        measure(input + " mutex watershed", block, mws, repeats);
      }
      if (methods.contains("mws-all")) {
        measure(input + " mutex watershed, every edge", block, mwsAll, repeats);
      }
      if (methods.contains("mean-sparse")) {
        measure(input + " mean linkage, long-range kept " + keep, block, meanSparse,
            meanRepeats);
      }
      if (methods.contains("mean")) {
        measure(input + " mean linkage from voxels", block, mean, meanRepeats);
      }
      if (methods.contains("region-graph") && !input.equals("clean")) {
        measureRegionGraph(input, block, TissuePreset.named(input).spec(seed).voxelSize(),
            repeats);
      }
      if (methods.contains("default")) {
        double[] voxelSize = input.equals("clean") ? null
            : TissuePreset.named(input).spec(seed).voxelSize();
        measure(input + " default (fragments + multicut)", block,
            PartitionConfig.robustDefault(voxelSize).create(), repeats);
      }
    }
  }

  /** The block of {@link PartitionBenchmark}: 128^3 Voronoi cells with noise, 9 offsets. */
  static AffinityBlock cleanBlock() {
    int[] shape = {128, 128, 128};
    Random random = new Random(13);
    int[] truth = PartitionBenchmark.voronoi(shape, 300, random);
    float[] floats = PartitionBenchmark.affinities(truth, shape, 0.15, random);
    return AffinityBlock.ofFloats(floats, shape, new long[3], PartitionBenchmark.OFFSETS, null);
  }

  /** A block of {@code shape} from the centre of the preset's standard volume (cached). */
  static AffinityBlock presetBlock(TissuePreset preset, long seed, int[] shape)
      throws IOException {
    Offsets offsets = TissuePreset.offsets();
    int channels = offsets.count();
    int n = shape[0] * shape[1] * shape[2];
    Path cache = Path.of(System.getProperty("java.io.tmpdir"), "sunder-kernel-bench",
        preset.presetName() + "-" + seed + "-" + shape[0] + "x" + shape[1] + "x" + shape[2]
            + ".f32");
    float[] cut = new float[n * channels];
    if (Files.exists(cache)) {
      ByteBuffer.wrap(Files.readAllBytes(cache)).order(ByteOrder.LITTLE_ENDIAN).asFloatBuffer()
          .get(cut);
      return AffinityBlock.ofFloats(cut, shape, new long[3], offsets, null);
    }
    long[] full = TissuePreset.STANDARD_SHAPE;
    long t0 = System.nanoTime();
    SyntheticVolume volume = preset.volume(seed, full);
    float[] affinities = preset.affinities(volume, seed);
    System.out.printf(Locale.ROOT, "  generated %s seed %d in %.1f s%n", preset.presetName(),
        seed, (System.nanoTime() - t0) / 1e9);
    int fx = (int) full[0];
    int fy = (int) full[1];
    int fz = (int) full[2];
    int fn = fx * fy * fz;
    int[] start = new int[3];
    for (int d = 0; d < 3; d++) {
      if (shape[d] > full[d]) {
        throw new IllegalArgumentException("block shape " + Arrays.toString(shape)
            + " exceeds the standard shape " + Arrays.toString(full));
      }
      start[d] = (int) (full[d] - shape[d]) / 2;
    }
    int i = 0;
    for (int k = 0; k < channels; k++) {
      for (int z = 0; z < shape[2]; z++) {
        for (int y = 0; y < shape[1]; y++) {
          int from = start[0] + fx * ((start[1] + y) + fy * (start[2] + z)) + k * fn;
          System.arraycopy(affinities, from, cut, i, shape[0]);
          i += shape[0];
        }
      }
    }
    Files.createDirectories(cache.getParent());
    ByteBuffer bytes = ByteBuffer.allocate(4 * cut.length).order(ByteOrder.LITTLE_ENDIAN);
    bytes.asFloatBuffer().put(cut);
    Path temporary = Files.createTempFile(cache.getParent(), "cut", ".tmp");
    Files.write(temporary, bytes.array());
    Files.move(temporary, cache, java.nio.file.StandardCopyOption.REPLACE_EXISTING,
        java.nio.file.StandardCopyOption.ATOMIC_MOVE);
    return AffinityBlock.ofFloats(cut, shape, new long[3], offsets, null);
  }

  /** CPU seconds of {@link RegionGraph#of} (best of the repeats after one warm-up). */
  private static void measureRegionGraph(String input, AffinityBlock block, double[] voxelSize,
      int repeats) {
    int[] fragments = BlockFragments.label(block, FragmentOptions.fittedTo(voxelSize));
    GridGraph graph = GridGraph.of(block, WeightRule.byValue(WeightRule.Transform.LOGIT, null),
        Subsampling.none());
    byte[] inside = new byte[fragments.length];
    Arrays.fill(inside, (byte) 1);
    com.sun.management.ThreadMXBean threads =
        (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
    double best = Double.MAX_VALUE;
    int pairs = 0;
    for (int r = 0; r <= repeats; r++) {
      long cpu0 = threads.getCurrentThreadCpuTime();
      pairs = RegionGraph.of(fragments, graph, inside).statistics().size();
      if (r > 0) {
        best = Math.min(best, (threads.getCurrentThreadCpuTime() - cpu0) / 1e9);
      }
    }
    System.out.printf(Locale.ROOT, "  %-45s %7.3f s cpu (best of %d), %d fragment pairs%n",
        input + " region graph of the fragments", best, repeats, pairs);
  }

  private static void measure(String name, AffinityBlock block, Partitioner partitioner,
      int repeats) {
    com.sun.management.ThreadMXBean threads =
        (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
    long thread = Thread.currentThread().getId();
    int voxels = block.voxelCount();
    double bestCpu = Double.MAX_VALUE;
    long bestBytes = Long.MAX_VALUE;
    long bestPeak = Long.MAX_VALUE;
    int hash = 0;
    int segments = 0;
    int runs = repeats > 1 ? repeats + 1 : 1;
    for (int r = 0; r < runs; r++) {
      System.gc();
      HeapPeak heap = HeapPeak.start();
      long bytes0 = threads.getThreadAllocatedBytes(thread);
      long cpu0 = threads.getCurrentThreadCpuTime();
      Segmentation s = partitioner.partition(block);
      long cpu1 = threads.getCurrentThreadCpuTime();
      long bytes1 = threads.getThreadAllocatedBytes(thread);
      long peak = heap.growth();
      hash = Arrays.hashCode(s.labels());
      segments = s.segmentCount();
      if (runs > 1 && r == 0) {
        continue;  // warm-up
      }
      bestCpu = Math.min(bestCpu, (cpu1 - cpu0) / 1e9);
      bestBytes = Math.min(bestBytes, bytes1 - bytes0);
      bestPeak = Math.min(bestPeak, peak);
    }
    System.out.printf(Locale.ROOT, "  %-45s %7.3f Mvoxels/s per core (cpu %.2f s), %6.1f "
        + "bytes/voxel allocated, %6.1f bytes/voxel heap peak growth, %d segments, labels hash "
        + "%08x%n", name, voxels / bestCpu / 1e6, bestCpu, bestBytes / (double) voxels,
        bestPeak / (double) voxels, segments, hash);
  }
}
