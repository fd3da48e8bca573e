package org.sunder.stitching.solve;

import java.io.Serializable;
import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.IntFunction;
import java.util.function.Supplier;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * The task functions of the hierarchical solve ({@link SuperBlockSolve}) as a cluster runs it,
 * one call per task. Every input and output is a file under one folder ({@link LevelFiles});
 * each call returns a small record (counts and checksums), and the runner hands the checksums
 * it recorded to the tasks that read those files. In run order:
 * <ol>
 *   <li>{@link #up}, level {@code l = 1..L}, per super-block part: solves the part (level 1:
 *       from its blocks' summaries and nearby seams, {@link PartInputs}; above: the edges its
 *       sub-parts handed up, copies joined) and writes what it hands up and its merges. The
 *       runner adds another level while the next level's edges ({@link #nextLevelEdges}) are
 *       above the driver bound ({@link #needsLevel}).
 *   <li>{@link #driver}: the rest, gathered from level L's outputs (at most the driver bound),
 *       solved whole; its merges written split per level-L part.
 *   <li>{@link #down}, level {@code l = L..1}, per part: the final representative of each node
 *       of the part that has another one, from its merges and what the level above wrote for
 *       it; written split per sub-part (per block at level 1).
 *   <li>with a size filter, the same three steps again for the filter after the solve
 *       ({@link #sizeFilterUp}, {@link #driver} with {@link #sizeFilterSolver}, {@link #down}),
 *       their files in {@link LevelFiles#sizeFilter}; level 1 reads the solve's level-0
 *       representatives, and the filter's replace them for the last step.
 *   <li>{@link #blockIds}, per block: the block's share of the final ids (the
 *       {@link SolvedFinalIds.BlockPart} a relabel reads), from its own file, its owners'
 *       files and the offsets, a prefix sum over one count per block ({@link #offsets}).
 * </ol>
 * Final ids are those of {@link SolvedFinalIds}: consecutive from 1, block by block, local ids
 * ascending, a cluster numbered at its smallest provisional id; so they do not depend on the
 * order or place the tasks run. No step holds more than one part's graph, and the runner holds
 * the records and one number per block.
 */
public final class LevelTasks {
  private LevelTasks() {}

  /**
   * What one part of one level did.
   *
   * @param inputEdges edges of the part's input (copies of crossing edges included)
   * @param decidedEdges inner edges settled here
   * @param heldBackEdges inner edges handed up undecided
   * @param handedUpHalves see {@link HierarchicalSolve#handedUpHalves}
   * @param outputEdges edges written for the next level
   * @param merges nodes merged here
   * @param allocatedBytes bytes the task's thread allocated while it ran (input reading
   *     included): an upper bound of its working memory
   * @param seconds the task's wall time (files included)
   * @param edgesChecksum checksum of {@link LevelFiles#edges}
   * @param mergesChecksum checksum of {@link LevelFiles#merges}
   */
  public record PartRecord(int level, int part, long inputEdges, long decidedEdges,
      long heldBackEdges, long handedUpHalves, long outputEdges, long merges,
      long allocatedBytes, double seconds, long edgesChecksum, long mergesChecksum)
      implements Serializable {}

  /**
   * What the driver's solve did.
   *
   * @param levels the levels below it
   * @param edges edges it solved
   * @param merges nodes it merged
   * @param allocatedBytes bytes this thread allocated for it (gathering included)
   * @param seconds its wall time
   * @param finalsChecksums per part of the top level, the checksum of its
   *     {@link LevelFiles#finals} file
   */
  public record DriverRecord(int levels, long edges, long merges, long allocatedBytes,
      double seconds, long[] finalsChecksums) implements Serializable {}

  /**
   * What one part did on the way down.
   *
   * @param children its sub-parts (blocks at level 1), ascending
   * @param entries per child, the nodes written for it
   * @param checksums per child, the checksum of its {@link LevelFiles#finals} file
   */
  public record DownRecord(int level, int part, int[] children, long[] entries,
      long[] checksums) implements Serializable {}

  /**
   * One block's share of the final ids, written.
   *
   * @param solvedSegments segments of the block whose cluster another segment represents
   * @param checksum of the written {@link BlockIdMapFile} part
   */
  public record IdsRecord(int block, int solvedSegments, long checksum)
      implements Serializable {}

  /** The super-blocks of a run's hierarchical solve. */
  public static SuperBlocks superBlocks(StitchingSetup setup) {
    return new SuperBlocks(setup.grid(), setup.idLayout(), SuperBlockSolve.FACTOR);
  }

  /** The part solver of the run's method. */
  public static PartSolver partSolver(PartitionConfig config) {
    if (SuperBlockSolve.isMulticut(config)) {
      return new MulticutPartSolver(config.kernighanLin());
    }
    return config.isMutexWatershed() ? new MutexPartSolver()
        : new LinkagePartSolver(config.linkage(), config.constraints(), config.threshold());
  }

  /** The part solver of the size filter after the run's solve ({@code minSegmentSize > 1}). */
  public static PartSolver sizeFilterSolver(PartitionConfig config) {
    return new SizeFilterPartSolver(config.createSizeFilter(), config.sizeFilterCannotLink(),
        config.linkage());
  }

  /**
   * Rows of the size filter for {@code pairs} reduced-graph pairs: four statistics per pair,
   * plus joined rows, size rows and the interior edges of small segments (level 1's input of the
   * default method on degraded synthetic tissue: 4.6 rows per pair of the partition and seam
   * records' count, {@code LevelSolveBenchmark}); saturates. The estimate of its input, and the
   * bound of its driver's share.
   */
  public static long sizeFilterRows(long pairs) {
    return pairs > Long.MAX_VALUE / 6 ? Long.MAX_VALUE : 6 * pairs;
  }

  /**
   * The solve report's method of a level-by-level solve: the part solver and its levels, and
   * with a size filter the filter's.
   */
  public static String methodName(PartitionConfig config, int levels, int filterLevels) {
    return partSolver(config).name() + " (" + levels + " levels of super-blocks)"
        + (config.minSegmentSize() > 1 ? ", then the " + sizeFilterSolver(config).name() + " ("
            + filterLevels + " levels)" : "");
  }

  /** The row format of the run's part solver. */
  static PartInputs.Rows rowsOf(PartitionConfig config) {
    return SuperBlockSolve.isMulticut(config) ? PartInputs.Rows.MULTICUT
        : config.isMutexWatershed() ? PartInputs.Rows.MUTEX : PartInputs.Rows.LINKAGE;
  }

  /**
   * Edges (rows) of the solve for {@code pairs} reduced-graph pairs: a pair is at most 2 Mutex
   * Watershed rows (its largest and smallest weight), 4 linkage rows or 1 multicut row (its
   * cost; the few continued pairs add a joined row each, left out of the bound); saturates.
   */
  public static long rows(PartitionConfig config, long pairs) {
    int perPair = SuperBlockSolve.isMulticut(config) ? 1 : config.isMutexWatershed() ? 2 : 4;
    return Math.multiplyHigh(pairs, perPair) != 0 || pairs * perPair < 0 ? Long.MAX_VALUE
        : pairs * perPair;
  }

  /**
   * Whether the run needs level {@code level}: the graph it would get ({@code rows} edges) is
   * above the driver bound and the level has more than one part.
   */
  public static boolean needsLevel(SuperBlocks superBlocks, int level, long rows,
      long maxRows) {
    return rows > maxRows && superBlocks.partCount(level) > 1;
  }

  /** The edges of the next level's graph, from a level's records. */
  public static long nextLevelEdges(Iterable<PartRecord> level) {
    long halves = 0;
    for (PartRecord r : level) {
      halves += r.handedUpHalves();
    }
    return halves / 2;
  }

  /**
   * The clear error when the rest after {@code levels} levels ({@code rows} edges) is above the
   * driver bound.
   */
  public static void requireDriverFits(PartitionConfig config, int levels, long rows,
      long maxDriverEdges) {
    if (rows > rows(config, maxDriverEdges)) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "the " + partSolver(config).name()
          + " solve, level by level over super-blocks of " + SuperBlockSolve.FACTOR
          + "^level blocks per axis, still leaves the driver a graph with more than"
          + " solve.maxDriverEdges = " + maxDriverEdges + " pairs (" + rows + " edges after "
          + levels + " levels); raise solve.maxDriverEdges (and the driver's memory, about"
          + " 150 bytes per edge)");
    }
  }

  /**
   * The clear error when the size filter's rest after {@code levels} levels ({@code rows}
   * rows) is above the driver bound ({@link #sizeFilterRows} of it).
   */
  public static void requireSizeFilterFits(int levels, long rows, long maxDriverEdges) {
    if (rows > sizeFilterRows(maxDriverEdges)) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "the size filter after the solve,"
          + " level by level over super-blocks of " + SuperBlockSolve.FACTOR + "^level blocks"
          + " per axis, still leaves the driver " + rows + " rows after " + levels
          + " levels, more than the " + sizeFilterRows(maxDriverEdges) + " rows of"
          + " solve.maxDriverEdges = " + maxDriverEdges + " pairs; raise solve.maxDriverEdges"
          + " (and the driver's memory)");
    }
  }

  /**
   * Step 1: solves part {@code part} of {@code level} and writes what it hands up and its
   * merges. O(m log m) for the part's m edges.
   *
   * @param belowChecksums per part of {@code level - 1}, its edges' checksum (unused at level 1)
   * @param summaryOf reads a block's summary (level 1 only; the part's blocks)
   * @param seamsOf reads a face's seam edges (level 1 only; faces near the part)
   */
  public static PartRecord up(StitchingSetup setup, LevelFiles files, int level, int part,
      long[] belowChecksums, IntFunction<BlockSummary> summaryOf,
      IntFunction<SeamEdges> seamsOf) {
    PartitionConfig config = setup.partition();
    SuperBlocks superBlocks = superBlocks(setup);
    return up(superBlocks, files, level, part, belowChecksums,
        () -> PartInputs.levelOne(setup.grid(), superBlocks, part, rowsOf(config),
            PartInputs.steps(setup.grid(), setup.offsets()), summaryOf, seamsOf),
        partSolver(config));
  }

  /**
   * Step 1 of the size filter after the solve ({@link SizeFilterPartSolver}), once the solve's
   * steps are done: as {@link #up}, its files in their own folder, level 1's input
   * ({@link PartInputs#sizeFilterLevelOne}) read with the solve's final representatives.
   *
   * @param solvedOf reads a block's level-0 {@link LevelFiles#finals} file of the solve
   */
  public static PartRecord sizeFilterUp(StitchingSetup setup, LevelFiles files, int level,
      int part, long[] belowChecksums, IntFunction<BlockSummary> summaryOf,
      IntFunction<SeamEdges> seamsOf, IntFunction<MergeMap> solvedOf) {
    SuperBlocks superBlocks = superBlocks(setup);
    return up(superBlocks, files, level, part, belowChecksums,
        () -> PartInputs.sizeFilterLevelOne(setup.grid(), superBlocks, part,
            PartInputs.steps(setup.grid(), setup.offsets()), summaryOf, seamsOf, solvedOf),
        sizeFilterSolver(setup.partition()));
  }

  private static PartRecord up(SuperBlocks superBlocks, LevelFiles files, int level, int part,
      long[] belowChecksums, Supplier<SolveEdges> levelOne, PartSolver solver) {
    long start = System.nanoTime();
    long allocatedBefore = allocatedBytes();
    SolveEdges input;
    if (level == 1) {
      input = levelOne.get();
    } else {
      List<SolveEdges> outputs = new ArrayList<>();
      for (int below : superBlocks.subParts(level, part)) {
        outputs.add(EdgeFile.read(files.edges(level - 1, below), belowChecksums[below]));
      }
      input = solver.gather(outputs);
    }
    PartResult result = input.size() == 0
        ? new PartResult(new long[0], new long[0], new SolveEdges(0), 0, 0)
        : solver.solve(input, node -> superBlocks.partOfNode(node, level) == part);
    SolveEdges out = result.remaining();
    long edgesChecksum = EdgeFile.write(files.edges(level, part), out);
    long mergesChecksum = MergeMapFile.write(files.merges(level, part), MergeMap.of(result));
    return new PartRecord(level, part, input.size(), result.decidedEdges(),
        result.heldBackEdges(), HierarchicalSolve.handedUpHalves(superBlocks, level, part, out),
        out.size(), result.merged().length, allocatedBytes() - allocatedBefore,
        (System.nanoTime() - start) / 1e9, edgesChecksum, mergesChecksum);
  }

  /**
   * Step 2: the driver's solve of what the top level ({@code levels >= 1}) handed up; writes its
   * merges split per top-level part. O(m log m) for the m edges gathered.
   *
   * @param topChecksums per part of the top level, its edges' checksum
   */
  public static DriverRecord driver(StitchingSetup setup, LevelFiles files, int levels,
      long[] topChecksums) {
    return driver(setup, files, levels, topChecksums, partSolver(setup.partition()));
  }

  /** Step 2 with another part solver: that of the size filter after the solve. */
  public static DriverRecord driver(StitchingSetup setup, LevelFiles files, int levels,
      long[] topChecksums, PartSolver solver) {
    long start = System.nanoTime();
    long allocatedBefore = allocatedBytes();
    SuperBlocks superBlocks = superBlocks(setup);
    int parts = superBlocks.partCount(levels);
    List<SolveEdges> outputs = new ArrayList<>();
    for (int p = 0; p < parts; p++) {
      outputs.add(EdgeFile.read(files.edges(levels, p), topChecksums[p]));
    }
    SolveEdges whole = solver.gather(outputs);
    outputs = null;
    MergeMap merges = whole.size() == 0 ? MergeMap.EMPTY
        : MergeMap.of(solver.solve(whole, node -> true));
    int[] partOf = new int[merges.size()];
    for (int i = 0; i < partOf.length; i++) {
      partOf[i] = superBlocks.partOfNode(merges.nodes()[i], levels);
    }
    int[] every = new int[parts];
    for (int p = 0; p < parts; p++) {
      every[p] = p;
    }
    long[] checksums = new long[parts];
    long[] entries = new long[parts];
    writeSplit(merges, partOf, every, p -> files.finals(levels, p), entries, checksums);
    return new DriverRecord(levels, whole.size(), merges.size(),
        allocatedBytes() - allocatedBefore, (System.nanoTime() - start) / 1e9, checksums);
  }

  /**
   * Step 3: part {@code part} of {@code level} on the way down: the final representative of
   * every node of the part that has another one (merged here, or whose representative the
   * levels above changed), written per sub-part (per block at level 1). O(n log n) for the n
   * nodes of the part's two files.
   *
   * @param finalsChecksum the checksum the level above (or the driver) recorded for this part's
   *     {@link LevelFiles#finals} file
   * @param mergesChecksum the checksum this part's {@link #up} task recorded for its merges
   */
  public static DownRecord down(StitchingSetup setup, LevelFiles files, int level, int part,
      long finalsChecksum, long mergesChecksum) {
    SuperBlocks superBlocks = superBlocks(setup);
    IdLayout layout = setup.idLayout();
    MergeMap above = MergeMapFile.read(files.finals(level, part), finalsChecksum);
    MergeMap merges = MergeMapFile.read(files.merges(level, part), mergesChecksum);
    int n = above.size() + merges.size();
    long[] nodes = new long[n];
    long[] reps = new long[n];
    int i = 0;
    int j = 0;
    for (int k = 0; k < n; k++) {
      boolean fromMerges = j == above.size()
          || i < merges.size() && merges.nodes()[i] < above.nodes()[j];
      if (fromMerges) {
        nodes[k] = merges.nodes()[i];
        // the representative lies in this part; the levels above may have changed it
        reps[k] = above.apply(merges.representatives()[i++]);
      } else {
        if (i < merges.size() && merges.nodes()[i] == above.nodes()[j]) {
          throw new SunderException(ErrorKind.INTERNAL, "level " + level + " part " + part
              + ": node " + Long.toUnsignedString(above.nodes()[j]) + " was merged here and"
              + " handed up");
        }
        nodes[k] = above.nodes()[j];
        reps[k] = above.representatives()[j++];
      }
    }
    MergeMap finals = new MergeMap(nodes, reps);
    int[] children;
    int[] childOf = new int[n];
    if (level == 1) {
      children = blocksOf(superBlocks, part);
      for (int k = 0; k < n; k++) {
        childOf[k] = layout.blockOf(nodes[k]);
      }
    } else {
      children = superBlocks.subParts(level, part);
      for (int k = 0; k < n; k++) {
        childOf[k] = superBlocks.partOfNode(nodes[k], level - 1);
      }
    }
    long[] entries = new long[children.length];
    long[] checksums = new long[children.length];
    writeSplit(finals, childOf, children, c -> files.finals(level - 1, c), entries, checksums);
    return new DownRecord(level, part, children, entries, checksums);
  }

  /**
   * Writes one file per child: the entries of {@code map} whose child ({@code childOf}) it is.
   * {@code children} ascending; fills {@code entries} and {@code checksums} per child.
   */
  private static void writeSplit(MergeMap map, int[] childOf, int[] children,
      IntFunction<Path> fileOf, long[] entries, long[] checksums) {
    int[] slot = new int[childOf.length];
    for (int k = 0; k < childOf.length; k++) {
      slot[k] = Arrays.binarySearch(children, childOf[k]);
      if (slot[k] < 0) {
        throw new SunderException(ErrorKind.INTERNAL, "node "
            + Long.toUnsignedString(map.nodes()[k]) + " lies in part " + childOf[k]
            + ", outside the parts " + Arrays.toString(children));
      }
      entries[slot[k]]++;
    }
    int[] start = new int[children.length + 1];
    for (int c = 0; c < children.length; c++) {
      start[c + 1] = start[c] + (int) entries[c];
    }
    long[] nodes = new long[childOf.length];
    long[] reps = new long[childOf.length];
    int[] next = Arrays.copyOf(start, children.length);
    for (int k = 0; k < childOf.length; k++) {
      int at = next[slot[k]]++;
      nodes[at] = map.nodes()[k];
      reps[at] = map.representatives()[k];
    }
    for (int c = 0; c < children.length; c++) {
      checksums[c] = MergeMapFile.write(fileOf.apply(children[c]), new MergeMap(
          Arrays.copyOfRange(nodes, start[c], start[c + 1]),
          Arrays.copyOfRange(reps, start[c], start[c + 1])));
    }
  }

  /** The blocks of level-1 part {@code part}, ascending. O(blocks). */
  static int[] blocksOf(SuperBlocks superBlocks, int part) {
    int[] parts = superBlocks.partsOfBlocks(1);
    int count = 0;
    for (int p : parts) {
      count += p == part ? 1 : 0;
    }
    int[] out = new int[count];
    count = 0;
    for (int b = 0; b < parts.length; b++) {
      if (parts[b] == part) {
        out[count++] = b;
      }
    }
    return out;
  }

  /**
   * The offsets of the blocks' final ids: a block owns its segments but those whose cluster
   * another segment represents ({@code notOwned}, from the level-1 {@link DownRecord}s), and
   * hands out that many ids after the blocks before it. O(blocks).
   *
   * @param segmentCounts per block, its segments
   * @param notOwned per block, the entries of its {@link LevelFiles#finals} file
   * @return per block its offset, and at index {@code blocks} the number of final ids
   */
  public static long[] offsets(long[] segmentCounts, long[] notOwned) {
    long[] owned = new long[segmentCounts.length];
    for (int b = 0; b < owned.length; b++) {
      owned[b] = segmentCounts[b] - notOwned[b];
    }
    long[] offsets = BlockFinalIds.offsets(owned);
    long[] out = Arrays.copyOf(offsets, owned.length + 1);
    out[owned.length] = owned.length == 0 ? 0 : offsets[owned.length - 1] + owned[owned.length - 1];
    return out;
  }

  /**
   * Step 4: block {@code block}'s share of the final ids, written to {@code out}
   * ({@link BlockIdMapFile#writePart}). A segment whose cluster is represented by segment
   * {@code r} (local id {@code k} of block {@code c}, which owns it) takes {@code r}'s final id
   * {@code offsets[c] + k - (segments of c below k that are not owned)}: read from c's file.
   * O(s log s) for the block's s such segments, plus one file per other owner block.
   *
   * @param offsets from {@link #offsets}
   * @param checksums per block, the checksum of its {@link LevelFiles#finals} level-0 file
   */
  public static IdsRecord blockIds(StitchingSetup setup, LevelFiles files, int block,
      long[] offsets, long[] checksums, Path out) {
    IdLayout layout = setup.idLayout();
    MergeMap own = MergeMapFile.read(files.finals(0, block), checksums[block]);
    Map<Integer, MergeMap> owners = new HashMap<>();
    owners.put(block, own);
    int n = own.size();
    int[] locals = new int[n];
    long[] finals = new long[n];
    for (int i = 0; i < n; i++) {
      long node = own.nodes()[i];
      long rep = own.representatives()[i];
      int owner = layout.blockOf(rep);
      if (layout.blockOf(node) != block || rep >= node) {
        throw new SunderException(ErrorKind.INTERNAL, "block " + block + ": node "
            + Long.toUnsignedString(node) + " with representative " + Long.toUnsignedString(rep)
            + " is not a segment of the block represented by a smaller id");
      }
      MergeMap ownerMap = owners.computeIfAbsent(owner,
          c -> MergeMapFile.read(files.finals(0, c), checksums[c]));
      int at = Arrays.binarySearch(ownerMap.nodes(), rep);
      if (at >= 0) {
        throw new SunderException(ErrorKind.INTERNAL, "block " + block + ": representative "
            + Long.toUnsignedString(rep) + " has a representative itself");
      }
      long k = layout.localOf(rep);
      locals[i] = (int) layout.localOf(node);
      finals[i] = offsets[owner] + k - (-at - 1);
    }
    long checksum = BlockIdMapFile.writePart(out,
        new SolvedFinalIds.BlockPart(block, offsets[block], locals, finals));
    return new IdsRecord(block, n, checksum);
  }

  private static long allocatedBytes() {
    java.lang.management.ThreadMXBean bean = ManagementFactory.getThreadMXBean();
    if (bean instanceof com.sun.management.ThreadMXBean sun) {
      return sun.getThreadAllocatedBytes(Thread.currentThread().getId());
    }
    return 0;
  }
}
