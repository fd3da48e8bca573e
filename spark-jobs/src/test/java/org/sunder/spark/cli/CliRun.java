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
   * asynchronously; one still writing would race whatever the test reads or removes next.
   */
  public static void awaitNoRunningTasks(JavaSparkContext spark) {
    long deadline = System.nanoTime() + 60_000_000_000L;
    while (System.nanoTime() < deadline && java.util.Arrays.stream(spark.statusTracker()
        .getExecutorInfos()).anyMatch(e -> e.numRunningTasks() > 0)) {
      try {
        Thread.sleep(50);
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        return;
      }
    }
  }
}
