package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.sunder.spark.progress.ProgressListener;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.spark.workdir.WorkDir;

/**
 * Runs the unfinished tasks of one stage as a Spark job, one Spark task per stage task (up to
 * {@value #MAX_PARTITIONS}, beyond which tasks are grouped), and says how many were skipped
 * because an earlier run had finished them.
 */
public final class StageRunner {
  static final int MAX_PARTITIONS = 20_000;

  private final JavaSparkContext sc;
  private final Broadcast<RunSettings> settings;
  private final WorkDir work;
  private final PrintStream out;
  private final TaskHooks hooks;

  /** A runner whose tasks run with {@code hooks} (test-only; {@link TaskHooks#NONE} in runs). */
  public StageRunner(JavaSparkContext sc, Broadcast<RunSettings> settings, WorkDir work,
      PrintStream out, TaskHooks hooks) {
    this.sc = sc;
    this.settings = settings;
    this.work = work;
    this.out = out;
    this.hooks = hooks;
  }

  /** Runs every task of {@code stage} in {@code [0, taskCount)} that has no record yet. */
  public StageReport run(Stage stage, int taskCount, TaskBody body) {
    return run(stage, 0, taskCount, body);
  }

  /**
   * Runs every task of {@code stage} in {@code [first, end)} that has no record yet (a stage
   * whose tasks form groups that must finish one after another).
   */
  public StageReport run(Stage stage, int first, int end, TaskBody body) {
    return run(stage, null, first, end, body);
  }

  /**
   * Runs every task of step {@code step} of {@code stage} ({@link StageLedger#step}) in
   * {@code [0, taskCount)} that has no record yet, as one Spark job: a stage whose steps must
   * finish one after another, each with its own records (the levels of the hierarchical solve).
   * Its hooks name the task {@code <stage>-<step>:<index>}.
   */
  public StageReport runStep(Stage stage, String step, int taskCount, TaskBody body) {
    return run(stage, step, 0, taskCount, body);
  }

  private StageReport run(Stage stage, String step, int first, int end, TaskBody body) {
    long start = System.nanoTime();
    StageLedger ledger = step == null ? work.ledger(stage) : work.ledger(stage).step(step);
    String name = step == null ? stage.cliName() : stage.cliName() + " " + step;
    BitSet finished = ledger.finished();
    List<Integer> todo = new ArrayList<>();
    for (int i = first; i < end; i++) {
      if (!finished.get(i)) {
        todo.add(i);
      }
    }
    int taskCount = end - first;
    int skipped = taskCount - todo.size();
    if (skipped > 0) {
      out.println(name + ": " + skipped + " of " + taskCount
          + " tasks finished in an earlier run, skipped");
    }
    if (!todo.isEmpty()) {
      sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, stage.cliName());
      sc.setJobDescription("sunder " + name);
      try {
        sc.parallelize(todo, Math.min(todo.size(), MAX_PARTITIONS))
            .foreachPartition(new RecordingTask(settings, stage, step, body, hooks));
      } finally {
        sc.setLocalProperty(ProgressListener.STAGE_PROPERTY, null);
        sc.setJobDescription(null);
      }
    }
    return new StageReport(stage, taskCount, skipped, todo.size(),
        (System.nanoTime() - start) / 1e9);
  }
}
