package org.sunder.spark.progress;

import java.util.Locale;
import java.util.function.LongSupplier;

/**
 * Counts the finished tasks of the stage that is running and phrases them as one line: tasks
 * done of total, rate, and the time left at that rate. Thread-safe; pure bookkeeping, the clock
 * is injected.
 */
public final class ProgressTracker {
  private final LongSupplier nanoTime;
  private String stage = "";
  private int total;
  private int done;
  private int failedAttempts;
  private long startNanos;

  public ProgressTracker(LongSupplier nanoTime) {
    this.nanoTime = nanoTime;
  }

  /** A stage with {@code total} tasks to run starts now. */
  public synchronized void start(String stageName, int totalTasks) {
    stage = stageName;
    total = totalTasks;
    done = 0;
    failedAttempts = 0;
    startNanos = nanoTime.getAsLong();
  }

  /** One task attempt ended. */
  public synchronized void taskEnded(boolean successful) {
    if (successful) {
      done = Math.min(total, done + 1);
    } else {
      failedAttempts++;
    }
  }

  public synchronized int done() {
    return done;
  }

  public synchronized int total() {
    return total;
  }

  public synchronized String stage() {
    return stage;
  }

  /** For example {@code "partition  12/40 tasks  3.1 tasks/s  9 s left"}. */
  public synchronized String line() {
    double seconds = (nanoTime.getAsLong() - startNanos) / 1e9;
    StringBuilder line = new StringBuilder(String.format(Locale.ROOT, "%-9s %d/%d tasks",
        stage, done, total));
    if (done > 0 && seconds > 0) {
      double rate = done / seconds;
      line.append(String.format(Locale.ROOT, "  %.2f tasks/s", rate));
      if (done < total) {
        line.append("  ").append(duration((total - done) / rate)).append(" left");
      } else {
        line.append("  done in ").append(duration(seconds));
      }
    }
    if (failedAttempts > 0) {
      line.append("  (").append(failedAttempts).append(" failed attempts retried)");
    }
    return line.toString();
  }

  /** {@code 42 s}, {@code 3 min 5 s}, {@code 2 h 7 min}. */
  public static String duration(double seconds) {
    long s = Math.round(seconds);
    if (s < 60) {
      return s + " s";
    }
    if (s < 3600) {
      return (s / 60) + " min " + (s % 60) + " s";
    }
    return (s / 3600) + " h " + ((s % 3600) / 60) + " min";
  }
}
