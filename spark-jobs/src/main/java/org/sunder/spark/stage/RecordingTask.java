package org.sunder.spark.stage;

import java.util.Iterator;
import org.apache.spark.api.java.function.VoidFunction;
import org.apache.spark.broadcast.Broadcast;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.StageLedger;
import org.sunder.spark.workdir.WorkDir;

/**
 * The Spark function of a stage: for each task index of its partition, runs the task body and
 * then records the task's result in the work dir. A task killed before its record is written is
 * redone by a rerun; a retry by Spark rewrites the same outputs (task bodies are idempotent).
 * An {@link OutOfMemoryError} becomes a {@link TaskOutOfMemory}, which fails the task but not
 * the executor.
 */
final class RecordingTask implements VoidFunction<Iterator<Integer>> {
  private static final long serialVersionUID = 1L;

  private final Broadcast<RunSettings> settings;
  private final Stage stage;
  private final String step;
  private final TaskBody body;
  private final TaskHooks hooks;
  private final PayloadCodec codec = new PayloadCodec();

  RecordingTask(Broadcast<RunSettings> settings, Stage stage, TaskBody body, TaskHooks hooks) {
    this(settings, stage, null, body, hooks);
  }

  /** The function of step {@code step} of {@code stage} ({@link StageLedger#step}), or null. */
  RecordingTask(Broadcast<RunSettings> settings, Stage stage, String step, TaskBody body,
      TaskHooks hooks) {
    this.settings = settings;
    this.stage = stage;
    this.step = step;
    this.body = body;
    this.hooks = hooks;
  }

  @Override
  public void call(Iterator<Integer> indices) {
    RunSettings s = settings.value();
    WorkDir work = new WorkDir(s.workDirPath());
    StageLedger ledger = step == null ? work.ledger(stage) : work.ledger(stage).step(step);
    String name = step == null ? stage.cliName() : stage.cliName() + "-" + step;
    while (indices.hasNext()) {
      int index = indices.next();
      Object result;
      long startMillis = System.currentTimeMillis();
      long start = System.nanoTime();
      try {
        hooks.beforeTask(name, index, work.root());
        result = body.run(s, index);
      } catch (OutOfMemoryError e) {
        throw new TaskOutOfMemory(name + " task " + index + " ran out of memory ("
            + e.getMessage() + ")");
      }
      ledger.recordTiming(index, startMillis, (System.nanoTime() - start) / 1e9);
      ledger.record(index, codec.encode(result));
    }
  }
}
