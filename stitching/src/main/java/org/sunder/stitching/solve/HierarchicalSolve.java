package org.sunder.stitching.solve;

import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.IntFunction;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * The level driver of the hierarchical solve, run in this thread (the in-process runner's way;
 * a distributed run gives each part of a level to one task and keeps only this loop's
 * bookkeeping on its driver).
 *
 * <p>While the reduced graph has more edges than the driver bound, the next level groups the
 * parts of the previous one into super-blocks ({@link SuperBlocks}) and solves each as a part
 * ({@link PartSolver}): it settles what it can settle alone and hands up the rest, contracted.
 * Level 1's parts get the reduced graph's edges (an edge between two parts goes to both); level
 * {@code l + 1}'s part gets what its sub-parts handed up, the copies of each edge joined
 * ({@link PartSolver#gather}). When the rest fits under the bound, the driver solves it
 * whole. With a work dir every part's output is an {@link EdgeFile} there, as in a distributed
 * run ({@code level-<l>/part-<p>.out}; the files stay after the solve); without one they stay
 * in memory.
 */
public final class HierarchicalSolve {
  private HierarchicalSolve() {}

  /**
   * Figures of one level.
   *
   * @param level 1, 2, ...; the driver's solve is reported apart
   * @param parts parts that had edges
   * @param inputEdges distinct edges of the level's graph
   * @param decidedEdges inner edges settled by the parts
   * @param heldBackEdges inner edges handed up undecided
   * @param handedUpEdges distinct edges of the next level's graph
   * @param largestPartEdges edges of the largest part (copies of crossing edges included)
   * @param largestPartAllocatedBytes bytes the largest-allocating part's task allocated while it
   *     ran (an upper bound of its working memory, input excluded)
   * @param seconds wall time of the level (all parts one after another, files included)
   * @param solveSeconds the parts' own solve time, summed
   * @param cpuSeconds CPU time of this thread over the level (files included)
   */
  public record LevelFigures(int level, int parts, long inputEdges, long decidedEdges,
      long heldBackEdges, long handedUpEdges, long largestPartEdges,
      long largestPartAllocatedBytes, double seconds, double solveSeconds, double cpuSeconds) {}

  /**
   * @param representatives every level's merges, the driver's last
   * @param levels figures of the levels before the driver's solve (empty if it fit at once)
   * @param driverEdges edges the driver solved
   * @param driverSeconds the driver's solve time (CPU time of this thread; gathering included)
   */
  public record Result(RepresentativeMaps representatives, List<LevelFigures> levels,
      long driverEdges, double driverSeconds) {}

  /**
   * Solves {@code edges} (one copy per key: a whole reduced graph).
   *
   * @param maxDriverEdges the most edges the driver solves at once ({@code solve.maxDriverEdges})
   * @param workDir where parts' edge files go, or null to keep them in memory
   * @throws SunderException (INVALID_CONFIG) when even the whole volume as one part, after every
   *     level, has more edges than the bound
   */
  public static Result run(SuperBlocks superBlocks, SolveEdges edges, long maxDriverEdges,
      PartSolver solver, Path workDir) {
    if (edges.size() <= maxDriverEdges || superBlocks.partCount(1) == 1) {
      return run(superBlocks, edges.size(), p -> edges, maxDriverEdges, solver, workDir);
    }
    SolveEdges[] inputs = distribute(superBlocks, edges, 1);
    return run(superBlocks, edges.size(), p -> {
      SolveEdges in = inputs[p];
      inputs[p] = null;
      return in;
    }, maxDriverEdges, solver, workDir);
  }

  /**
   * Solves a graph given as level 1's part inputs (each edge in the part of each of its ends),
   * as the tasks of a distributed run read them; the in-process loop keeps at most one level's
   * outputs (in the work dir if one is given).
   *
   * @param edgeCount the graph's distinct edges
   * @param levelOneInput part index to its input (null or empty for a part without edges); when
   *     the graph fits at once, called once with -1 for the whole graph
   */
  public static Result run(SuperBlocks superBlocks, long edgeCount,
      IntFunction<SolveEdges> levelOneInput, long maxDriverEdges, PartSolver solver,
      Path workDir) {
    if (maxDriverEdges < 1) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "solve.maxDriverEdges: "
          + maxDriverEdges + "; expected at least 1");
    }
    List<long[][]> maps = new ArrayList<>();
    List<LevelFigures> figures = new ArrayList<>();
    PartStore outputs = null;
    long distinct = edgeCount;
    int level = 1;
    while (distinct > maxDriverEdges && superBlocks.partCount(level) > 1) {
      long start = System.nanoTime();
      long cpuStart = cpuNanos();
      int parts = superBlocks.partCount(level);
      PartStore next = new PartStore(workDir, level, parts);
      List<PartResult> results = new ArrayList<>();
      long decided = 0;
      long heldBack = 0;
      long largest = 0;
      long largestAllocated = 0;
      long halves = 0;
      int used = 0;
      double solveSeconds = 0;
      int[][] children = level == 1 ? null : childrenOf(superBlocks, level - 1);
      for (int p = 0; p < parts; p++) {
        SolveEdges input = level == 1 ? levelOneInput.apply(p)
            : outputs.gather(children[p], solver);
        if (input == null || input.size() == 0) {
          continue;
        }
        used++;
        int part = p;
        int at = level;
        long allocatedBefore = allocatedBytes();
        long solveStart = System.nanoTime();
        PartResult r = solver.solve(input, node -> superBlocks.partOfNode(node, at) == part);
        solveSeconds += (System.nanoTime() - solveStart) / 1e9;
        largestAllocated = Math.max(largestAllocated, allocatedBytes() - allocatedBefore);
        largest = Math.max(largest, input.size());
        decided += r.decidedEdges();
        heldBack += r.heldBackEdges();
        SolveEdges out = r.remaining();
        halves += handedUpHalves(superBlocks, level, part, out);
        next.put(p, out);
        results.add(new PartResult(r.merged(), r.representative(), new SolveEdges(0),
            r.decidedEdges(), r.heldBackEdges()));
      }
      maps.add(RepresentativeMaps.levelOf(results));
      if (outputs != null) {
        outputs.clear();
      }
      outputs = next;
      figures.add(new LevelFigures(level, used, distinct, decided, heldBack, halves / 2,
          largest, largestAllocated, (System.nanoTime() - start) / 1e9, solveSeconds,
          (cpuNanos() - cpuStart) / 1e9));
      distinct = halves / 2;
      level++;
    }
    long driverStart = cpuNanos();
    SolveEdges whole = outputs == null ? levelOneInput.apply(-1) : outputs.gatherAll(solver);
    if (whole.size() > maxDriverEdges) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "the " + solver.name()
          + " solve still has " + whole.size() + " edges after " + (level - 1)
          + " levels of super-blocks, which is more than solve.maxDriverEdges = "
          + maxDriverEdges + "; raise the bound (and the driver's memory, about 150 bytes per"
          + " edge)");
    }
    PartResult last = solver.solve(whole, node -> true);
    double driverSeconds = (cpuNanos() - driverStart) / 1e9;
    maps.add(RepresentativeMaps.levelOf(List.of(last)));
    if (outputs != null) {
      outputs.clear();
    }
    return new Result(new RepresentativeMaps(maps), figures, whole.size(), driverSeconds);
  }

  /**
   * For a method whose solve is not hierarchical (fragment agglomeration, a multicut on a
   * linkage other than the sum, a size filter): a clear error when the reduced graph does not
   * fit under the driver bound.
   *
   * @throws SunderException (INVALID_CONFIG) naming the method, the edge count and the bound
   */
  public static void requireDriverFits(String method, long edges, long maxDriverEdges) {
    if (edges > maxDriverEdges) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "the " + method + " solve needs the"
          + " whole reduced graph on the driver: " + edges + " edges, more than"
          + " solve.maxDriverEdges = " + maxDriverEdges + ". Raise the bound (about 150 bytes"
          + " of driver memory per edge), or use mutex-watershed, agglomeration or"
          + " fragments-multicut with linkage sum, without minSegmentSize, whose solve runs"
          + " level by level over super-blocks");
    }
  }

  /**
   * Twice the distinct edges a part's output {@code out} adds to the next level's graph: an
   * edge inside the part counts 2, an edge leaving it 1 (its second copy is in the part at its
   * other end). Summed over a level's parts and halved: the next level's edge count. O(m).
   */
  static long handedUpHalves(SuperBlocks superBlocks, int level, int part, SolveEdges out) {
    long halves = 0;
    for (int e = 0; e < out.size(); e++) {
      boolean inner = superBlocks.partOfNode(out.u(e), level) == part
          && superBlocks.partOfNode(out.v(e), level) == part;
      halves += inner ? 2 : 1;
    }
    return halves;
  }

  /** Per part of {@code level + 1}, its parts of {@code level}, ascending. O(blocks). */
  static int[][] childrenOf(SuperBlocks superBlocks, int level) {
    int[] child = superBlocks.partsOfBlocks(level);
    int[] parent = superBlocks.partsOfBlocks(level + 1);
    int parents = superBlocks.partCount(level + 1);
    long[] links = new long[child.length];
    for (int b = 0; b < child.length; b++) {
      links[b] = ((long) parent[b] << 32) | child[b];
    }
    Arrays.sort(links);
    int[] count = new int[parents];
    int unique = 0;
    for (int i = 0; i < links.length; i++) {
      if (i == 0 || links[i] != links[i - 1]) {
        links[unique++] = links[i];
        count[(int) (links[i] >>> 32)]++;
      }
    }
    int[][] out = new int[parents][];
    for (int q = 0; q < parents; q++) {
      out[q] = new int[count[q]];
      count[q] = 0;
    }
    for (int i = 0; i < unique; i++) {
      int q = (int) (links[i] >>> 32);
      out[q][count[q]++] = (int) links[i];
    }
    return out;
  }

  /** One level's part outputs, in memory or as edge files. */
  private static final class PartStore {
    private final Path dir;
    private final SolveEdges[] memory;

    PartStore(Path workDir, int level, int parts) {
      this.dir = workDir == null ? null : workDir.resolve("level-" + level);
      this.memory = new SolveEdges[parts];
    }

    private Path file(int part) {
      return dir.resolve("part-" + part + ".out");
    }

    void put(int part, SolveEdges edges) {
      if (dir == null) {
        memory[part] = edges;
      } else {
        EdgeFile.write(file(part), edges);
        memory[part] = new SolveEdges(0);
      }
    }

    private SolveEdges get(int part) {
      if (memory[part] == null) {
        return null;
      }
      return dir == null ? memory[part] : EdgeFile.read(file(part));
    }

    /** The outputs of {@code parts}, copies of each edge joined ({@link PartSolver#gather}). */
    SolveEdges gather(int[] parts, PartSolver solver) {
      List<SolveEdges> outs = new ArrayList<>();
      for (int part : parts) {
        SolveEdges out = get(part);
        if (out != null) {
          outs.add(out);
        }
      }
      return solver.gather(outs);
    }

    SolveEdges gatherAll(PartSolver solver) {
      int[] every = new int[memory.length];
      for (int p = 0; p < every.length; p++) {
        every[p] = p;
      }
      return gather(every, solver);
    }

    void clear() {
      for (int p = 0; p < memory.length; p++) {
        memory[p] = null;
      }
    }
  }

  /** Level 1's inputs: each edge to the part of each of its ends. O(m). */
  static SolveEdges[] distribute(SuperBlocks superBlocks, SolveEdges edges, int level) {
    SolveEdges[] inputs = new SolveEdges[superBlocks.partCount(level)];
    for (int e = 0; e < edges.size(); e++) {
      int a = superBlocks.partOfNode(edges.u(e), level);
      int b = superBlocks.partOfNode(edges.v(e), level);
      add(inputs, a, edges, e);
      if (b != a) {
        add(inputs, b, edges, e);
      }
    }
    return inputs;
  }

  private static void add(SolveEdges[] inputs, int part, SolveEdges edges, int e) {
    if (inputs[part] == null) {
      inputs[part] = new SolveEdges(64);
    }
    inputs[part].add(edges, e, edges.u(e), edges.v(e));
  }

  private static long cpuNanos() {
    return ManagementFactory.getThreadMXBean().getCurrentThreadCpuTime();
  }

  private static long allocatedBytes() {
    java.lang.management.ThreadMXBean bean = ManagementFactory.getThreadMXBean();
    if (bean instanceof com.sun.management.ThreadMXBean sun) {
      return sun.getThreadAllocatedBytes(Thread.currentThread().getId());
    }
    return 0;
  }
}
