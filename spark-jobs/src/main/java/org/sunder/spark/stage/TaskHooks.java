package org.sunder.spark.stage;

import java.io.IOException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.apache.spark.SparkConf;

/**
 * Test-only behaviour of tasks, off unless set through Spark properties (so a test can pass them
 * to a child JVM as {@code -Dspark.sunder.test...}); the {@link Pipeline} reads them from the
 * driver's Spark configuration and hands them to each stage's {@link RecordingTask}, apart from
 * the run's settings: a delay before each task, so that a kill
 * lands inside a stage, one injected failure of one task, so that Spark's retry shows, and an
 * injected out-of-memory error.
 *
 * @param delayMillis sleep before every task ({@value #DELAY_KEY})
 * @param failOnce {@code stage:index} of a task whose first attempt throws ({@value #FAIL_KEY})
 * @param outOfMemory {@code stage:index} of a task that throws an {@link OutOfMemoryError} on
 *     every attempt ({@value #MEMORY_KEY})
 */
public record TaskHooks(long delayMillis, String failOnce, String outOfMemory)
    implements java.io.Serializable {
  public static final String DELAY_KEY = "spark.sunder.test.taskDelayMillis";
  public static final String FAIL_KEY = "spark.sunder.test.failOnce";
  public static final String MEMORY_KEY = "spark.sunder.test.outOfMemory";
  public static final TaskHooks NONE = new TaskHooks(0, "", "");

  /** The hooks set in {@code conf}, or {@link #NONE}. */
  public static TaskHooks from(SparkConf conf) {
    return new TaskHooks(conf.getLong(DELAY_KEY, 0), conf.get(FAIL_KEY, ""),
        conf.get(MEMORY_KEY, ""));
  }

  /** Runs before the body of task {@code index} of {@code stage}. */
  public void beforeTask(String stage, int index, Path workDir) {
    if (delayMillis > 0) {
      try {
        Thread.sleep(delayMillis);
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
      }
    }
    if (outOfMemory.equals(stage + ":" + index)) {
      throw new OutOfMemoryError("Java heap space (" + MEMORY_KEY + ")");
    }
    if (failOnce.equals(stage + ":" + index)) {
      Path marker = workDir.resolve(".injected-failure-" + stage + "-" + index);
      try {
        Files.createFile(marker);
      } catch (FileAlreadyExistsException e) {
        return;
      } catch (IOException e) {
        throw new IllegalStateException("cannot write " + marker, e);
      }
      throw new InjectedFailure(stage + " task " + index + " failed on purpose (" + FAIL_KEY + ")");
    }
  }

  /** The failure {@link #beforeTask} throws; only ever raised by tests. */
  public static final class InjectedFailure extends RuntimeException {
    private static final long serialVersionUID = 1L;

    InjectedFailure(String message) {
      super(message);
    }
  }
}
