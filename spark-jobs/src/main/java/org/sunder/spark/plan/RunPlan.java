package org.sunder.spark.plan;

import java.io.PrintStream;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.apache.spark.SparkConf;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.HaloShortfall;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.progress.ProgressTracker;
import org.sunder.spark.run.RunSettings;
import org.sunder.stitching.PartitionEstimate;
import org.sunder.stitching.PartitionTask;

/**
 * What a run will do, before it does it: the block grid, task counts per stage, memory per
 * partition task ({@link PartitionEstimate}), and a time estimate from running the partition
 * stage's own task computation on one sample block (the central one) in this process, writing
 * nothing ({@link PartitionTask#timeWithoutWriting}).
 */
public final class RunPlan {
  private RunPlan() {}

  /** Prints the plan; times a sample block unless {@code sample} is false. */
  public static void print(RunSettings s, boolean sample, int cores, PrintStream out) {
    AxisOrder axes = new AxisOrder(s.axes());
    BlockGrid grid = s.grid();
    PartitionEstimate memory = PartitionEstimate.of(s.setup());
    int channels = memory.channels();
    out.println("input      " + s.inputContainer() + "  dataset " + s.affinities());
    out.println("volume     " + Arrays.toString(axes.toFile(s.volumeShape())) + " (" + axes
        + "), " + channels + " channels " + memory.valueType()
        + ", chunks " + Arrays.toString(axes.toFile(s.chunkShape())));
    int[][] zyx = new int[channels][];
    for (int k = 0; k < channels; k++) {
      zyx[k] = axes.toFile(s.offsets()[k]);
    }
    out.println("offsets    " + Arrays.deepToString(zyx) + " (" + axes + ")");
    out.println("blocks     shape " + Arrays.toString(axes.toFile(s.blockShape())) + ", halo "
        + Arrays.toString(axes.toFile(s.halo())) + ", grid "
        + Arrays.toString(axes.toFile(grid.gridShape())) + " = " + count(grid.blockCount(), "block"));
    List<HaloShortfall> shortfalls = grid.haloShortfalls(s.setup().offsets().reach());
    for (HaloShortfall shortfall : shortfalls) {
      out.println("note       " + shortfall.message());
    }
    out.println("tasks      partition " + grid.blockCount() + ", seams " + grid.faceCount()
        + ", solve 1 (driver), relabel " + grid.blockCount() + " (" + count(grid.chunkCount(),
        "chunk") + ")" + (s.evaluates() ? ", evaluate " + grid.blockCount() : ""));
    long bytes = memory.bytes();
    out.println(String.format(Locale.ROOT, "memory     about %s per partition task (%d voxels"
        + " in the largest extended block x (%d channels x %d bytes + %d bytes))",
        mebibytes(bytes), memory.extendedVoxels(), channels, memory.bytesPerValue(),
        memory.otherBytesPerVoxel()));
    SparkConf conf = new SparkConf();
    memoryWarning(bytes, conf.getInt("spark.executor.cores", cores), executorMemory(conf))
        .ifPresent(out::println);
    out.println("driver     reduced graph bound solve.maxDriverEdges = " + s.maxDriverEdges()
        + " edges (about " + mebibytes(s.maxDriverEdges() * 100) + ")");
    if (sample) {
      int central = centralBlock(grid);
      Block block = grid.block(central);
      double seconds = PartitionTask.timeWithoutWriting(s.setup(), central);
      out.println(String.format(Locale.ROOT, "estimate   sample block at grid %s, voxels %s (%s),"
          + " partitioned here in %.3f s", Arrays.toString(axes.toFile(block.gridPosition())),
          voxelBox(block, axes), axes, seconds));
      out.println(estimate(grid.blockCount(), seconds, cores));
    }
    out.println("output     " + s.outputContainer() + "  dataset " + s.outputDataset()
        + " (uint64, chunks " + Arrays.toString(axes.toFile(s.chunkShape())) + ")");
    out.println("work dir   " + s.workDir());
  }

  /**
   * The partition stage's estimate: the work ({@code tasks} x {@code seconds}) and the wall
   * time on {@code cores}, in rounds of equal tasks: ceil(tasks / cores) x seconds, so never
   * less than one task.
   */
  public static String estimate(long tasks, double seconds, int cores) {
    long rounds = (tasks + cores - 1) / cores;
    return "           partition stage: about " + duration(tasks * seconds) + " of work, "
        + duration(rounds * seconds) + " on " + count(cores, "core") + " (" + count(tasks,
        "task") + " of about " + duration(seconds) + (rounds == 1 ? "" : ", " + rounds
        + " rounds") + "); seams, solve, relabel and I/O are not estimated";
  }

  /** {@code 0.4 s}, {@code 42.0 s}, {@code 3 min 5 s}, {@code 21 h 4 min}, {@code 3 d 2 h}. */
  public static String duration(double seconds) {
    if (seconds < 60) {
      return String.format(Locale.ROOT, seconds < 1 ? "%.2f s" : "%.1f s", seconds);
    }
    long hours = Math.round(seconds) / 3600;
    if (hours >= 48) {
      return (hours / 24) + " d " + (hours % 24) + " h";
    }
    return ProgressTracker.duration(seconds);
  }

  /** {@code 1 block}, {@code 8 blocks}. */
  public static String count(long n, String noun) {
    return n + " " + noun + (n == 1 ? "" : "s");
  }

  /** The core box as inclusive ranges per axis, in the configuration's order: {@code z 6..11, ...}. */
  static String voxelBox(Block block, AxisOrder axes) {
    long[] min = axes.toFile(block.coreMin());
    long[] max = axes.toFile(block.coreMax());
    StringBuilder box = new StringBuilder();
    for (int d = 0; d < min.length; d++) {
      box.append(d == 0 ? "" : ", ").append(axes.letters().charAt(d)).append(' ')
          .append(min[d]).append("..").append(max[d]);
    }
    return box.toString();
  }

  static int centralBlock(BlockGrid grid) {
    long[] grids = grid.gridShape();
    long[] middle = new long[grids.length];
    for (int d = 0; d < grids.length; d++) {
      middle[d] = grids[d] / 2;
    }
    return grid.blockIndex(middle);
  }

  /**
   * The memory one executor has for its tasks: {@code spark.executor.memory} when the Spark
   * configuration of this process sets it (as {@code spark-submit --executor-memory} does), else
   * this JVM's heap (local mode runs the tasks here).
   */
  static long executorMemory(SparkConf conf) {
    return conf.contains("spark.executor.memory")
        ? conf.getSizeAsBytes("spark.executor.memory") : Runtime.getRuntime().maxMemory();
  }

  /**
   * A warning when {@code cores} partition tasks of {@code taskBytes} each, running at once on
   * one executor ({@code spark.executor.cores}, else the cores planned for), need more than
   * {@code memory}: the run would likely die of out-of-memory.
   */
  static Optional<String> memoryWarning(long taskBytes, int cores, long memory) {
    long needed = taskBytes * Math.max(1, cores);
    if (needed <= memory) {
      return Optional.empty();
    }
    return Optional.of("warning    " + count(Math.max(1, cores), "partition task") + " at once on"
        + " one executor: about " + mebibytes(needed) + ", more than its " + mebibytes(memory)
        + "; give executors more memory (--executor-memory, or -Xmx in local mode) or choose a"
        + " smaller blocks.shape");
  }

  private static String mebibytes(long bytes) {
    return String.format(Locale.ROOT, "%.1f MiB", bytes / (1024.0 * 1024.0));
  }
}
