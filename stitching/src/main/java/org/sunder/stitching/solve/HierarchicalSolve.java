package org.sunder.stitching.solve;

import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
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
 * ({@link SolveEdges#joinCopies}). When the rest fits under the bound, the driver solves it
 * whole. With a work dir every part's input and output is an {@link EdgeFile} there, as in a
 * distributed run ({@code level-<l>/part-<p>.in} and {@code .out}); without one they stay in
 * memory.
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
   */
  public record LevelFigures(int level, int parts, long inputEdges, long decidedEdges,
      long heldBackEdges, long handedUpEdges, long largestPartEdges,
      long largestPartAllocatedBytes, double seconds, double solveSeconds) {}

  /**
   * @param representatives every level's merges, the driver's last
   * @param levels figures of the levels before the driver's solve (empty if it fit at once)
   * @param driverEdges edges the driver solved
   * @param driverSeconds the driver's solve time
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
    if (maxDriverEdges < 1) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "solve.maxDriverEdges: "
          + maxDriverEdges + "; expected at least 1");
    }
    List<long[][]> maps = new ArrayList<>();
    List<LevelFigures> figures = new ArrayList<>();
    SolveEdges[] inputs = null;
    long distinct = edges.size();
    int level = 1;
    while (distinct > maxDriverEdges && superBlocks.partCount(level) > 1) {
      long start = System.nanoTime();
      int parts = superBlocks.partCount(level);
      if (inputs == null) {
        inputs = distribute(superBlocks, edges, level);
      }
      List<PartResult> results = new ArrayList<>();
      SolveEdges[] outputs = new SolveEdges[parts];
      long decided = 0;
      long heldBack = 0;
      long largest = 0;
      long largestAllocated = 0;
      int used = 0;
      double solveSeconds = 0;
      for (int p = 0; p < parts; p++) {
        if (inputs[p] == null || inputs[p].size() == 0) {
          continue;
        }
        used++;
        SolveEdges input = stored(workDir, level, p, "in", inputs[p]);
        inputs[p] = null;
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
        outputs[p] = stored(workDir, level, p, "out", r.remaining());
        results.add(new PartResult(r.merged(), r.representative(), new SolveEdges(0),
            r.decidedEdges(), r.heldBackEdges()));
      }
      maps.add(RepresentativeMaps.levelOf(results));
      inputs = gather(superBlocks, outputs, level);
      long next = distinctEdges(superBlocks, inputs, level + 1);
      figures.add(new LevelFigures(level, used, distinct, decided, heldBack, next, largest,
          largestAllocated, (System.nanoTime() - start) / 1e9, solveSeconds));
      distinct = next;
      level++;
    }
    SolveEdges whole = inputs == null ? edges : everything(inputs);
    if (whole.size() > maxDriverEdges) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "the " + solver.name()
          + " solve still has " + whole.size() + " edges after " + (level - 1)
          + " levels of super-blocks, which is more than solve.maxDriverEdges = "
          + maxDriverEdges + "; raise the bound (and the driver's memory, about 150 bytes per"
          + " edge) or use a method whose solve is agglomerative");
    }
    long start = System.nanoTime();
    PartResult last = solver.solve(whole, node -> true);
    double driverSeconds = (System.nanoTime() - start) / 1e9;
    maps.add(RepresentativeMaps.levelOf(List.of(last)));
    return new Result(new RepresentativeMaps(maps), figures, whole.size(), driverSeconds);
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

  /** Level {@code level + 1}'s inputs: each part gets its sub-parts' outputs, copies joined. */
  static SolveEdges[] gather(SuperBlocks superBlocks, SolveEdges[] outputs, int level) {
    int[] parentOf = new int[outputs.length];
    int[] childOfBlock = superBlocks.partsOfBlocks(level);
    int[] parentOfBlock = superBlocks.partsOfBlocks(level + 1);
    for (int b = 0; b < childOfBlock.length; b++) {
      parentOf[childOfBlock[b]] = parentOfBlock[b];
    }
    SolveEdges[] gathered = new SolveEdges[superBlocks.partCount(level + 1)];
    for (int p = 0; p < outputs.length; p++) {
      if (outputs[p] != null) {
        int q = parentOf[p];
        if (gathered[q] == null) {
          gathered[q] = new SolveEdges(outputs[p].size());
        }
        gathered[q].addAll(outputs[p]);
        outputs[p] = null;
      }
    }
    for (int q = 0; q < gathered.length; q++) {
      if (gathered[q] != null) {
        gathered[q] = gathered[q].joinCopies();
      }
    }
    return gathered;
  }

  /** Distinct edges over parts whose edges leaving the part appear in two parts. */
  private static long distinctEdges(SuperBlocks superBlocks, SolveEdges[] inputs, int level) {
    long halves = 0;
    for (int q = 0; q < inputs.length; q++) {
      SolveEdges in = inputs[q];
      if (in == null) {
        continue;
      }
      for (int e = 0; e < in.size(); e++) {
        boolean inner = superBlocks.partOfNode(in.u(e), level) == q
            && superBlocks.partOfNode(in.v(e), level) == q;
        halves += inner ? 2 : 1;
      }
    }
    return halves / 2;
  }

  private static SolveEdges everything(SolveEdges[] inputs) {
    long total = 0;
    for (SolveEdges in : inputs) {
      total += in == null ? 0 : in.size();
    }
    SolveEdges all = new SolveEdges((int) Math.min(Integer.MAX_VALUE - 8, total));
    for (SolveEdges in : inputs) {
      if (in != null) {
        all.addAll(in);
      }
    }
    return all.joinCopies();
  }

  private static SolveEdges stored(Path workDir, int level, int part, String suffix,
      SolveEdges edges) {
    if (workDir == null) {
      return edges;
    }
    Path file = workDir.resolve("level-" + level).resolve("part-" + part + "." + suffix);
    EdgeFile.write(file, edges);
    return EdgeFile.read(file);
  }

  private static long allocatedBytes() {
    java.lang.management.ThreadMXBean bean = ManagementFactory.getThreadMXBean();
    if (bean instanceof com.sun.management.ThreadMXBean sun) {
      return sun.getThreadAllocatedBytes(Thread.currentThread().getId());
    }
    return 0;
  }
}
