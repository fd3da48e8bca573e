package org.sunder.spark.cli;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.spark.SparkContextSource;

/** Runs the command line in this JVM and keeps what it printed. */
public record CliRun(int exitCode, String out, String err) {
  /** With a Spark source that fails if a command asks for Spark. */
  public static CliRun withoutSpark(String... args) {
    return with(new SparkContextSource() {
      @Override
      public JavaSparkContext open(String defaultMaster) {
        throw new AssertionError("this command should have failed before starting Spark");
      }

      @Override
      public void release(JavaSparkContext context) {}
    }, args);
  }

  public static CliRun with(SparkContextSource spark, String... args) {
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    ByteArrayOutputStream err = new ByteArrayOutputStream();
    int code = new SunderCli(spark, new PrintStream(out, true, StandardCharsets.UTF_8),
        new PrintStream(err, true, StandardCharsets.UTF_8), false).execute(args);
    return new CliRun(code, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
  }

  /**
   * Waits until a shared context runs no task. When a job fails, Spark cancels its other tasks
   * asynchronously; one still writing would race whatever the test reads or removes next. The
   * status tracker learns of a task's start through the listener bus, after the task's thread
   * may have begun, so the executor threads themselves are checked too (local mode runs them in
   * this JVM), and the quiet must hold over several polls.
   */
  public static void awaitNoRunningTasks(JavaSparkContext spark) {
    long deadline = System.nanoTime() + 60_000_000_000L;
    int quietPolls = 0;
    while (quietPolls < 4 && System.nanoTime() < deadline) {
      boolean busy = java.util.Arrays.stream(spark.statusTracker().getExecutorInfos())
          .anyMatch(e -> e.numRunningTasks() > 0) || anyThreadRunsATask();
      quietPolls = busy ? 0 : quietPolls + 1;
      try {
        Thread.sleep(50);
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        return;
      }
    }
  }

  /** Whether a thread of this JVM is inside a Spark executor's task runner. */
  private static boolean anyThreadRunsATask() {
    for (StackTraceElement[] stack : Thread.getAllStackTraces().values()) {
      for (StackTraceElement frame : stack) {
        if (frame.getClassName().equals("org.apache.spark.executor.Executor$TaskRunner")
            && frame.getMethodName().equals("run")) {
          return true;
        }
      }
    }
    return false;
  }
}
