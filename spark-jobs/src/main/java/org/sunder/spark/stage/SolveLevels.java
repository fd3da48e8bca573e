package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.LevelFiles;
import org.sunder.stitching.solve.LevelTasks;
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
    SuperBlocks superBlocks = LevelTasks.superBlocks(setup);
    long maxRows = LevelTasks.rows(setup.partition(), settings.maxDriverEdges());
    long rows = LevelTasks.rows(setup.partition(), pairs);
    StageLedger solve = work.ledger(Stage.SOLVE);
    List<long[]> merges = new ArrayList<>();
    long[] below = new long[0];
    int level = 1;
    while (LevelTasks.needsLevel(superBlocks, level, rows, maxRows)) {
      int parts = superBlocks.partCount(level);
      runner.runStep(Stage.SOLVE, "up-" + level, parts, new Up(level, below));
      List<LevelTasks.PartRecord> records = new ArrayList<>(parts);
      for (int p = 0; p < parts; p++) {
        records.add(codec.decode(solve.step("up-" + level).read(p), LevelTasks.PartRecord.class,
            "solve up-" + level + " record " + p));
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
      out.println(levelLine(level, rows, next, records));
      rows = next;
      level++;
    }
    int levels = level - 1;
    LevelTasks.requireDriverFits(setup.partition(), levels, rows, settings.maxDriverEdges());
    if (levels == 0) {
      // above the bound with one super-block, requireDriverFits has thrown; below it, the
      // driver solves the graph whole and never comes here
      throw new SunderException(ErrorKind.INTERNAL, "level-by-level solve of a graph of "
          + pairs + " pairs under solve.maxDriverEdges = " + settings.maxDriverEdges());
    }
    LevelTasks.DriverRecord driver = driver(setup, levels, below);
    out.println(String.format(Locale.ROOT, "solve driver: %d edges solved whole (%.1f MB"
        + " allocated, %.2f s)", driver.edges(), driver.allocatedBytes() / 1e6,
        driver.seconds()));
    long[] finals = driver.finalsChecksums();
    int blocks = settings.grid().blockCount();
    long[] blockChecksums = new long[blocks];
    long[] notOwned = new long[blocks];
    for (int l = levels; l >= 1; l--) {
      int parts = superBlocks.partCount(l);
      runner.runStep(Stage.SOLVE, "down-" + l, parts, new Down(l, finals, merges.get(l - 1)));
      long[] next = l == 1 ? blockChecksums : new long[superBlocks.partCount(l - 1)];
      for (int p = 0; p < parts; p++) {
        LevelTasks.DownRecord r = codec.decode(solve.step("down-" + l).read(p),
            LevelTasks.DownRecord.class, "solve down-" + l + " record " + p);
        for (int c = 0; c < r.children().length; c++) {
          next[r.children()[c]] = r.checksums()[c];
          if (l == 1) {
            notOwned[r.children()[c]] = r.entries()[c];
          }
        }
      }
      finals = next;
    }
    long[] segments = new long[blocks];
    long nodes = 0;
    for (int b = 0; b < blocks; b++) {
      org.sunder.stitching.task.BlockSummaryFile.Stored record = StageFiles.summaryRecord(work, b);
      segments[b] = record.segments();
      nodes += record.boundarySegments();
    }
    long[] offsets = LevelTasks.offsets(segments, notOwned);
    runner.runStep(Stage.SOLVE, "ids", blocks, new BlockIds(offsets, blockChecksums));
    long total = 0;
    for (long s : segments) {
      total += s;
    }
    return new SolveReport(LevelTasks.partSolver(setup.partition()).name() + " (" + levels
        + " levels of super-blocks)", total, (int) Math.min(Integer.MAX_VALUE, nodes),
        (int) Math.min(Integer.MAX_VALUE, pairs), offsets[blocks],
        (System.nanoTime() - start) / 1e9);
  }

  /** The driver's step: recorded once, read back on a rerun. */
  private LevelTasks.DriverRecord driver(StitchingSetup setup, int levels, long[] top) {
    StageLedger ledger = work.ledger(Stage.SOLVE).step("driver");
    if (ledger.isFinished(0)) {
      out.println("solve driver: finished in an earlier run, skipped");
      return codec.decode(ledger.read(0), LevelTasks.DriverRecord.class, "solve driver record");
    }
    long startMillis = System.currentTimeMillis();
    hooks.beforeTask(Stage.SOLVE.cliName() + "-driver", 0, work.root());
    LevelTasks.DriverRecord r = LevelTasks.driver(setup, files(work), levels, top);
    ledger.recordTiming(0, startMillis, r.seconds());
    ledger.record(0, codec.encode(r));
    return r;
  }

  private static String levelLine(int level, long in, long next,
      List<LevelTasks.PartRecord> records) {
    LevelTasks.PartRecord largest = records.get(0);
    long allocated = 0;
    for (LevelTasks.PartRecord r : records) {
      largest = r.inputEdges() > largest.inputEdges() ? r : largest;
      allocated = Math.max(allocated, r.allocatedBytes());
    }
    return String.format(Locale.ROOT, "solve level %d: %d parts, %d edges in, %d handed up;"
        + " largest task %d edges, most allocated by a task %.1f MB", level, records.size(), in,
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

  /** Step down-l: one part of level l on the way down. */
  static final class Down implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final int level;
    private final long[] finalsChecksums;
    private final long[] mergesChecksums;

    Down(int level, long[] finalsChecksums, long[] mergesChecksums) {
      this.level = level;
      this.finalsChecksums = finalsChecksums.clone();
      this.mergesChecksums = mergesChecksums.clone();
    }

    @Override
    public Object run(RunSettings settings, int part) {
      WorkDir work = new WorkDir(settings.workDirPath());
      return LevelTasks.down(settings.setup(), files(work), level, part, finalsChecksums[part],
          mergesChecksums[part]);
    }
  }

  /** Step ids: one block's share of the final ids, where its relabel reads it. */
  static final class BlockIds implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final long[] offsets;
    private final long[] checksums;

    BlockIds(long[] offsets, long[] checksums) {
      this.offsets = offsets.clone();
      this.checksums = checksums.clone();
    }

    @Override
    public Object run(RunSettings settings, int block) {
      WorkDir work = new WorkDir(settings.workDirPath());
      return LevelTasks.blockIds(settings.setup(), files(work), block, offsets, checksums,
          StageFiles.solvedPartFile(work, block));
    }
  }
}
