package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.evaluate.SeamAuditJob;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.progress.ProgressListener;
import org.sunder.spark.progress.ProgressPrinter;
import org.sunder.spark.progress.ProgressTracker;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.scores.EvaluationScores;
import org.sunder.stitching.scores.SeamAuditResult;
import org.sunder.stitching.setup.EvaluationTarget;
import org.sunder.stitching.solve.SolveReport;
import org.sunder.stitching.task.BoxCounts;
import org.sunder.stitching.task.EvaluateTask;

/**
 * Runs the stages of a prepared run on Spark, in order: partition (per block), seams (per
 * face), solve (on the driver), relabel (per block's chunks), evaluate (per block, when a ground
 * truth is configured), pyramid (per chunk of each coarser level), and then writes the run
 * report (written by the commands). Settings are broadcast once; tasks read and write the containers
 * themselves; finished tasks are skipped. When relabel or evaluate ran and the final segmentation
 * is complete, a {@link SeamAuditResult} of it (per face, against the ground truth when configured)
 * joins the report; it is not recorded, so a rerun audits again. Progress goes to
 * {@code progress}, results to {@code out}.
 */
public final class Pipeline {
  private final JavaSparkContext sc;
  private final PrintStream out;
  private final PrintStream progress;
  private final boolean terminal;
  private final PayloadCodec codec = new PayloadCodec();

  public Pipeline(JavaSparkContext sc, PrintStream out, PrintStream progress, boolean terminal) {
    this.sc = sc;
    this.out = out;
    this.progress = progress;
    this.terminal = terminal;
  }

  /** Runs {@code stages} (in pipeline order); a single stage needs the earlier ones finished. */
  public RunReport run(PreparedRun run, List<Stage> stages) {
    for (String note : run.notes()) {
      out.println(note);
    }
    RunSettings settings = run.settings();
    ProgressTracker tracker = new ProgressTracker(System::nanoTime);
    ProgressListener listener = new ProgressListener(tracker,
        new ProgressPrinter(tracker, progress, terminal, 10, System::nanoTime));
    sc.sc().addSparkListener(listener);
    try {
      return stages(run, settings, stages);
    } finally {
      sc.sc().removeSparkListener(listener);
    }
  }

  private RunReport stages(PreparedRun run, RunSettings settings, List<Stage> stages) {
    long start = System.nanoTime();
    Broadcast<RunSettings> broadcast = sc.broadcast(settings);
    WorkDir work = run.workDir();
    TaskHooks hooks = TaskHooks.from(new SparkConf());
    StageRunner runner = new StageRunner(sc, broadcast, work, out, hooks);
    SolveStep solve = new SolveStep(sc, work, out, hooks, runner);
    BlockGrid grid = settings.grid();
    List<StageReport> reports = new ArrayList<>();
    SolveReport solved = null;
    EvaluationScores scores = null;
    boolean single = stages.size() == 1;
    for (Stage stage : Stage.values()) {
      if (!stages.contains(stage)) {
        continue;
      }
      if (single) {
        requireEarlierFinished(run, stage);
      }
      switch (stage) {
        case PARTITION -> reports.add(runner.run(stage, grid.blockCount(), new StageBodies.Partition()));
        case SEAMS -> reports.add(runner.run(stage, grid.faceCount(), new StageBodies.Seams()));
        case SOLVE -> solved = solve.run(settings, reports);
        case RELABEL -> {
          if (solved == null) {
            solved = solve.recorded();
          }
          reports.add(runner.run(stage, grid.blockCount(), new StageBodies.Relabel()));
        }
        case EVALUATE -> {
          if (settings.evaluates()) {
            reports.add(runner.run(stage, grid.blockCount(), new StageBodies.Evaluate()));
            scores = scores(work, grid.blockCount(), settings.ignoreBackground());
          } else if (single) {
            throw new ConfigException("stage evaluate needs evaluate.groundTruth in the"
                + " configuration: the ground-truth dataset to score against");
          }
        }
        case PYRAMID -> reports.add(PyramidStep.run(runner, settings, out));
        default -> throw new IllegalStateException("stage " + stage);
      }
    }
    broadcast.destroy();
    if (solved == null && work.ledger(Stage.SOLVE).isFinished(0)) {
      solved = solve.recorded();
    }
    SeamAuditResult seams = null;
    boolean complete = work.ledger(Stage.RELABEL).finished().cardinality() == grid.blockCount();
    if (complete && (stages.contains(Stage.RELABEL) || stages.contains(Stage.EVALUATE))) {
      seams = SeamAuditJob.audit(sc, auditTarget(settings), settings.blockShape());
    }
    RunReport report = new RunReport(settings, reports, solved,
        scores, seams, (System.nanoTime() - start) / 1e9);
    return report;
  }

  /** The final segmentation, with the ground truth when configured; masked voxels are 0 in it. */
  private static EvaluationTarget auditTarget(RunSettings s) {
    return new EvaluationTarget(s.outputContainer(), s.outputDataset(),
        s.evaluates() ? s.truthContainer() : null, s.groundTruth(), null, null,
        s.ignoreBackground());
  }

  /** The scores from the evaluate stage's records of {@code blocks} blocks. */
  public static EvaluationScores scores(WorkDir work, int blocks, boolean ignoreBackground) {
    PayloadCodec codec = new PayloadCodec();
    List<BoxCounts> boxes = new ArrayList<>(blocks);
    for (int b = 0; b < blocks; b++) {
      boxes.add(codec.decode(work.ledger(Stage.EVALUATE).read(b), BoxCounts.class,
          "evaluate record " + b));
    }
    return EvaluateTask.score(boxes, ignoreBackground);
  }

  /** Throws unless every stage before {@code stage} has finished all its tasks. */
  public static void requireEarlierFinished(PreparedRun run, Stage stage) {
    WorkDir work = run.workDir();
    BlockGrid grid = run.settings().grid();
    for (Stage earlier : Stage.values()) {
      if (earlier.ordinal() >= stage.ordinal() || earlier == Stage.EVALUATE) {
        continue;
      }
      int total = switch (earlier) {
        case PARTITION, RELABEL -> grid.blockCount();
        case SEAMS -> grid.faceCount();
        default -> 1;
      };
      BitSet done = work.ledger(earlier).finished();
      if (done.cardinality() < total) {
        throw new ConfigException("stage " + stage.cliName() + " needs stage " + earlier.cliName()
            + " to finish first (" + done.cardinality() + " of " + total + " tasks done);"
            + " run '" + org.sunder.spark.Launcher.command() + " stage " + earlier.cliName()
            + " CONFIG' or '" + org.sunder.spark.Launcher.command() + " run CONFIG'");
      }
    }
  }
}
