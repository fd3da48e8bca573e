package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.LevelFiles;
import org.sunder.stitching.solve.LevelTasks;
import org.sunder.stitching.solve.MergeMapFile;
import org.sunder.stitching.solve.SolveReport;
import org.sunder.stitching.solve.SuperBlocks;

/**
 * The solve of a reduced graph above {@code solve.maxDriverEdges}, scheduled as steps of the
 * solve stage ({@link LevelTasks} does the work): each step is a Spark job with its own task
 * records in a subfolder of the solve's ledger ({@link StageLedger#step}), so a killed run
 * resumes at the step where it died and does not redo recorded tasks:
 * <pre>
 *   up-1 ... up-L      one task per super-block part of the level
 *   driver             the rest, solved on the driver (one record)
 *   down-L ... down-1  one task per part: final representatives, down to the blocks
 *   filter-up-1 ...    with a size filter ({@code minSegmentSize}), the same three kinds of
 *   filter-driver      steps again for the filter after the solve, from the solve's
 *   filter-down-1      representatives (its files under {@link LevelFiles#sizeFilter})
 *   ids                one task per block: its share of the final ids ({@code <block>.part})
 * </pre>
 * The driver reads only the records (counts and checksums, a few per part) and keeps one number
 * per block (the offsets of the final ids); the files stay in the solve's folder
 * ({@link LevelFiles}) and go with its records.
 */
final class SolveLevels {
  private final WorkDir work;
  private final StageRunner runner;
  private final PrintStream out;
  private final TaskHooks hooks;
  private final PayloadCodec codec = new PayloadCodec();

  /** @param hooks the test hooks of the driver's step (its tasks' come with the runner) */
  SolveLevels(WorkDir work, StageRunner runner, PrintStream out, TaskHooks hooks) {
    this.work = work;
    this.runner = runner;
    this.out = out;
    this.hooks = hooks;
  }

  /** The files' folder of a work dir. */
  static LevelFiles files(WorkDir work) {
    return new LevelFiles(work.ledger(Stage.SOLVE).dir());
  }

  private static LevelFiles files(WorkDir work, boolean sizeFilter) {
    return sizeFilter ? files(work).sizeFilter() : files(work);
  }

  /**
   * Runs (or resumes) every step; the blocks' shares of the final ids are in place when it
   * returns.
   *
   * @param pairs an upper bound of the reduced graph's pairs (from the partition and seams
   *     records)
   */
  SolveReport run(RunSettings settings, long pairs) {
    long start = System.nanoTime();
    StitchingSetup setup = settings.setup();
    PartitionConfig config = setup.partition();
    long maxDriverEdges = settings.maxDriverEdges();
    Pass solve = pass(settings, Kind.SOLVE, LevelTasks.rows(config, pairs),
        LevelTasks.rows(config, maxDriverEdges), null,
        (levels, rows) -> LevelTasks.requireDriverFits(config, levels, rows, maxDriverEdges));
    if (solve.levels == 0) {
      // above the bound with one super-block, requireDriverFits has thrown; below it, the
      // driver solves the graph whole and never comes here
      throw new SunderException(ErrorKind.INTERNAL, "level-by-level solve of a graph of "
          + pairs + " pairs under solve.maxDriverEdges = " + maxDriverEdges);
    }
    Pass ids = solve;
    if (config.minSegmentSize() > 1) {
      // its rows are above its bound whenever the solve's were: it runs at least one level
      ids = pass(settings, Kind.SIZE_FILTER, LevelTasks.sizeFilterRows(pairs),
          LevelTasks.sizeFilterRows(maxDriverEdges), solve.blockChecksums,
          (levels, rows) -> LevelTasks.requireSizeFilterFits(levels, rows, maxDriverEdges));
    }
    int blocks = settings.grid().blockCount();
    long[] segments = new long[blocks];
    long nodes = 0;
    for (int b = 0; b < blocks; b++) {
      org.sunder.stitching.task.BlockSummaryFile.Stored record = StageFiles.summaryRecord(work, b);
      segments[b] = record.segments();
      nodes += record.boundarySegments();
    }
    long[] offsets = LevelTasks.offsets(segments, ids.notOwned);
    runner.runStep(Stage.SOLVE, "ids", blocks,
        new BlockIds(offsets, ids.blockChecksums, ids.kind == Kind.SIZE_FILTER));
    long total = 0;
    for (long s : segments) {
      total += s;
    }
    return new SolveReport(LevelTasks.methodName(config, solve.levels, ids.levels), total,
        (int) Math.min(Integer.MAX_VALUE, nodes), (int) Math.min(Integer.MAX_VALUE, pairs),
        offsets[blocks], (System.nanoTime() - start) / 1e9);
  }

  /** The two passes of steps: the solve, then the size filter after it. */
  private enum Kind {
    SOLVE("", "solve"),
    SIZE_FILTER("filter-", "size filter");

    private final String prefix;
    private final String label;

    Kind(String prefix, String label) {
      this.prefix = prefix;
      this.label = label;
    }

    /** A step's name in this pass. */
    String step(String name) {
      return prefix + name;
    }
  }

  /**
   * A pass's outcome at level 0: per block the checksum of its {@link LevelFiles#finals} file
   * and its entries (segments another one represents).
   */
  private record Pass(Kind kind, int levels, long[] blockChecksums, long[] notOwned) {}

  /** The check that what the levels leave fits the driver. */
  private interface FitCheck {
    void require(int levels, long rows);
  }

  /**
   * Runs (or resumes) one pass: levels up while its rows are above {@code maxRows}, the
   * driver, levels down.
   *
   * @param solvedChecksums for the size filter, the solve's level-0 checksums per block
   */
  private Pass pass(RunSettings settings, Kind kind, long rows, long maxRows,
      long[] solvedChecksums, FitCheck fits) {
    StitchingSetup setup = settings.setup();
    SuperBlocks superBlocks = LevelTasks.superBlocks(setup);
    StageLedger solve = work.ledger(Stage.SOLVE);
    List<long[]> merges = new ArrayList<>();
    long[] below = new long[0];
    int level = 1;
    while (LevelTasks.needsLevel(superBlocks, level, rows, maxRows)) {
      int parts = superBlocks.partCount(level);
      String step = kind.step("up-" + level);
      runner.runStep(Stage.SOLVE, step, parts, kind == Kind.SOLVE ? new Up(level, below)
          : new FilterUp(level, below, solvedChecksums));
      List<LevelTasks.PartRecord> records = new ArrayList<>(parts);
      for (int p = 0; p < parts; p++) {
        records.add(codec.decode(solve.step(step).read(p), LevelTasks.PartRecord.class,
            "solve " + step + " record " + p));
      }
      long[] edges = new long[parts];
      long[] partMerges = new long[parts];
      for (LevelTasks.PartRecord r : records) {
        edges[r.part()] = r.edgesChecksum();
        partMerges[r.part()] = r.mergesChecksum();
      }
      merges.add(partMerges);
      below = edges;
      long next = LevelTasks.nextLevelEdges(records);
      out.println(levelLine(kind, level, rows, next, records));
      rows = next;
      level++;
    }
    int levels = level - 1;
    fits.require(levels, rows);
    if (levels == 0) {
      return new Pass(kind, 0, null, null);
    }
    LevelTasks.DriverRecord driver = driver(setup, kind, levels, below);
    out.println(String.format(Locale.ROOT, "%s driver: %d edges solved whole (%.1f MB"
        + " allocated, %.2f s)", kind.label, driver.edges(),
        driver.allocatedBytes() / 1e6, driver.seconds()));
    long[] finals = driver.finalsChecksums();
    int blocks = settings.grid().blockCount();
    long[] blockChecksums = new long[blocks];
    long[] notOwned = new long[blocks];
    for (int l = levels; l >= 1; l--) {
      int parts = superBlocks.partCount(l);
      String step = kind.step("down-" + l);
      runner.runStep(Stage.SOLVE, step, parts,
          new Down(l, finals, merges.get(l - 1), kind == Kind.SIZE_FILTER));
      long[] next = l == 1 ? blockChecksums : new long[superBlocks.partCount(l - 1)];
      for (int p = 0; p < parts; p++) {
        LevelTasks.DownRecord r = codec.decode(solve.step(step).read(p),
            LevelTasks.DownRecord.class, "solve " + step + " record " + p);
        for (int c = 0; c < r.children().length; c++) {
          next[r.children()[c]] = r.checksums()[c];
          if (l == 1) {
            notOwned[r.children()[c]] = r.entries()[c];
          }
        }
      }
      finals = next;
    }
    return new Pass(kind, levels, blockChecksums, notOwned);
  }

  /** The driver's step of a pass: recorded once, read back on a rerun. */
  private LevelTasks.DriverRecord driver(StitchingSetup setup, Kind kind, int levels,
      long[] top) {
    String step = kind.step("driver");
    StageLedger ledger = work.ledger(Stage.SOLVE).step(step);
    if (ledger.isFinished(0)) {
      out.println("solve " + step + ": finished in an earlier run, skipped");
      return codec.decode(ledger.read(0), LevelTasks.DriverRecord.class, "solve " + step
          + " record");
    }
    long startMillis = System.currentTimeMillis();
    hooks.beforeTask(Stage.SOLVE.cliName() + "-" + step, 0, work.root());
    LevelTasks.DriverRecord r = kind == Kind.SOLVE
        ? LevelTasks.driver(setup, files(work), levels, top)
        : LevelTasks.driver(setup, files(work).sizeFilter(), levels, top,
            LevelTasks.sizeFilterSolver(setup.partition()));
    ledger.recordTiming(0, startMillis, r.seconds());
    ledger.record(0, codec.encode(r));
    return r;
  }

  private static String levelLine(Kind kind, int level, long in, long next,
      List<LevelTasks.PartRecord> records) {
    LevelTasks.PartRecord largest = records.get(0);
    long allocated = 0;
    for (LevelTasks.PartRecord r : records) {
      largest = r.inputEdges() > largest.inputEdges() ? r : largest;
      allocated = Math.max(allocated, r.allocatedBytes());
    }
    return String.format(Locale.ROOT, "%s level %d: %d parts, %d edges in, %d handed up;"
        + " largest task %d edges, most allocated by a task %.1f MB",
        kind.label, level, records.size(), in,
        next, largest.inputEdges(), allocated / 1e6);
  }

  /** Step up-l: one super-block part of level l. */
  static final class Up implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final int level;
    private final long[] belowChecksums;

    Up(int level, long[] belowChecksums) {
      this.level = level;
      this.belowChecksums = belowChecksums.clone();
    }

    @Override
    public Object run(RunSettings settings, int part) {
      WorkDir work = new WorkDir(settings.workDirPath());
      return LevelTasks.up(settings.setup(), files(work), level, part, belowChecksums,
          b -> StageFiles.summary(work, b), f -> StageFiles.seams(work, f));
    }
  }

  /** Step filter-up-l: one super-block part of level l of the size filter after the solve. */
  static final class FilterUp implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final int level;
    private final long[] belowChecksums;
    private final long[] solvedChecksums;

    FilterUp(int level, long[] belowChecksums, long[] solvedChecksums) {
      this.level = level;
      this.belowChecksums = belowChecksums.clone();
      this.solvedChecksums = solvedChecksums.clone();
    }

    @Override
    public Object run(RunSettings settings, int part) {
      WorkDir work = new WorkDir(settings.workDirPath());
      LevelFiles solved = files(work);
      return LevelTasks.sizeFilterUp(settings.setup(), solved.sizeFilter(), level, part,
          belowChecksums, b -> StageFiles.summary(work, b), f -> StageFiles.seams(work, f),
          b -> MergeMapFile.read(solved.finals(0, b), solvedChecksums[b]));
    }
  }

  /** Step down-l (filter-down-l): one part of level l on the way down. */
  static final class Down implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final int level;
    private final long[] finalsChecksums;
    private final long[] mergesChecksums;

    private final boolean sizeFilter;

    Down(int level, long[] finalsChecksums, long[] mergesChecksums, boolean sizeFilter) {
      this.level = level;
      this.finalsChecksums = finalsChecksums.clone();
      this.mergesChecksums = mergesChecksums.clone();
      this.sizeFilter = sizeFilter;
    }

    @Override
    public Object run(RunSettings settings, int part) {
      WorkDir work = new WorkDir(settings.workDirPath());
      return LevelTasks.down(settings.setup(), files(work, sizeFilter), level, part,
          finalsChecksums[part], mergesChecksums[part]);
    }
  }

  /** Step ids: one block's share of the final ids, where its relabel reads it. */
  static final class BlockIds implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final long[] offsets;
    private final long[] checksums;

    private final boolean sizeFilter;

    /** @param sizeFilter whether the representatives are the size filter's (else the solve's) */
    BlockIds(long[] offsets, long[] checksums, boolean sizeFilter) {
      this.offsets = offsets.clone();
      this.checksums = checksums.clone();
      this.sizeFilter = sizeFilter;
    }

    @Override
    public Object run(RunSettings settings, int block) {
      WorkDir work = new WorkDir(settings.workDirPath());
      return LevelTasks.blockIds(settings.setup(), files(work, sizeFilter), block, offsets,
          checksums, StageFiles.solvedPartFile(work, block));
    }
  }
}
