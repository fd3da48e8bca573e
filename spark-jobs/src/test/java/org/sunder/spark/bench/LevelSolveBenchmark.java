package org.sunder.spark.bench;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.lang.management.ManagementFactory;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.spark.it.Scenes;
import org.sunder.spark.it.SharedSpark;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.stage.Pipeline;
import org.sunder.spark.stage.StageFiles;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.solve.LevelTasks;

/**
 * The level-by-level solve through the real stages in {@code local[2]}, at two volume sizes
 * under one low driver bound: per level its parts, edges in, wall time (first task start to last
 * task end), edges per second of task time and the most a task allocated; the driver's share;
 * and the driver thread's allocation over the whole solve stage (in local mode the executors
 * share the driver's JVM, so its heap is not the driver's alone: the driver thread's allocated
 * bytes, {@code com.sun.management.ThreadMXBean}, bound what the driver held). Not a test.
 * Arguments: {@code [dir] [bound] [side...]}; the sizes are 64 x side x side (z y x), by default
 * 192 and 384, blocks of 16 x 32 x 32. A scene already in {@code dir} is reused (its finished
 * tasks skipped); a bound the rest does not fit under after the levels is doubled and the solve
 * redone. The method is the Mutex Watershed, or the one named by the system property
 * {@value #METHOD_PROPERTY} (a JSON method name, e.g. {@code fragments-multicut}, or a whole
 * {@code "partition"} section, e.g. {@code {}} for the default method with its size filter,
 * whose filter runs as a second pass of levels, printed apart). Also printed:
 * per level the parts' summed task time over the level's wall time (2 when both cores work the
 * whole level), and the process's CPU time over the solve stage's wall time.
 */
public final class LevelSolveBenchmark {
  private static final int[] BLOCK_XYZ = {32, 32, 16};
  /** The system property naming the partition method. */
  static final String METHOD_PROPERTY = "sunder.bench.method";

  private LevelSolveBenchmark() {}

  public static void main(String[] args) throws Exception {
    Path dir = args.length > 0 ? Path.of(args[0]) : Files.createTempDirectory("sunder-levels");
    long bound = args.length > 1 ? Long.parseLong(args[1]) : 1_000_000;
    long[] sides = args.length > 2 ? new long[args.length - 2] : new long[] {192, 384};
    for (int i = 2; i < args.length; i++) {
      sides[i - 2] = Long.parseLong(args[i]);
    }
    JavaSparkContext sc = SharedSpark.start("local[2]");
    try {
      for (long side : sides) {
        run(sc, dir.resolve("v" + side), new long[] {64, side, side}, bound);
      }
    } finally {
      sc.stop();
    }
  }

  private static void run(JavaSparkContext sc, Path dir, long[] zyx, long bound)
      throws Exception {
    Path root = dir.resolve("bench.zarr");
    long voxels = zyx[0] * zyx[1] * zyx[2];
    Path config = dir.resolve("bench.json");
    if (!Files.exists(config)) {
      double scale = voxels / (64.0 * 56 * 20);
      SynthSpec spec = SynthSpec.small(13).withShape(zyx[2], zyx[1], zyx[0]).withCounts(
          (int) (30 * scale), (int) Math.max(1, 4 * scale), (int) Math.max(1, scale));
      SyntheticScenario.write(Container.create(root, StorageFormat.ZARR), spec,
          ScenarioOptions.defaults().withDegradation(Degradation.moderate(13))
              .withChunkShape(BLOCK_XYZ));
      String method = System.getProperty(METHOD_PROPERTY, "mutex-watershed");
      Scenes.writeConfig(config, root, BLOCK_XYZ, method.startsWith("{") ? method
          : "{\"method\": \"" + method + "\"}", null);
    }
    String json = Files.readString(config).replaceAll(
        "\"solve\":\\s*\\{\"maxDriverEdges\":\\s*[0-9]+\\},\\s*", "");
    ByteArrayOutputStream log = new ByteArrayOutputStream();
    PrintStream quiet = new PrintStream(log, true, StandardCharsets.UTF_8);
    WorkDir work;
    com.sun.management.ThreadMXBean threads =
        (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
    long driverAllocated;
    double solveSeconds;
    com.sun.management.OperatingSystemMXBean os = (com.sun.management.OperatingSystemMXBean)
        ManagementFactory.getOperatingSystemMXBean();
    long processCpu;
    while (true) {
      Files.writeString(config, json.replace("\"evaluate\"",
          "\"solve\":{\"maxDriverEdges\":" + bound + "},\"evaluate\""));
      try (PreparedRun run = RunLoader.prepare(config, null, false)) {
        work = run.workDir();
        new Pipeline(sc, quiet, quiet, false).run(run, List.of(Stage.PARTITION, Stage.SEAMS));
      }
      long allocated = threads.getCurrentThreadAllocatedBytes();
      processCpu = os.getProcessCpuTime();
      long start = System.nanoTime();
      try (PreparedRun run = RunLoader.prepare(config, null, false)) {
        new Pipeline(sc, quiet, quiet, false).run(run, List.of(Stage.SOLVE));
      } catch (org.sunder.blockwise.SunderException tooLow) {
        System.out.println("bound " + bound + " too low: " + tooLow.getMessage());
        bound *= 2;
        log.reset();
        continue;
      }
      solveSeconds = (System.nanoTime() - start) / 1e9;
      processCpu = os.getProcessCpuTime() - processCpu;
      driverAllocated = threads.getCurrentThreadAllocatedBytes() - allocated;
      break;
    }
    int blocks = 0;
    long pairs = 0;
    while (work.ledger(Stage.PARTITION).isFinished(blocks)) {
      pairs += StageFiles.summaryRecord(work, blocks++).pairs();
    }
    System.out.printf(Locale.ROOT, "volume %d x %d x %d (zyx) = %.1f M voxels, %d blocks,"
        + " bound %d pairs%n", zyx[0], zyx[1], zyx[2], voxels / 1e6, blocks, bound);
    for (String line : log.toString(StandardCharsets.UTF_8).split("\n")) {
      if (line.startsWith("solve") || line.startsWith("size filter")) {
        System.out.println("  " + line);
      }
    }
    PayloadCodec codec = new PayloadCodec();
    StageLedger solve = work.ledger(Stage.SOLVE);
    long levelEdges = 0;
    double levelTaskSeconds = 0;
    for (String pass : new String[] {"", "filter-"}) {
      if (!solve.step(pass + "driver").isFinished(0)) {
        continue;
      }
      PassFigures figures = pass(solve, pass, codec);
      levelEdges += figures.levelEdges();
      levelTaskSeconds += figures.taskSeconds();
    }
    System.out.printf(Locale.ROOT, "  ids wall %.2f s%n", wall(solve.step("ids")));
    System.out.printf(Locale.ROOT, "  solve stage %.2f s; level tasks %.0f ns per edge; driver"
        + " thread allocated %.1f MB over the stage (%d reduced-graph pairs: %.1f bytes per"
        + " pair)%n", solveSeconds, 1e9 * levelTaskSeconds / levelEdges, driverAllocated / 1e6,
        pairs, (double) driverAllocated / pairs);
    System.out.printf(Locale.ROOT, "  solve stage: process CPU %.2f s over %.2f s wall (%.2f"
        + " cores busy on average)%n", processCpu / 1e9, solveSeconds,
        processCpu / 1e9 / solveSeconds);
  }

  /**
   * Prints one pass's levels ({@code prefix} "" for the solve, "filter-" for the size filter
   * after it), its driver and its down steps.
   */
  private static PassFigures pass(StageLedger solve, String prefix, PayloadCodec codec) {
    long levelEdges = 0;
    double levelTaskSeconds = 0;
    String name = prefix.isEmpty() ? "solve" : "size filter";
    for (int level = 1; solve.step(prefix + "up-" + level).isFinished(0); level++) {
      StageLedger up = solve.step(prefix + "up-" + level);
      long edges = 0;
      double taskSeconds = 0;
      long maxAllocated = 0;
      int parts = 0;
      for (; up.isFinished(parts); parts++) {
        LevelTasks.PartRecord r = codec.decode(up.read(parts), LevelTasks.PartRecord.class, "");
        edges += r.inputEdges();
        taskSeconds += r.seconds();
        maxAllocated = Math.max(maxAllocated, r.allocatedBytes());
      }
      levelEdges += edges;
      levelTaskSeconds += taskSeconds;
      System.out.printf(Locale.ROOT, "  %s level %d: %d tasks, %d edges, wall %.2f s, %.0f"
          + " edges/s of task time (%.0f ns per edge), task peak allocation %.1f MB, task time"
          + " over wall %.2f%n", name, level, parts, edges, wall(up), edges / taskSeconds,
          1e9 * taskSeconds / edges, maxAllocated / 1e6, taskSeconds / wall(up));
    }
    LevelTasks.DriverRecord d = codec.decode(solve.step(prefix + "driver").read(0),
        LevelTasks.DriverRecord.class, "");
    System.out.printf(Locale.ROOT, "  %s driver: %d edges, %.2f s, allocated %.1f MB; down"
        + " steps wall %.2f s%n", name, d.edges(), d.seconds(), d.allocatedBytes() / 1e6,
        downWall(solve, prefix));
    return new PassFigures(levelEdges, levelTaskSeconds);
  }

  /** A pass's edges over its levels and its parts' summed task seconds. */
  private record PassFigures(long levelEdges, double taskSeconds) {}

  private static double downWall(StageLedger solve, String prefix) {
    double sum = 0;
    for (int level = 1; solve.step(prefix + "down-" + level).isFinished(0); level++) {
      sum += wall(solve.step(prefix + "down-" + level));
    }
    return sum;
  }

  /** First task start to last task end of a step, in seconds. */
  private static double wall(StageLedger step) {
    long first = Long.MAX_VALUE;
    long last = Long.MIN_VALUE;
    for (long[] row : step.timings()) {
      first = Math.min(first, row[1]);
      last = Math.max(last, row[2]);
    }
    return first == Long.MAX_VALUE ? 0 : (last - first) / 1e3;
  }
}
