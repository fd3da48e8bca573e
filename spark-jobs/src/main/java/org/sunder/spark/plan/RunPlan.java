package org.sunder.spark.plan;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.apache.spark.SparkConf;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.BlockShapeChoice;
import org.sunder.blockwise.grid.HaloShortfall;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.config.ByteSize;
import org.sunder.spark.progress.ProgressTracker;
import org.sunder.spark.run.BlockShapeOrigin;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.run.TaskBudget;
import org.sunder.spark.stage.PyramidStep;
import org.sunder.stitching.setup.PartitionEstimate;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.LevelEstimate;
import org.sunder.stitching.solve.SuperBlockSolve;
import org.sunder.stitching.task.LabelPyramid;
import org.sunder.stitching.task.PartitionSample;

/**
 * What a run will do, before it does it: the block grid and where its shape came from (with its
 * halo overhead), task counts per stage and the task records the run writes, memory per
 * partition task ({@link PartitionEstimate}) against the budget per task and one executor's
 * memory, and, from one sample block measured in this process without writing to the run
 * ({@link PartitionSample}: the central block), the time of every stage on the cores given and
 * the reduced graph's expected size against {@code solve.maxDriverEdges}. Runs that cannot fit
 * are refused earlier, by {@link org.sunder.spark.run.RunResolver}, as {@code run} refuses them.
 */
public final class RunPlan {
  /**
   * Seam edges counted per boundary segment near a face, in the reduced graph's estimate: each
   * segment that touches a face meets at least one segment across it. A figure of this class,
   * checked once: on the demo volume (compact cells, 48 x 128 x 128, 12 blocks of 16 x 64 x 64)
   * the estimate was 9948 edges, the run's reduced graph 10177.
   */
  static final double SEAM_EDGES_PER_BOUNDARY_SEGMENT = 1.0;

  private RunPlan() {}

  /** Prints the plan; measures a sample block unless {@code sample} is false. */
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
    BlockShapeOrigin origin = s.blockOrigin();
    double overhead = BlockShapeChoice.overhead(s.volumeShape(), s.blockShape(), s.halo());
    out.println(String.format(Locale.ROOT, "           halo overhead %.2f: the blocks read and"
        + " partition %.2f x the volume's voxels (target at most %.2f); shape %s", overhead,
        overhead, BlockShapeChoice.TARGET_OVERHEAD, origin == null ? "given"
        : origin.limitText()));
    if (origin != null && origin.note() != null) {
      out.println("note       " + origin.note());
    }
    List<HaloShortfall> shortfalls = grid.haloShortfalls(StitchingSetup.longestOffsets(s.offsets()));
    for (HaloShortfall shortfall : shortfalls) {
      out.println("note       " + shortfall.message());
    }
    long pyramidTasks = pyramidTasks(s);
    out.println("tasks      partition " + grid.blockCount() + ", seams " + grid.faceCount()
        + ", solve 1 (driver), relabel " + grid.blockCount() + " (" + count(grid.chunkCount(),
        "chunk") + ")" + (s.evaluates() ? ", evaluate " + grid.blockCount() : "")
        + ", pyramid " + pyramidTasks);
    long records = taskRecords(grid.blockCount(), grid.faceCount(), s.evaluates(), pyramidTasks);
    out.println("records    " + count(records, "task record") + " in the work dir (one file per"
        + " finished task, each beside its timing file)");
    long bytes = memory.bytes();
    out.println(String.format(Locale.ROOT, "memory     about %s per partition task (%d voxels"
        + " in the largest extended block x (%d channels x %d bytes + %d bytes))",
        ByteSize.format(bytes), memory.extendedVoxels(), channels, memory.bytesPerValue(),
        memory.otherBytesPerVoxel()));
    TaskBudget budget = origin == null ? TaskBudget.of(new SparkConf(), cores, null)
        : origin.budget();
    out.println("           budget " + ByteSize.format(budget.memoryPerTask()) + " per task ("
        + budget.memorySource() + "), " + ByteSize.format(budget.executorMemory())
        + " per executor with " + count(budget.executorCores(), "core") + String.format(
        Locale.ROOT, "; a task uses %.0f%% of its budget", 100.0 * bytes
        / budget.memoryPerTask()));
    memoryWarning(bytes, budget.executorCores(), budget.executorMemory()).ifPresent(out::println);
    if (sample) {
      int central = centralBlock(grid);
      Block block = grid.block(central);
      PartitionSample measured = PartitionSample.measure(s.setup(), central);
      out.println(String.format(Locale.ROOT, "estimate   sample block at grid %s, voxels %s (%s),"
          + " partitioned here in %.3f s (reading %.3f s): %d segments, %d near a face, %d inner"
          + " edges", Arrays.toString(axes.toFile(block.gridPosition())), voxelBox(block, axes),
          axes, measured.seconds(), measured.readSeconds(), measured.segments(),
          measured.boundarySegments(), measured.innerEdges()));
      long edges = reducedGraphEdges(grid, measured);
      for (String line : stageTimes(s, measured, edges, cores)) {
        out.println(line);
      }
      out.println(String.format(Locale.ROOT, "driver     reduced graph about %d edges (estimate:"
          + " the sample's inner edges per block, and %s seam edge per boundary segment near"
          + " a face), %.1f%% of solve.maxDriverEdges = %d", edges,
          trim(SEAM_EDGES_PER_BOUNDARY_SEGMENT), 100.0 * edges / s.maxDriverEdges(),
          s.maxDriverEdges()));
      if (edges > s.maxDriverEdges() && SuperBlockSolve.supports(s.setup().partition())) {
        for (String line : levelLines(s, edges)) {
          out.println(line);
        }
      } else if (edges > s.maxDriverEdges()) {
        out.println("warning    the reduced graph may exceed solve.maxDriverEdges; the solve"
            + " would stop before gathering it: raise the bound (and the driver's memory) or"
            + " choose larger blocks");
      }
    } else {
      out.println("driver     reduced graph bound solve.maxDriverEdges = " + s.maxDriverEdges()
          + " edges; no sample, so no estimate of the stages' times or the graph's size");
    }
    out.println("output     " + s.outputContainer() + "  dataset " + s.outputDataset()
        + " (uint64, chunks " + Arrays.toString(axes.toFile(s.chunkShape())) + ")");
    out.println("work dir   " + s.workDir());
  }

  /**
   * The level-by-level solve's shape ({@link LevelEstimate}) for a reduced graph of about
   * {@code pairs} pairs above the driver bound: levels, the largest task's graph and the
   * driver's share, with their memory.
   */
  static List<String> levelLines(RunSettings s, long pairs) {
    LevelEstimate e = LevelEstimate.of(s.setup(), pairs, s.maxDriverEdges());
    List<String> lines = new ArrayList<>();
    lines.add(String.format(Locale.ROOT, "levels     the solve runs level by level over"
        + " super-blocks: %d levels (each taken to hand up %s of its edges), %s records",
        e.levels(), trim(LevelEstimate.handedUpPerLevel(s.setup().partition())),
        e.taskRecords()));
    lines.add(String.format(Locale.ROOT, "           largest task about %d edges (%s); the"
        + " driver's share about %d edges (%s)%s", e.largestTaskEdges(),
        ByteSize.format(LevelEstimate.bytes(e.largestTaskEdges())), e.driverEdges(),
        ByteSize.format(LevelEstimate.bytes(e.driverEdges())), e.fits() ? ""
        : "; above solve.maxDriverEdges after the last level: the solve would stop, raise the"
        + " bound or choose larger blocks"));
    if (s.setup().partition().minSegmentSize() > 1) {
      LevelEstimate f = LevelEstimate.sizeFilterOf(s.setup(), pairs, s.maxDriverEdges());
      lines.add(String.format(Locale.ROOT, "           then the size filter, level by level"
          + " from the blocks' statistics: %d levels, %d records; largest task about %d rows"
          + " (%s), the driver's share about %d rows (%s)%s", f.levels(), f.taskRecords(),
          f.largestTaskEdges(), ByteSize.format(LevelEstimate.bytes(f.largestTaskEdges())),
          f.driverEdges(), ByteSize.format(LevelEstimate.bytes(f.driverEdges())), f.fits() ? ""
          : "; above its bound after the last level: the filter would stop, raise the bound or"
          + " choose larger blocks"));
    }
    return lines;
  }

  /**
   * One line per stage with its work and wall time on {@code cores}, each naming what it was
   * extrapolated from, and a total.
   */
  static List<String> stageTimes(RunSettings s, PartitionSample sample, long graphEdges,
      int cores) {
    BlockGrid grid = s.grid();
    List<String> lines = new ArrayList<>();
    double partition = sample.seconds();
    lines.add("           " + estimate("partition", grid.blockCount(), partition, cores)
        + ": the sample block's partition");
    double seam = sample.seamFaces() == 0 ? 0 : sample.seamSeconds() / sample.seamFaces();
    lines.add("           " + estimate("seams", grid.faceCount(), seam, cores) + ": the sample's"
        + " " + count(sample.seamFaces(), "face") + ", slab read and graph (label read and"
        + " aggregation not timed)");
    double solve = PartitionEstimate.solveSeconds(s.setup(), graphEdges);
    lines.add("           " + estimate("solve", 1, solve, cores) + ": the reduced graph's"
        + " estimated edges (below) at the method's measured cost per edge");
    double relabel = sample.relabelSeconds();
    lines.add("           " + estimate("relabel", grid.blockCount(), relabel, cores)
        + ": the sample's chunks read, mapped and rewritten");
    double total = rounds(grid.blockCount(), cores) * partition
        + rounds(grid.faceCount(), cores) * seam + rounds(grid.blockCount(), cores) * relabel;
    if (s.evaluates()) {
      lines.add("           " + estimate("evaluate", grid.blockCount(), relabel, cores)
          + ": as relabel (two chunk reads in place of a read and a write)");
      total += rounds(grid.blockCount(), cores) * relabel;
    }
    double pyramid = pyramidSeconds(s, sample);
    int pyramidTasks = PyramidStep.taskOffsets(PyramidStep.plan(s))[PyramidStep.plan(s)
        .levelCount()];
    if (pyramidTasks > 0) {
      lines.add("           " + estimate("pyramid", pyramidTasks, pyramid / pyramidTasks, cores)
          + ": the sample's relabel time per voxel, for the voxels each level reads");
    }
    total += solve + rounds(pyramidTasks, cores) * (pyramidTasks == 0 ? 0 : pyramid / pyramidTasks);
    lines.add("           total      about " + duration(total) + " on " + count(cores, "core"));
    return lines;
  }

  /**
   * The pyramid's work in seconds: each level reads the voxels of the level before, at the
   * sample's relabel cost per voxel (a chunk read, mapped and written).
   */
  static double pyramidSeconds(RunSettings s, PartitionSample sample) {
    if (sample.relabelVoxels() == 0) {
      return 0;
    }
    LabelPyramid pyramid = PyramidStep.plan(s);
    double perVoxel = sample.relabelSeconds() / sample.relabelVoxels();
    double voxels = 0;
    for (int level = 1; level < pyramid.levelCount(); level++) {
      voxels += Shapes.elementCount(pyramid.shapes()[level - 1]);
    }
    return voxels * perVoxel;
  }

  /**
   * One stage's estimate: the work ({@code tasks} x {@code seconds}) and the wall time on
   * {@code cores}, in rounds of equal tasks: ceil(tasks / cores) x seconds, so never less than
   * one task.
   */
  public static String estimate(String stage, long tasks, double seconds, int cores) {
    long rounds = rounds(tasks, cores);
    return String.format(Locale.ROOT, "%-10s about %s of work, %s on %s (%s of about %s%s)",
        stage, duration(tasks * seconds), duration(rounds * seconds), count(cores, "core"),
        count(tasks, "task"), duration(seconds), rounds <= 1 ? "" : ", " + rounds + " rounds");
  }

  private static long rounds(long tasks, int cores) {
    return (tasks + cores - 1) / cores;
  }

  /**
   * The reduced graph's edges extrapolated from the sample: its inner edges per block, plus per
   * face the boundary segments near that face (the mean of the sample's two sides along the
   * face's axis, or the one it has) times {@link #SEAM_EDGES_PER_BOUNDARY_SEGMENT}.
   */
  static long reducedGraphEdges(BlockGrid grid, PartitionSample sample) {
    long[] g = grid.gridShape();
    int[] perSide = sample.boundaryPerSide();
    double edges = (double) grid.blockCount() * sample.innerEdges();
    for (int axis = 0; axis < g.length; axis++) {
      long faces = g[axis] - 1;
      for (int d = 0; d < g.length; d++) {
        faces *= d == axis ? 1 : g[d];
      }
      double near = Math.max(perSide[2 * axis], perSide[2 * axis + 1]);
      if (perSide[2 * axis] > 0 && perSide[2 * axis + 1] > 0) {
        near = (perSide[2 * axis] + perSide[2 * axis + 1]) / 2.0;
      }
      edges += faces * near * SEAM_EDGES_PER_BOUNDARY_SEGMENT;
    }
    return Math.round(edges);
  }

  /**
   * Task records a whole run writes: one per partition, seams, relabel and (with a ground truth)
   * evaluate task, one for the solve, one per pyramid task.
   */
  static long taskRecords(long blocks, long faces, boolean evaluates, long pyramidTasks) {
    return blocks + faces + 1 + blocks + (evaluates ? blocks : 0) + pyramidTasks;
  }

  private static long pyramidTasks(RunSettings s) {
    int[] offsets = PyramidStep.taskOffsets(PyramidStep.plan(s));
    return offsets[offsets.length - 1];
  }

  private static String trim(double value) {
    return value == Math.rint(value) ? Long.toString((long) value) : Double.toString(value);
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
    return ByteSize.format(bytes);
  }
}
