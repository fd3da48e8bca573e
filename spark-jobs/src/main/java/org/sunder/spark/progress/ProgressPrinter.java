package org.sunder.spark.progress;

import java.io.PrintStream;
import java.util.function.LongSupplier;

/**
 * Shows a {@link ProgressTracker}'s line. On a terminal one line is rewritten in place (at most
 * five times a second); in a log a plain line is printed when a tenth of the tasks is done or
 * every {@code logIntervalSeconds}, whichever comes first, and always at the end of a stage.
 */
public final class ProgressPrinter {
  private final ProgressTracker tracker;
  private final PrintStream out;
  private final boolean terminal;
  private final long logIntervalNanos;
  private final LongSupplier nanoTime;
  private long lastPrint = Long.MIN_VALUE;
  private int lastDone = -1;
  private int lastWidth;

  public ProgressPrinter(ProgressTracker tracker, PrintStream out, boolean terminal,
      double logIntervalSeconds, LongSupplier nanoTime) {
    this.tracker = tracker;
    this.out = out;
    this.terminal = terminal;
    this.logIntervalNanos = (long) (logIntervalSeconds * 1e9);
    this.nanoTime = nanoTime;
  }

  /** Called after every task event; prints if it is time to. */
  public synchronized void update() {
    long now = nanoTime.getAsLong();
    int done = tracker.done();
    int total = tracker.total();
    if (terminal) {
      if (lastPrint == Long.MIN_VALUE || now - lastPrint >= 200_000_000L || done == total) {
        rewrite(tracker.line());
        lastPrint = now;
      }
      return;
    }
    int step = Math.max(1, total / 10);
    boolean milestone = done != lastDone && (done == total || done / step != Math.max(0, lastDone) / step);
    if (milestone || (lastPrint != Long.MIN_VALUE && now - lastPrint >= logIntervalNanos)) {
      out.println(tracker.line());
      out.flush();
      lastPrint = now;
      lastDone = done;
    }
  }

  /** Ends the stage's line. */
  public synchronized void finish() {
    if (terminal) {
      rewrite(tracker.line());
      out.println();
    } else if (lastDone != tracker.done()) {
      out.println(tracker.line());
    }
    out.flush();
    lastPrint = Long.MIN_VALUE;
    lastDone = -1;
    lastWidth = 0;
  }

  private void rewrite(String line) {
    StringBuilder text = new StringBuilder("\r").append(line);
    for (int i = line.length(); i < lastWidth; i++) {
      text.append(' ');
    }
    lastWidth = line.length();
    out.print(text);
    out.flush();
  }
}
