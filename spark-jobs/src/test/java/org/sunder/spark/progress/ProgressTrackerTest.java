package org.sunder.spark.progress;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.atomic.AtomicLong;
import org.junit.jupiter.api.Test;

class ProgressTrackerTest {
  @Test
  void lineShowsCountRateAndTimeLeft() {
    AtomicLong clock = new AtomicLong();
    ProgressTracker tracker = new ProgressTracker(clock::get);
    tracker.start("seams", 40);
    for (int i = 0; i < 10; i++) {
      tracker.taskEnded(true);
    }
    tracker.taskEnded(false);
    clock.set(5_000_000_000L);
    assertEquals("seams     10/40 tasks  2.00 tasks/s  15 s left  (1 failed attempts retried)",
        tracker.line());
  }

  @Test
  void durationsAreReadable() {
    assertEquals("42 s", ProgressTracker.duration(42.2));
    assertEquals("3 min 5 s", ProgressTracker.duration(185));
    assertEquals("2 h 7 min", ProgressTracker.duration(7620));
  }

  @Test
  void logModePrintsTenthsAndTheEnd() {
    AtomicLong clock = new AtomicLong();
    ProgressTracker tracker = new ProgressTracker(clock::get);
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    ProgressPrinter printer = new ProgressPrinter(tracker, new PrintStream(bytes, true,
        StandardCharsets.UTF_8), false, 1e6, clock::get);
    tracker.start("partition", 20);
    for (int i = 0; i < 20; i++) {
      clock.addAndGet(100_000_000L);
      tracker.taskEnded(true);
      printer.update();
    }
    printer.finish();
    String[] lines = bytes.toString(StandardCharsets.UTF_8).split("\n");
    assertEquals(10, lines.length, String.join("\n", lines));
    assertTrue(lines[9].startsWith("partition 20/20 tasks"), lines[9]);
    assertTrue(lines[9].contains("done in 2 s"), lines[9]);
  }

  @Test
  void terminalModeRewritesOneLine() {
    AtomicLong clock = new AtomicLong();
    ProgressTracker tracker = new ProgressTracker(clock::get);
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    ProgressPrinter printer = new ProgressPrinter(tracker, new PrintStream(bytes, true,
        StandardCharsets.UTF_8), true, 10, clock::get);
    tracker.start("relabel", 3);
    for (int i = 0; i < 3; i++) {
      clock.addAndGet(300_000_000L);
      tracker.taskEnded(true);
      printer.update();
    }
    printer.finish();
    String text = bytes.toString(StandardCharsets.UTF_8);
    assertEquals(1, text.chars().filter(c -> c == '\n').count(), text);
    assertTrue(text.chars().filter(c -> c == '\r').count() >= 3, text);
  }
}
