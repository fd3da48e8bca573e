package org.sunder.spark.it;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.apache.spark.api.java.JavaSparkContext;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.cli.CliRun;
import org.sunder.spark.stage.StageFiles;
import org.sunder.spark.stage.TaskHooks;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;

/**
 * The level-by-level solve through the Spark stages, in {@code local[2]} (a failed task fails
 * its job, so a run dies at a chosen task): on 64 blocks (8 x 4 x 2), under a driver bound low
 * enough for two levels of super-blocks, it writes the bytes of the single-level solve; and a
 * run that dies at a task of each of its steps in turn resumes each time where it died, without
 * redoing a recorded task, and ends with those bytes.
 */
class LevelResumeTest {
  private static final int[] BLOCK_XYZ = {8, 14, 10};
  private static final int BLOCKS = 64;
  private static final String MWS = "{\"method\": \"mutex-watershed\"}";
  private static final String MULTICUT = "{\"method\": \"fragments-multicut\"}";
  private static final String MWS_FILTERED =
      "{\"method\": \"mutex-watershed\", \"minSegmentSize\": 30}";
  /**
   * Bits of variation of information against the ground truth the multicut's level-by-level run
   * may lose to its single-level run on this scene. Its blocks are tiny (8 x 14 x 10 voxels), so
   * a level-1 part holds 16 x 28 x 20 voxels and most objects leave it: measured 2.51 bits
   * against 2.00 (1.33 between the two). On the tissue presets, with parts of 64 x 64 x 16
   * voxels, the two runs differ by 0.003 to 0.21 bits (docs/scaling.md).
   */
  private static final double MULTICUT_MAX_VOI = 0.75;
  private static JavaSparkContext sc;

  @BeforeAll
  static void start() {
    sc = SharedSpark.start("local[2]");
  }

  @AfterAll
  static void stop() {
    sc.stop();
  }

  private static CliRun cli(String... args) {
    return CliRun.with(SparkContextSource.shared(sc), args);
  }

  /**
   * {@code run config} with the task {@code task} ({@code stage:index}) made to fail; returns
   * once the failed job's other tasks have stopped writing.
   */
  private static CliRun runFailingAt(String task, Path config) {
    System.setProperty(TaskHooks.FAIL_KEY, task);
    try {
      return cli("run", config.toString());
    } finally {
      System.clearProperty(TaskHooks.FAIL_KEY);
      CliRun.awaitNoRunningTasks(sc);
    }
  }

  /** Variation of information (bits) of {@code labels} against {@code reference}. */
  private static double voi(long[] reference, long[] labels, boolean truth) {
    ContingencyTable table = new ContingencyTable();
    table.add(reference, labels);
    return new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(truth)).score(table).voi();
  }

  private static WorkDir workDir(Scenes.Scene scene) {
    return new WorkDir(scene.container().resolveSibling(scene.container().getFileName()
        + ".sunder-work").resolve("segmentation"));
  }

  private static void writeBound(Scenes.Scene scene, String json, long bound) throws IOException {
    Files.writeString(scene.config(), bound < 0 ? json : json.replace("\"evaluate\"",
        "\"solve\": {\"maxDriverEdges\": " + bound + "}, \"evaluate\""));
  }

  /** Pairs of the reduced graph as the solve counts them (partition and seams records). */
  private static long pairs(WorkDir work) {
    long pairs = 0;
    for (int b = 0; b < BLOCKS; b++) {
      pairs += StageFiles.summaryRecord(work, b).pairs();
    }
    java.util.BitSet faces = work.ledger(Stage.SEAMS).finished();
    for (int f = faces.nextSetBit(0); f >= 0; f = faces.nextSetBit(f + 1)) {
      pairs += StageFiles.seamRecord(work, f).edges();
    }
    return pairs;
  }

  /**
   * Runs partition and seams, then the solve stage under falling bounds until one gives
   * {@code levels} levels; then the whole run single-level. Returns that bound and leaves the
   * single-level output in the scene.
   */
  private static long boundFor(Scenes.Scene scene, int levels) throws IOException {
    String json = Files.readString(scene.config());
    assertEquals(0, cli("stage", "partition", scene.config().toString()).exitCode());
    assertEquals(0, cli("stage", "seams", scene.config().toString()).exitCode());
    long pairs = pairs(workDir(scene));
    long found = -1;
    for (long bound = pairs * 7 / 8; bound > pairs / 256 && found < 0; bound = bound * 3 / 4) {
      writeBound(scene, json, bound);
      CliRun r = cli("stage", "solve", scene.config().toString());
      if (r.exitCode() == 0 && r.out().contains("solve level " + levels + ":")) {
        found = bound;
      } else if (r.exitCode() != 0) {
        assertTrue(r.err().contains("solve.maxDriverEdges = " + bound), r.err());
      }
    }
    writeBound(scene, json, -1);
    CliRun single = cli("run", scene.config().toString());
    assertEquals(0, single.exitCode(), single.err());
    assertTrue(!single.out().contains("level by level"), single.out());
    assertTrue(found > 0, scene.container() + ": no bound below " + pairs + " pairs gave "
        + levels + " levels");
    return found;
  }

  @Test
  void exactAffinitiesGiveTheSingleLevelBytesAndTheTruth(
      @TempDir Path dir) throws IOException {
    // (the mean agglomeration's parts settle too little on so small a scene for any bound to
    // fit after the levels; its identity with the single-level solve, through the same task
    // functions, is checked in stitching's SuperBlockSolveTest)
    for (String method : new String[] {MWS}) {
      String name = "mws";
      Scenes.Scene single = Scenes.write(dir.resolve(name + "-single"), StorageFormat.ZARR,
          Degradation.none(), BLOCK_XYZ, method);
      long bound = boundFor(single, 1);
      Scenes.Scene scene = Scenes.write(dir.resolve(name), StorageFormat.ZARR,
          Degradation.none(), BLOCK_XYZ, method);
      writeBound(scene, Files.readString(scene.config()), bound);
      CliRun leveled = cli("run", scene.config().toString());
      assertEquals(0, leveled.exitCode(), leveled.err());
      assertTrue(leveled.out().contains("solve level 1:"), leveled.out());
      assertEquals(Scenes.chunkFiles(single.container().resolve("segmentation")),
          Scenes.chunkFiles(scene.container().resolve("segmentation")), name);
      // exact affinities: the ground truth up to renaming (variation of information 0)
      assertTrue(Scenes.equalUpToRenaming(Scenes.labels(scene.container(), "segmentation"),
          Scenes.labels(scene.container(), "ground-truth")), name);
    }
  }

  @Test
  void diesAtATaskOfEachStepAndResumesToTheSingleLevelBytes(@TempDir Path dir)
      throws IOException {
    Scenes.Scene single = Scenes.write(dir.resolve("single"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MWS);
    long bound = boundFor(single, 2);
    List<String> reference = Scenes.chunkFiles(single.container().resolve("segmentation"));
    Scenes.Scene scene = Scenes.write(dir.resolve("levels"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MWS);
    writeBound(scene, Files.readString(scene.config()), bound);
    WorkDir work = workDir(scene);
    List<String> steps = List.of("up-1", "up-2", "driver", "down-2", "down-1", "ids");
    Map<Path, FileTime> records = new HashMap<>();
    for (int s = 0; s < steps.size(); s++) {
      String task = "solve-" + steps.get(s) + ":0";
      CliRun died = runFailingAt(task, scene.config());
      assertNotEquals(0, died.exitCode(), task + ":\n" + died.out());
      assertTrue(Files.exists(work.root().resolve(".injected-failure-solve-" + steps.get(s)
          + "-0")), task);
      assertTrue(!work.ledger(Stage.SOLVE).step(steps.get(s)).isFinished(0), task);
      for (int before = 0; before < s; before++) {
        String step = steps.get(before);
        if (!step.equals("driver")) {
          int total = work.ledger(Stage.SOLVE).step(step).finished().cardinality();
          assertTrue(died.out().contains("solve " + step + ": " + total + " of " + total
              + " tasks finished in an earlier run, skipped") || before == s - 1,
              task + ": " + step + " redone\n" + died.out());
        } else if (before < s - 1) {
          assertTrue(died.out().contains("solve driver: finished in an earlier run, skipped"),
              died.out());
        }
      }
      assertUntouched(records, task);
      records = recordTimes(work);
    }
    CliRun last = cli("run", scene.config().toString());
    assertEquals(0, last.exitCode(), last.err());
    assertTrue(last.out().contains("solve driver: finished in an earlier run, skipped"),
        last.out());
    assertUntouched(records, "last run");
    assertEquals(reference, Scenes.chunkFiles(scene.container().resolve("segmentation")),
        "output bytes differ from the single-level run");
  }

  /**
   * With a size filter the level-by-level solve is followed by the filter's own steps: the run
   * writes the single-level bytes, and a run that dies at a task of each of the filter's steps
   * in turn resumes each time to them.
   */
  @Test
  void sizeFilterStepsResumeToTheSingleLevelBytes(@TempDir Path dir) throws IOException {
    Scenes.Scene single = Scenes.write(dir.resolve("single"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MWS_FILTERED);
    long bound = boundFor(single, 1);
    List<String> reference = Scenes.chunkFiles(single.container().resolve("segmentation"));
    Scenes.Scene scene = Scenes.write(dir.resolve("levels"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MWS_FILTERED);
    writeBound(scene, Files.readString(scene.config()), bound);
    WorkDir work = workDir(scene);
    Map<Path, FileTime> records = new HashMap<>();
    for (String step : List.of("filter-up-1", "filter-driver", "filter-down-1", "ids")) {
      String task = "solve-" + step + ":0";
      CliRun died = runFailingAt(task, scene.config());
      assertNotEquals(0, died.exitCode(), task + ":\n" + died.out());
      assertTrue(Files.exists(work.root().resolve(".injected-failure-solve-" + step + "-0")),
          task);
      assertTrue(!work.ledger(Stage.SOLVE).step(step).isFinished(0), task);
      assertUntouched(records, task);
      records = recordTimes(work);
    }
    CliRun last = cli("run", scene.config().toString());
    assertEquals(0, last.exitCode(), last.err());
    assertTrue(last.out().contains("size filter driver: finished in an earlier run, skipped")
        || last.out().contains("solve filter-driver: finished in an earlier run, skipped"),
        last.out());
    assertTrue(last.out().contains("then the size filter"), last.out());
    assertUntouched(records, "last run");
    assertEquals(reference, Scenes.chunkFiles(scene.container().resolve("segmentation")),
        "output bytes differ from the single-level run");
  }

  /**
   * The default method's multicut through the Spark steps (domain decomposition,
   * {@code MulticutPartSolver}): under a bound that gives a level it solves level by level, at
   * most {@value #MULTICUT_MAX_VOI} bits of variation of information against the ground truth
   * worse than the single-level run; and a run that dies at a task of {@code up-1}, and again at
   * the driver's step, resumes to the bytes of an uninterrupted level-by-level run.
   */
  @Test
  void multicutSolvesByLevelsCloseToTheSingleLevelAndResumesToItsOwnBytes(@TempDir Path dir)
      throws IOException {
    Scenes.Scene single = Scenes.write(dir.resolve("single"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MULTICUT);
    long bound = boundFor(single, 1);
    long[] reference = Scenes.labels(single.container(), "segmentation");
    Scenes.Scene leveled = Scenes.write(dir.resolve("levels"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MULTICUT);
    writeBound(leveled, Files.readString(leveled.config()), bound);
    CliRun run = cli("run", leveled.config().toString());
    assertEquals(0, run.exitCode(), run.err());
    assertTrue(run.out().contains("solve level 1:")
        && run.out().contains("by domain decomposition"), run.out());
    long[] truth = Scenes.labels(single.container(), "ground-truth");
    long[] levels = Scenes.labels(leveled.container(), "segmentation");
    double between = voi(reference, levels, false);
    double singleToTruth = voi(truth, reference, true);
    double levelsToTruth = voi(truth, levels, true);
    assertTrue(levelsToTruth <= singleToTruth + MULTICUT_MAX_VOI, "VOI against the ground"
        + " truth: level by level " + levelsToTruth + ", single level " + singleToTruth
        + " (between the two " + between + ")");
    List<String> bytes = Scenes.chunkFiles(leveled.container().resolve("segmentation"));
    Scenes.Scene resumed = Scenes.write(dir.resolve("resumed"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, MULTICUT);
    writeBound(resumed, Files.readString(resumed.config()), bound);
    for (String task : List.of("solve-up-1:0", "solve-driver:0")) {
      CliRun died = runFailingAt(task, resumed.config());
      assertNotEquals(0, died.exitCode(), task + ":\n" + died.out());
    }
    CliRun last = cli("run", resumed.config().toString());
    assertEquals(0, last.exitCode(), last.err());
    assertEquals(bytes, Scenes.chunkFiles(resumed.container().resolve("segmentation")),
        "the resumed run's bytes differ from the uninterrupted level-by-level run's");
  }

  /**
   * A child JVM runs the level-by-level solve and is killed (SIGKILL) inside level 1 on the way
   * up, inside level 2, and inside level 1 on the way down, in turn; each rerun skips what the
   * killed run recorded, and the last one ends with the single-level bytes.
   */
  @Test
  void killedInsideEachLevelResumesToTheSingleLevelBytes(@TempDir Path dir) throws Exception {
    killedInsideStepsResumesToTheSingleLevelBytes(dir, MWS, 2, List.of("up-1", "up-2",
        "down-1"));
  }

  /** As above, with a size filter: killed inside its level 1 on the way up and on the way down. */
  @Test
  void killedInsideTheSizeFilterResumesToTheSingleLevelBytes(@TempDir Path dir)
      throws Exception {
    killedInsideStepsResumesToTheSingleLevelBytes(dir, MWS_FILTERED, 1,
        List.of("filter-up-1", "filter-down-1"));
  }

  private void killedInsideStepsResumesToTheSingleLevelBytes(Path dir, String method,
      int levels, List<String> steps) throws Exception {
    Scenes.Scene single = Scenes.write(dir.resolve("single"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, method);
    long bound = boundFor(single, levels);
    List<String> reference = Scenes.chunkFiles(single.container().resolve("segmentation"));
    Scenes.Scene scene = Scenes.write(dir.resolve("levels"), StorageFormat.ZARR,
        Degradation.moderate(13), BLOCK_XYZ, method);
    writeBound(scene, Files.readString(scene.config()), bound);
    WorkDir work = workDir(scene);
    Map<Path, FileTime> records = new HashMap<>();
    for (String step : steps) {
      org.sunder.spark.workdir.StageLedger ledger = work.ledger(Stage.SOLVE).step(step);
      List<String> command = org.sunder.spark.cli.ChildCli.command("1g",
          List.of("-D" + TaskHooks.DELAY_KEY + "=300"), "run", scene.config().toString(),
          "--master", "local[2]");
      Path log = Files.createTempFile(dir, "child", ".log");
      Process child = new ProcessBuilder(command).redirectErrorStream(true)
          .redirectOutput(log.toFile()).start();
      long deadline = System.nanoTime() + 180_000_000_000L;
      while (ledger.finished().cardinality() < 1) {
        assertTrue(child.isAlive(), step + ": child ended before the kill\n"
            + Files.readString(log));
        assertTrue(System.nanoTime() < deadline, step + ": not reached\n" + Files.readString(log));
        Thread.sleep(20);
      }
      child.destroyForcibly();
      child.waitFor();
      assertTrue(!work.ledger(Stage.SOLVE).isFinished(0), step + ": the solve finished");
      assertUntouched(records, "kill in " + step);
      records = recordTimes(work);
    }
    CliRun last = cli("run", scene.config().toString());
    assertEquals(0, last.exitCode(), last.err());
    assertTrue(last.out().contains("solve driver: finished in an earlier run, skipped"),
        last.out());
    assertTrue(last.out().contains("solve " + steps.get(0) + ": "), last.out());
    assertUntouched(records, "last run");
    assertEquals(reference, Scenes.chunkFiles(scene.container().resolve("segmentation")),
        "output bytes differ from the single-level run");
  }

  /** Every task record under the solve's folder (its steps included) with its time. */
  private static Map<Path, FileTime> recordTimes(WorkDir work) throws IOException {
    Map<Path, FileTime> times = new HashMap<>();
    for (Stage stage : Stage.values()) {
      Path ledger = work.ledger(stage).dir();
      if (Files.isDirectory(ledger)) {
        try (Stream<Path> files = Files.walk(ledger)) {
          for (Path file : files.filter(f -> f.toString().endsWith(".done")).toList()) {
            times.put(file, Files.getLastModifiedTime(file));
          }
        }
      }
    }
    return times;
  }

  private static void assertUntouched(Map<Path, FileTime> before, String when)
      throws IOException {
    for (Map.Entry<Path, FileTime> record : before.entrySet()) {
      assertTrue(Files.exists(record.getKey()), when + ": record vanished " + record.getKey());
      assertEquals(record.getValue(), Files.getLastModifiedTime(record.getKey()),
          when + ": recorded task redone: " + record.getKey());
    }
  }
}
