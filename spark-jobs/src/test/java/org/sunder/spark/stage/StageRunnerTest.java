package org.sunder.spark.stage;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.spark.SparkSetup;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.progress.ProgressListener;
import org.sunder.spark.progress.ProgressPrinter;
import org.sunder.spark.progress.ProgressTracker;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.setup.StitchingSetup;

/** The stage runner in local mode with up to 3 attempts per task ({@code local[2,3]}). */
class StageRunnerTest {
  private static JavaSparkContext sc;
  private static ProgressTracker tracker;

  @BeforeAll
  static void start() {
    sc = new JavaSparkContext(SparkSetup.configure(new SparkConf(), "local[2,3]", "test"));
    tracker = new ProgressTracker(System::nanoTime);
    ProgressPrinter printer = new ProgressPrinter(tracker,
        new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8), false, 60,
        System::nanoTime);
    sc.sc().addSparkListener(new ProgressListener(tracker, printer));
  }

  @AfterAll
  static void stop() {
    sc.stop();
  }

  /** Writes a marker file per run of a task and returns {@code {index, index^2}}. */
  static final class SquareBody implements TaskBody {
    private static final long serialVersionUID = 1L;

    @Override
    public Object run(RunSettings settings, int index) {
      try {
        Files.writeString(Path.of(settings.workDir()).resolve("ran-" + index + "-"
            + System.nanoTime()), "");
      } catch (java.io.IOException e) {
        throw new java.io.UncheckedIOException(e);
      }
      return new long[] {index, (long) index * index};
    }
  }

  private static RunSettings settings(Path dir) {
    StitchingSetup setup = new StitchingSetup("in", "affinities", "", "out", "segmentation",
        BlockGrid.of(new long[] {8, 8, 8}, new int[] {4, 4, 4}, new int[] {4, 4, 4},
            new int[] {1, 1, 1}), Offsets.of(new int[] {0, 0, -1}),
        PartitionConfig.mutexWatershed(null, null));
    return new RunSettings("zyx", setup, dir.toString(), 10, "in", null, true);
  }

  private static long runs(Path dir) throws Exception {
    try (var files = Files.list(dir)) {
      return files.filter(p -> p.getFileName().toString().startsWith("ran-")).count();
    }
  }

  @Test
  void runsMissingTasksOnlyAndRecordsResults(@TempDir Path dir) throws Exception {
    Broadcast<RunSettings> b = sc.broadcast(settings(dir));
    WorkDir work = new WorkDir(dir);
    ByteArrayOutputStream text = new ByteArrayOutputStream();
    StageRunner runner = new StageRunner(sc, b, work,
        new PrintStream(text, true, StandardCharsets.UTF_8), TaskHooks.NONE);
    StageReport first = runner.run(Stage.SEAMS, 7, new SquareBody());
    assertEquals(new StageReport(Stage.SEAMS, 7, 0, 7, first.seconds()), first);
    assertEquals(7, runs(dir));
    assertEquals(7, tracker.done());
    long[] five = new PayloadCodec().decode(work.ledger(Stage.SEAMS).read(5), long[].class, "record");
    assertArrayEquals(new long[] {5, 25}, five);
    Files.delete(work.ledger(Stage.SEAMS).dir().resolve("2.done"));
    Files.delete(work.ledger(Stage.SEAMS).dir().resolve("6.done"));
    StageReport second = runner.run(Stage.SEAMS, 7, new SquareBody());
    assertEquals(5, second.skipped());
    assertEquals(2, second.ran());
    assertEquals(9, runs(dir));
    assertTrue(text.toString(StandardCharsets.UTF_8)
        .contains("seams: 5 of 7 tasks finished in an earlier run, skipped"), text.toString());
  }

  @Test
  void aTaskThatFailsOnceIsRetriedBySpark(@TempDir Path dir) throws Exception {
    Broadcast<RunSettings> b = sc.broadcast(settings(dir));
    WorkDir work = new WorkDir(dir);
    StageRunner runner = new StageRunner(sc, b, work,
        new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8),
        new TaskHooks(0, "relabel:3", ""));
    StageReport report = runner.run(Stage.RELABEL, 5, new SquareBody());
    assertEquals(5, report.ran());
    assertEquals(5, work.ledger(Stage.RELABEL).finished().cardinality());
    assertTrue(Files.exists(dir.resolve(".injected-failure-relabel-3")));
    assertEquals(5, runs(dir));
    assertTrue(tracker.line().contains("1 failed attempts retried"), tracker.line());
  }
}
