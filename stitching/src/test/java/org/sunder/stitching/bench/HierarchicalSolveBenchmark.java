package org.sunder.stitching.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.solve.HierarchicalSolve;
import org.sunder.stitching.solve.MutexPartSolver;
import org.sunder.stitching.solve.RepresentativeMaps;
import org.sunder.stitching.solve.SolveEdges;
import org.sunder.stitching.solve.SuperBlocks;

/**
 * Scale of the hierarchical Mutex Watershed solve on synthetic reduced graphs of many blocks:
 * each block holds a lattice of {@code n^3} segments; a segment's pairs go to its lattice
 * neighbours along each axis (across block faces too) and to the segment two steps on along
 * axis 0 inside its block; hidden objects are warped boxes a few blocks wide, so their borders
 * cross blocks at random; a pair inside an object is attractive, across objects repulsive, 3 %
 * of signs flipped, magnitudes noisy, and 30 % of pairs carry an edge of the other sign too
 * ({@code exact}: weights +1 and -1, no flips). Level 1's part inputs are generated per part
 * from the blocks' deterministic edges, as partition and seam tasks would write them; outputs go
 * through edge files in a temporary work dir.
 *
 * <p>Prints per level: parts, distinct edges in, settled, held back, handed up, the largest
 * part, the bytes its task allocated (an upper bound of its working memory), wall seconds and
 * this thread's CPU seconds (level 1's include generating its inputs; CPU time is the fair
 * figure on a shared machine), the parts' own solve seconds and edges per CPU second; then the
 * driver's edges and share of the time, the cost per edge and the ratio of costs per edge
 * between the largest and the smallest size (sizes up to {@value #MAX_REPEATED_EDGES} edges run
 * {@value #REPEATS} times, and their median cost counts). The smallest size runs once first as a warm-up, so
 * the figures compared are those of compiled code. Where the whole graph fits in memory it also
 * runs the single-level solve and reports whether the partitions are equal.
 *
 * <p>Arguments (optional): edge counts, comma-separated (default {@code 1e6,1e7,1e8});
 * {@code noisy} (default) or {@code exact}; driver bound as a fraction of the edges (default
 * 0.06; doubled until the last level's rest fits). {@code -Dfactor=N} groups N blocks per axis
 * into a super-block (default 2, what a run uses). Run with the heap touched in advance,
 * {@code SUNDER_JAVA_OPTS="-Xms8g -Xmx8g -XX:+AlwaysPreTouch"}: otherwise a run that grows the
 * heap pays the machine's first touch of that memory as its own CPU time (system time in its
 * page faults), and on this machine the small size's five runs then read 175 to 819 ns per edge
 * where touched in advance they read within 4 to 23 % of each other.
 */
public final class HierarchicalSolveBenchmark {
  private static final int N = 12;
  private static final int SEGMENTS = N * N * N;
  private static final double EDGES_PER_SEGMENT = 5.3;
  /**
   * Runs of each size up to {@link #MAX_REPEATED_EDGES} edges, whose median is compared: a small
   * size takes a fraction of a second, so one run's figure swings with the machine's load.
   */
  private static final int REPEATS = 5;
  private static final long MAX_REPEATED_EDGES = 20_000_000;
  private static final java.lang.management.ThreadMXBean THREADS =
      java.lang.management.ManagementFactory.getThreadMXBean();

  private HierarchicalSolveBenchmark() {}

  public static void main(String[] args) throws Exception {
    String[] sizes = (args.length > 0 ? args[0] : "1e6,1e7,1e8").split(",");
    boolean exact = args.length > 1 && args[1].equals("exact");
    double boundFraction = args.length > 2 ? Double.parseDouble(args[2]) : 0.06;
    List<double[]> costs = new ArrayList<>();
    if (!java.lang.management.ManagementFactory.getRuntimeMXBean().getInputArguments()
        .contains("-XX:+AlwaysPreTouch")) {
      System.out.println("the heap is not touched in advance: a run that grows it pays page"
          + " faults as CPU time; for comparable figures run with -Xms equal to -Xmx and"
          + " -XX:+AlwaysPreTouch");
    }
    long smallest = (long) Double.parseDouble(sizes[0]);
    System.out.printf(Locale.ROOT, "warm-up at %d edges (compiles the solve's code; figures"
        + " not counted)%n", smallest);
    runOne(smallest, exact, boundFraction);
    for (String size : sizes) {
      long target = (long) Double.parseDouble(size);
      int repeats = target <= MAX_REPEATED_EDGES ? REPEATS : 1;
      double[] perEdge = new double[repeats];
      for (int r = 0; r < repeats; r++) {
        perEdge[r] = runOne(target, exact, boundFraction);
      }
      Arrays.sort(perEdge);
      double median = perEdge[repeats / 2];
      if (repeats > 1) {
        System.out.printf(Locale.ROOT, "%d runs at %.0e edges, CPU ns per edge: %s; median %.0f%n",
            repeats, (double) target, Arrays.toString(Arrays.stream(perEdge)
                .mapToLong(Math::round).toArray()), median);
      }
      costs.add(new double[] {target, median});
    }
    if (costs.size() > 1) {
      double[] first = costs.get(0);
      double[] last = costs.get(costs.size() - 1);
      System.out.printf(Locale.ROOT, "cost per edge at %.0e edges over %.0e edges: %.2f"
          + " (CPU time; target within 1.30)%n", last[0], first[0], last[1] / first[1]);
    }
  }

  /** Runs one size; returns nanoseconds per edge over all levels and the driver. */
  private static double runOne(long target, boolean exact, double boundFraction)
      throws Exception {
    long blocksWanted = Math.max(8, Math.round(target / (SEGMENTS * EDGES_PER_SEGMENT)));
    int g = (int) Math.max(2, Math.round(Math.cbrt(blocksWanted)));
    int gz = (int) Math.max(2, Math.round((double) blocksWanted / ((long) g * g)));
    BlockGrid grid = BlockGrid.of(new long[] {16L * g, 16L * g, 8L * gz}, new int[] {16, 16, 8},
        new int[] {16, 16, 8}, new int[] {1, 1, 1});
    IdLayout layout = IdLayout.forGrid(grid);
    SuperBlocks superBlocks = new SuperBlocks(grid, layout, Integer.getInteger("factor", 2));
    SyntheticBlocks synth = new SyntheticBlocks(grid, layout, exact, 17);
    long edges = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      edges += synth.ownedEdges(b).size();
    }
    long bound = Math.max(1000, (long) (edges * boundFraction));
    System.out.printf(Locale.ROOT, "%n== %d blocks (%d x %d x %d), %d segments, %d edges, %s"
        + " weights, driver bound from %d ==%n", grid.blockCount(), g, g, gz,
        (long) grid.blockCount() * SEGMENTS, edges, exact ? "exact" : "noisy", bound);
    Path work = Files.createTempDirectory("sunder-hierarchical-bench");
    HierarchicalSolve.Result result = null;
    double total = 0;
    while (result == null) {
      long start = java.lang.management.ManagementFactory.getThreadMXBean()
          .getCurrentThreadCpuTime();
      try {
        result = HierarchicalSolve.run(superBlocks, edges,
            p -> p < 0 ? synth.all() : synth.partInput(superBlocks, p), bound,
            new MutexPartSolver(), work);
      } catch (org.sunder.blockwise.SunderException tooSmall) {
        System.out.println("bound " + bound + " too small: " + tooSmall.getMessage());
        bound *= 2;
      }
      total = (java.lang.management.ManagementFactory.getThreadMXBean()
          .getCurrentThreadCpuTime() - start - synth.generationCpuNanos) / 1e9;
      System.out.printf(Locale.ROOT, "generating level 1's inputs: %.2f CPU s (left out of"
          + " the costs below, except the level's CPU s column)%n",
          synth.generationCpuNanos / 1e9);
      synth.generationCpuNanos = 0;
    }
    System.out.println("level  parts    edges in     settled   held back   handed up"
        + "   largest part  task MB   wall s   solve s    CPU s  edges/CPU s");
    for (HierarchicalSolve.LevelFigures f : result.levels()) {
      System.out.printf(Locale.ROOT,
          "%5d %6d %11d %11d %11d %11d %14d %8.1f %8.2f %8.2f %8.2f %11.3g%n",
          f.level(), f.parts(), f.inputEdges(), f.decidedEdges(), f.heldBackEdges(),
          f.handedUpEdges(), f.largestPartEdges(), f.largestPartAllocatedBytes() / 1e6,
          f.seconds(), f.solveSeconds(), f.cpuSeconds(), f.inputEdges() / f.cpuSeconds());
    }
    System.out.printf(Locale.ROOT, "driver: %d edges (%.2f %% of the graph), %.2f CPU s = %.1f"
        + " %% of %.2f CPU s; %.0f CPU ns per edge%n", result.driverEdges(),
        100.0 * result.driverEdges() / edges, result.driverSeconds(),
        100 * result.driverSeconds() / total, total, total * 1e9 / edges);
    if (edges <= 2e7) {
      SolveEdges all = synth.all();
      HierarchicalSolve.Result whole = HierarchicalSolve.run(superBlocks, all, Long.MAX_VALUE,
          new MutexPartSolver(), null);
      RepresentativeMaps single = whole.representatives();
      double singleSeconds = whole.driverSeconds();
      boolean equal = true;
      for (int b = 0; b < grid.blockCount() && equal; b++) {
        for (int k = 1; k <= SEGMENTS; k++) {
          long id = layout.provisional(b, k);
          if (single.resolve(id) != result.representatives().resolve(id)) {
            equal = false;
            break;
          }
        }
      }
      System.out.printf(Locale.ROOT, "single-level solve: %.2f CPU s; partitions %s%n",
          singleSeconds, equal ? "identical" : "DIFFER");
    }
    BlockwiseRuns.deleteTree(work);
    return total * 1e9 / edges;
  }

  /** The deterministic synthetic edges of each block (see the class comment). */
  private static final class SyntheticBlocks {
    private final BlockGrid grid;
    private final IdLayout layout;
    private final boolean exact;
    private final long seed;
    private final long[] shape;
    private final double objectSize = 2.3 * N;
    /** CPU time spent generating level 1's inputs (not part of the solve's cost). */
    long generationCpuNanos;

    SyntheticBlocks(BlockGrid grid, IdLayout layout, boolean exact, long seed) {
      this.grid = grid;
      this.layout = layout;
      this.exact = exact;
      this.seed = seed;
      this.shape = grid.gridShape();
    }

    private long object(long x, long y, long z) {
      double wx = x + 0.35 * objectSize * Math.sin(y / 5.0 + z / 9.0);
      double wy = y + 0.35 * objectSize * Math.sin(z / 6.0 + x / 8.0);
      double wz = z + 0.35 * objectSize * Math.sin(x / 7.0 + y / 4.0);
      long cx = (long) Math.floor(wx / objectSize);
      long cy = (long) Math.floor(wy / objectSize);
      long cz = (long) Math.floor(wz / objectSize);
      return (cx * 73856093L) ^ (cy * 19349663L) ^ (cz * 83492791L);
    }

    /** The edges of pairs whose lower end (by lattice position) lies in block {@code b}. */
    SolveEdges ownedEdges(int b) {
      long[] p = grid.gridPosition(b);
      Random random = new Random(seed * 1_000_003L + b);
      SolveEdges out = new SolveEdges(SEGMENTS * 6);
      long[] q = new long[3];
      for (int k = 0; k < N; k++) {
        for (int j = 0; j < N; j++) {
          for (int i = 0; i < N; i++) {
            long x = p[0] * N + i;
            long y = p[1] * N + j;
            long z = p[2] * N + k;
            long self = layout.provisional(b, 1 + i + N * (j + N * k));
            long own = object(x, y, z);
            for (int axis = 0; axis < 4; axis++) {
              long[] d = {axis == 0 ? 1 : axis == 3 ? 2 : 0, axis == 1 ? 1 : 0,
                  axis == 2 ? 1 : 0};
              long tx = x + d[0];
              long ty = y + d[1];
              long tz = z + d[2];
              if (axis == 3 && i + 2 >= N) {
                continue;
              }
              q[0] = tx / N;
              q[1] = ty / N;
              q[2] = tz / N;
              if (q[0] >= shape[0] || q[1] >= shape[1] || q[2] >= shape[2]) {
                continue;
              }
              int tb = grid.blockIndex(q);
              long other = layout.provisional(tb,
                  1 + tx % N + N * (ty % N + N * (tz % N)));
              boolean same = own == object(tx, ty, tz);
              addPair(out, self, other, same, random);
            }
          }
        }
      }
      return out;
    }

    private void addPair(SolveEdges out, long a, long b, boolean same, Random random) {
      long lo = Math.min(a, b);
      long hi = Math.max(a, b);
      boolean flip = !exact && random.nextDouble() < 0.03;
      double strong = exact ? 1 : 0.6 + 0.4 * random.nextDouble();
      double w = (same ^ flip) ? strong : -strong;
      if (flip) {
        w *= 0.5;
      }
      boolean both = random.nextDouble() < 0.3;
      double other = exact ? -w : -Math.signum(w) * 0.3 * random.nextDouble();
      double max = both ? Math.max(w, other) : w;
      double min = both ? Math.min(w, other) : w;
      if (max > 0) {
        out.add(lo, hi, max, lo, hi, SolveEdges.MAX);
      }
      if (min < 0) {
        out.add(lo, hi, min, lo, hi, SolveEdges.MIN);
      }
    }

    /** Every block's edges. */
    SolveEdges all() {
      SolveEdges all = new SolveEdges(16);
      for (int b = 0; b < grid.blockCount(); b++) {
        all.addAll(ownedEdges(b));
      }
      return all;
    }

    /** Level 1's input of part {@code part}: every edge with an end in it. */
    SolveEdges partInput(SuperBlocks superBlocks, int part) {
      long cpu = THREADS.getCurrentThreadCpuTime();
      int f = superBlocks.factor();
      long[] parts = new long[3];
      for (int d = 0; d < 3; d++) {
        parts[d] = (shape[d] + f - 1) / f;
      }
      long[] origin = {f * (part % parts[0]), f * (part / parts[0] % parts[1]),
          f * (part / (parts[0] * parts[1]))};
      SolveEdges in = new SolveEdges(16);
      long[] q = new long[3];
      // the part's blocks and, below each of its lower faces, the blocks whose pairs reach in
      for (q[2] = Math.max(0, origin[2] - 1); q[2] < Math.min(shape[2], origin[2] + f); q[2]++) {
        for (q[1] = Math.max(0, origin[1] - 1); q[1] < Math.min(shape[1], origin[1] + f);
            q[1]++) {
          for (q[0] = Math.max(0, origin[0] - 1); q[0] < Math.min(shape[0], origin[0] + f);
              q[0]++) {
            SolveEdges owned = ownedEdges(grid.blockIndex(q));
            for (int e = 0; e < owned.size(); e++) {
              if (superBlocks.partOfNode(owned.u(e), 1) == part
                  || superBlocks.partOfNode(owned.v(e), 1) == part) {
                in.add(owned, e, owned.u(e), owned.v(e));
              }
            }
          }
        }
      }
      generationCpuNanos += THREADS.getCurrentThreadCpuTime() - cpu;
      return in;
    }
  }
}
