package org.sunder.spark.bench;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.spark.it.SharedSpark;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.stage.RunReport;
import org.sunder.spark.stage.StageReport;
import org.sunder.spark.workdir.Stage;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.testing.HeapPeak;

/**
 * The whole run of the default configuration on a realistic tissue preset in {@code local[2]},
 * at one or more volume sizes of the same tissue (the preset scaled, not made denser), next to
 * the partition kernel alone measured in the same run.
 *
 * <p>Per stage: wall seconds, seconds per million voxels, process CPU seconds over wall seconds
 * (2.0 means both cores busy the whole stage; the process's CPU includes its garbage collection
 * and compilation threads, so this is an upper bound on the tasks' share) and the growth of the heap's peak over the stage
 * (all concurrent tasks and the driver together; the JVM is shared in local mode). Per size: the
 * whole run in Mvoxels/s per core (volume voxels over process CPU seconds of all stages), the
 * partition kernel's Mvoxels/s per core (see {@link #kernelRate}) and the ratio of the two
 * (goal: at least 0.7), the collectors' pauses, and the run's CPU by thread
 * ({@link ThreadKindCpu}: the JIT compiler's share is a fixed cost per JVM, large beside a small
 * volume; the compilation MXBean's figure is the compiler's elapsed time, which overstates it).
 *
 * <p>{@code -Druns=N} runs each size N times in this JVM, fresh each time: the first run pays
 * for the JVM's warm-up (compiling Spark's and Sunder's code, growing the heap into new memory),
 * as every executor does once, and the later runs show what each further block costs an
 * executor that has warmed up.
 *
 * <p>{@code -Dblocks=z,y,x} sets the block shape instead of the default's (which at these sizes
 * spans the volume in y and x): blocks cut in every axis, as a large volume's are, read a
 * fragment context around their extended box.
 *
 * <p>Not a test. Arguments: {@code [tissue] [seed] [z,y,x ...]}, default
 * {@code dense-neurites 1 96,256,256 192,512,512}. Volumes are generated once under
 * {@code java.io.tmpdir/sunder-pipeline-bench} (the larger one needs about 12 GB of heap).
 */
public final class PipelineBenchmark {
  private static final List<Stage> STAGES =
      List.of(Stage.PARTITION, Stage.SEAMS, Stage.SOLVE, Stage.RELABEL);
  private static final int KERNEL_SAMPLES = 3;

  private PipelineBenchmark() {}

  public static void main(String[] args) throws Exception {
    TissuePreset tissue = TissuePreset.named(args.length > 0 ? args[0] : "dense-neurites");
    long seed = args.length > 1 ? Long.parseLong(args[1]) : 1;
    List<long[]> sizes = new ArrayList<>();
    for (int i = 2; i < args.length; i++) {
      String[] parts = args[i].split(",");
      sizes.add(new long[] {Long.parseLong(parts[0]), Long.parseLong(parts[1]),
          Long.parseLong(parts[2])});
    }
    if (sizes.isEmpty()) {
      sizes.add(new long[] {96, 256, 256});
      sizes.add(new long[] {192, 512, 512});
    }
    Path cache = Path.of(System.getProperty("java.io.tmpdir"), "sunder-pipeline-bench");
    System.out.printf(Locale.ROOT, "%s, seed %d, default configuration, local[2]; %d "
        + "processors, max heap %d MiB%n", tissue.presetName(), seed,
        Runtime.getRuntime().availableProcessors(), Runtime.getRuntime().maxMemory() >> 20);
    JavaSparkContext sc = SharedSpark.start("local[2]");
    try {
      int runs = Integer.getInteger("runs", 1);
      for (long[] zyx : sizes) {
        for (int run = 1; run <= runs; run++) {
          measure(sc, cache, tissue, seed, zyx, run + " of " + runs);
        }
      }
    } finally {
      sc.stop();
    }
  }

  private static void measure(JavaSparkContext sc, Path cache, TissuePreset tissue, long seed,
      long[] zyx, String runOfRuns) throws Exception {
    long voxels = zyx[0] * zyx[1] * zyx[2];
    String name = tissue.presetName() + "-" + seed + "-" + zyx[0] + "x" + zyx[1] + "x" + zyx[2];
    Path dir = cache.resolve(name);
    Path root = dir.resolve("volume.zarr");
    if (!Files.isDirectory(root.resolve(SyntheticScenario.AFFINITIES))) {
      long t0 = System.nanoTime();
      long[] xyz = {zyx[2], zyx[1], zyx[0]};
      SyntheticScenario.write(Container.create(root, StorageFormat.ZARR),
          tissue.volume(seed, xyz), tissue.scenarioOptions(seed));
      System.out.printf(Locale.ROOT, "generated %s in %.1f s%n", name,
          (System.nanoTime() - t0) / 1e9);
    }
    Path config = dir.resolve("run.json");
    String blocks = System.getProperty("blocks");
    String output = blocks == null ? "segmentation" : "segmentation-" + blocks.replace(',', 'x');
    Files.writeString(config, "{\"axes\": \"zyx\", \"input\": {\"container\": \""
        + root + "\", \"affinities\": \"" + SyntheticScenario.AFFINITIES + "\"}, "
        + "\"output\": {\"dataset\": \"" + output + "\"}"
        + (blocks == null ? "" : ", \"blocks\": {\"shape\": [" + blocks + "]}") + "}");

    System.out.printf(Locale.ROOT, "%n%d x %d x %d (z y x) = %.1f M voxels, run %s (the JVM's "
        + "CPU so far: %.1f s)%n", zyx[0], zyx[1], zyx[2], voxels / 1e6, runOfRuns,
        processCpuSeconds());
    double cpuTotal = 0;
    double wallTotal = 0;
    double gc0 = collectionSeconds();
    double[] kindCpu = new double[ThreadKindCpu.Kind.values().length];
    StitchingSetup setup;
    try (PreparedRun run = RunLoader.prepare(config, null, true)) {
      setup = run.settings().setup();
      BlockGrid grid = setup.grid();
      System.out.printf(Locale.ROOT, "%d blocks of %s (x y z) voxels%n", grid.blockCount(),
          Arrays.toString(grid.blockShape()));
      Pipeline pipeline = new Pipeline(sc, new PrintStream(new ByteArrayOutputStream(), true,
          StandardCharsets.UTF_8), new PrintStream(new ByteArrayOutputStream(), true,
          StandardCharsets.UTF_8), false);
      System.out.printf(Locale.ROOT, "  %-9s %8s %10s %9s %9s %14s%n", "stage", "tasks",
          "wall s", "s/Mvox", "cpu/wall", "heap peak MiB");
      for (Stage stage : STAGES) {
        System.gc();
        HeapPeak heap = HeapPeak.start();
        ThreadKindCpu threads0 = ThreadKindCpu.now();
        double cpu0 = processCpuSeconds();
        long wall0 = System.nanoTime();
        RunReport report = pipeline.run(run, List.of(stage));
        double cpu = processCpuSeconds() - cpu0;
        ThreadKindCpu threads = ThreadKindCpu.now();
        for (ThreadKindCpu.Kind kind : ThreadKindCpu.Kind.values()) {
          kindCpu[kind.ordinal()] += threads.since(threads0, kind);
        }
        double wall = (System.nanoTime() - wall0) / 1e9;
        long heapPeak = heap.growth();
        StageReport stageReport = report.stages().get(0);
        cpuTotal += cpu;
        wallTotal += wall;
        System.out.printf(Locale.ROOT, "  %-9s %8d %10.1f %9.2f %9.2f %14d%n",
            stage.cliName(), stageReport.total(), wall, wall / (voxels / 1e6), cpu / wall,
            heapPeak >> 20);
      }
    }
    double runRate = voxels / cpuTotal / 1e6;
    System.out.printf(Locale.ROOT, "  whole run: %.1f s wall, %.1f s CPU, %.2f s/Mvoxel wall, "
        + "%.3f Mvoxels/s per core%n", wallTotal, cpuTotal, wallTotal / (voxels / 1e6), runRate);
    System.out.printf(Locale.ROOT, "    garbage collection pauses %.1f s (wall)%n",
        collectionSeconds() - gc0);
    double rest = cpuTotal;
    StringBuilder byKind = new StringBuilder("    by thread:");
    for (ThreadKindCpu.Kind kind : ThreadKindCpu.Kind.values()) {
      rest -= kindCpu[kind.ordinal()];
      byKind.append(String.format(Locale.ROOT, " %s %.1f s,", kind.label,
          kindCpu[kind.ordinal()]));
    }
    System.out.printf(Locale.ROOT, "%s the driver and the rest %.1f s%n", byKind, rest);
    double kernelRate = kernelRate(setup);
    System.out.printf(Locale.ROOT, "  partition kernel alone: %.3f Mvoxels/s per core (core "
        + "voxels, %d interior blocks); whole run / kernel = %.2f%n", kernelRate,
        KERNEL_SAMPLES, runRate / kernelRate);
  }

  /**
   * Core voxels per CPU second of this thread over a few interior blocks' partition
   * computations ({@link PartitionTask#timeWithoutWriting}: the task's read, partition and
   * summary, without its writes), run while Spark is idle.
   */
  private static double kernelRate(StitchingSetup setup) {
    BlockGrid grid = setup.grid();
    List<Integer> interior = new ArrayList<>();
    for (int b = 0; b < grid.blockCount(); b++) {
      if (Arrays.equals(grid.block(b).coreShape(), grid.blockShape())) {
        interior.add(b);
      }
    }
    PartitionTask.timeWithoutWriting(setup, interior.get(0));  // warm-up
    long voxels = 0;
    double cpu0 = threadCpuSeconds();
    for (int i = 0; i < KERNEL_SAMPLES; i++) {
      int b = interior.get(i * interior.size() / KERNEL_SAMPLES);
      PartitionTask.timeWithoutWriting(setup, b);
      voxels += Shapes.elementCount(grid.block(b).coreShape());
    }
    return voxels / (threadCpuSeconds() - cpu0) / 1e6;
  }

  private static double threadCpuSeconds() {
    return ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime() / 1e9;
  }

  /** Time the collectors report (pauses; G1's concurrent marking is not in it). */
  private static double collectionSeconds() {
    long millis = 0;
    for (GarbageCollectorMXBean bean : ManagementFactory.getGarbageCollectorMXBeans()) {
      millis += Math.max(0, bean.getCollectionTime());
    }
    return millis / 1e3;
  }

  private static double processCpuSeconds() {
    return ((com.sun.management.OperatingSystemMXBean) ManagementFactory
        .getOperatingSystemMXBean()).getProcessCpuTime() / 1e9;
  }
}
