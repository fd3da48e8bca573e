package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.progress.ProgressListener;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.BlockIdMapFile;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.SolveDecisions;
import org.sunder.stitching.solve.SolveReport;
import org.sunder.stitching.solve.SolvedFinalIds;
import org.sunder.stitching.solve.SuperBlockSolve;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * The solve stage: checks the reduced graph's size against {@code solve.maxDriverEdges}
 * (counted on the executors). When it fits, loads the block summaries and seam edges on the
 * driver, solves, and writes each block's share of the final ids; above the bound, runs the
 * level-by-level solve as steps of Spark tasks ({@link SolveLevels}). Either way the stage's
 * own record (task 0, the {@link SolveReport}) is written last.
 */
final class SolveStep {
  private final JavaSparkContext sc;
  private final WorkDir work;
  private final PrintStream out;
  private final TaskHooks hooks;
  private final StageRunner runner;
  private final PayloadCodec codec = new PayloadCodec();

  SolveStep(JavaSparkContext sc, WorkDir work, PrintStream out, TaskHooks hooks,
      StageRunner runner) {
    this.sc = sc;
    this.runner = runner;
    this.work = work;
    this.out = out;
    this.hooks = hooks;
  }

  /** The recorded result, running the solve first if no earlier run recorded it. */
  SolveReport run(RunSettings settings, List<StageReport> reports) {
    StageLedger ledger = work.ledger(Stage.SOLVE);
    if (ledger.isFinished(0)) {
      out.println("solve: finished in an earlier run, skipped");
      reports.add(new StageReport(Stage.SOLVE, 1, 1, 0, 0));
      return recorded();
    }
    long start = System.nanoTime();
    long startMillis = System.currentTimeMillis();
    hooks.beforeTask(Stage.SOLVE.cliName(), 0, work.root());
    BlockGrid grid = settings.grid();
    long edges = countEdges(grid);
    StitchingSetup setup = settings.setup();
    GlobalSolve.Result result;
    if (edges > settings.maxDriverEdges()) {
      if (!SuperBlockSolve.supports(setup.partition())) {
        SuperBlockSolve.requireFits(setup.partition(), edges, settings.maxDriverEdges());
      }
      out.println("solve: the reduced graph has up to " + edges + " pairs, more than"
          + " solve.maxDriverEdges = " + settings.maxDriverEdges() + "; solving it level by"
          + " level over super-blocks");
      SolveReport report = new SolveLevels(work, runner, out, hooks).run(settings, edges);
      DecisionsFile.write(ledger, List.of());
      ledger.recordTiming(0, startMillis, (System.nanoTime() - start) / 1e9);
      ledger.record(0, codec.encode(report));
      reports.add(new StageReport(Stage.SOLVE, 1, 0, 1, (System.nanoTime() - start) / 1e9));
      return report;
    } else {
      List<BlockSummary> summaries = new ArrayList<>(grid.blockCount());
      for (int b = 0; b < grid.blockCount(); b++) {
        summaries.add(StageFiles.summary(work, b));
      }
      List<SeamEdges> seams = new ArrayList<>(grid.faceCount());
      for (int f = 0; f < grid.faceCount(); f++) {
        seams.add(StageFiles.seams(work, f));
      }
      result = GlobalSolve.run(setup, summaries, seams);
      writeParts(grid, result.solved());
      DecisionsFile.write(ledger, SolveDecisions.leastCertain(seams, result.solved()::finalIdOf,
          DecisionsFile.PER_KIND, DecisionsFile.MIN_VOXEL_EDGES));
    }
    ledger.recordTiming(0, startMillis, (System.nanoTime() - start) / 1e9);
    ledger.record(0, codec.encode(result.report()));
    reports.add(new StageReport(Stage.SOLVE, 1, 0, 1, (System.nanoTime() - start) / 1e9));
    return result.report();
  }

  /** Each block's share of the final ids, for its relabel task. */
  private void writeParts(BlockGrid grid, SolvedFinalIds solved) {
    for (int b = 0; b < grid.blockCount(); b++) {
      BlockIdMapFile.writePart(StageFiles.solvedPartFile(work, b), solved.part(b));
    }
  }

  SolveReport recorded() {
    return codec.decode(work.ledger(Stage.SOLVE).read(0), SolveReport.class,
        "solve record");
  }

  private long countEdges(BlockGrid grid) {
    int tasks = grid.blockCount() + grid.faceCount();
    List<Integer> indices = IntStream.range(0, tasks).boxed().toList();
    sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, "solve");
    try {
      return sc.parallelize(indices, Math.max(1, Math.min(tasks, sc.defaultParallelism() * 4)))
          .mapPartitions(new RecordSizes(work.root().toString(), grid.blockCount()))
          .reduce(Long::sum);
    } finally {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
    }
  }
}
