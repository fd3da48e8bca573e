package org.sunder.spark.it;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.attribute.FileTime;
import java.util.HashMap;
import java.util.Map;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.function.BooleanSupplier;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.cli.ChildCli;
import org.sunder.spark.cli.CliRun;
import org.sunder.spark.stage.TaskHooks;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;

/**
 * Real processes: a child JVM runs the pipeline and is killed with SIGKILL inside each stage in
 * turn; a rerun must finish with the same output bytes as an uninterrupted run, and skip exactly
 * the tasks whose records the killed run had written. A test-only delay per task
 * ({@value TaskHooks#DELAY_KEY}) makes the kill land inside the stage.
 */
class FaultResumeTest {
  private static final int[] CHUNK_XYZ = {32, 28, 10};
  private static final int BLOCKS = 8;
  private static final int FACES = 12;
  private static final String MWS = "{\"method\": \"mutex-watershed\"}";

  @TempDir
  static Path shared;
  private static Path sceneDir;
  private static List<String> reference;
  private static String referenceScores;

  @BeforeAll
  static void referenceRun() throws Exception {
    sceneDir = shared.resolve("scene");
    Scenes.Scene scene = Scenes.write(sceneDir, StorageFormat.N5, Degradation.moderate(13),
        CHUNK_XYZ, MWS);
    Path run = copyScene(shared.resolve("reference"));
    JavaSparkContext sc = SharedSpark.start("local[2]");
    CliRun child;
    try {
      child = CliRun.with(SparkContextSource.shared(sc), "run", run.resolve("run.json").toString());
    } finally {
      sc.stop();
    }
    assertEquals(0, child.exitCode(), child.err());
    reference = Scenes.chunkFiles(run.resolve("scene.n5/segmentation"));
    referenceScores = scores(child.out());
    assertFalse(reference.isEmpty());
    assertTrue(Files.isDirectory(scene.container()));
  }

  /** A copy of the input scene in {@code dir}, with a configuration for it. */
  private static Path copyScene(Path dir) throws IOException {
    Path from = sceneDir.resolve("scene.n5");
    Path to = dir.resolve("scene.n5");
    try (Stream<Path> walk = Files.walk(from)) {
      for (Path p : walk.toList()) {
        Path target = to.resolve(from.relativize(p).toString());
        if (Files.isDirectory(p)) {
          Files.createDirectories(target);
        } else {
          Files.copy(p, target, StandardCopyOption.COPY_ATTRIBUTES);
        }
      }
    }
    Scenes.writeConfig(dir.resolve("run.json"), to, CHUNK_XYZ, MWS, null);
    return dir;
  }

  private static String scores(String output) {
    int at = output.indexOf("scores over");
    assertTrue(at >= 0, output);
    return output.substring(at, output.indexOf("  segments", at));
  }

  @Test
  void killedInEachStageInTurnResumesToTheSameBytesWithoutRedoingFinishedTasks(@TempDir Path dir)
      throws Exception {
    Path run = copyScene(dir);
    WorkDir work = new WorkDir(run.resolve("scene.n5.sunder-work/segmentation"));
    Map<Path, FileTime> records = new HashMap<>();
    Stage previous = null;
    int previousDone = 0;
    // the pyramid's resume has its own test (PyramidIntegrationTest); the last rerun builds it
    for (Stage stage : List.of(Stage.PARTITION, Stage.SEAMS, Stage.SOLVE, Stage.RELABEL,
        Stage.EVALUATE)) {
      Child child = Child.start(run, List.of("-D" + TaskHooks.DELAY_KEY + "=250"));
      BooleanSupplier inside = stage == Stage.SOLVE
          ? () -> work.ledger(Stage.SEAMS).finished().cardinality() == FACES
          : () -> work.ledger(stage).finished().cardinality() >= 1;
      child.killWhen(inside, stage == Stage.SOLVE ? 150 : 0);
      int done = work.ledger(stage).finished().cardinality();
      assertTrue(done < total(stage), stage + ": the kill came after the stage finished ("
          + done + " of " + total(stage) + ")\n" + child.output());
      if (previous != null && previous != Stage.SOLVE) {
        assertTrue(child.output().contains(skipLine(previous, previousDone)),
            stage + ": expected '" + skipLine(previous, previousDone) + "' in\n" + child.output());
      }
      assertRecordsUntouched(records, stage);
      records = recordTimes(work);
      previous = stage;
      previousDone = done;
    }
    Child last = Child.start(run, List.of());
    assertEquals(0, last.waitFor(), last::output);
    String out = last.output();
    assertTrue(out.contains(skipLine(Stage.EVALUATE, previousDone)), out);
    assertTrue(out.contains(String.format("%-9s %d tasks (%d skipped, %d run)", "evaluate",
        BLOCKS, previousDone, BLOCKS - previousDone)), out);
    for (Stage stage : new Stage[] {Stage.PARTITION, Stage.SEAMS, Stage.RELABEL}) {
      assertTrue(out.contains(skipLine(stage, total(stage))), stage + ":\n" + out);
    }
    assertTrue(out.contains("solve: finished in an earlier run, skipped"), out);
    assertRecordsUntouched(records, null);
    assertEquals(reference, Scenes.chunkFiles(run.resolve("scene.n5/segmentation")),
        "output bytes differ from the uninterrupted run");
    assertEquals(referenceScores, scores(out), "scores differ");
  }

  private static int total(Stage stage) {
    return stage == Stage.SEAMS ? FACES : stage == Stage.SOLVE ? 1 : BLOCKS;
  }

  private static String skipLine(Stage stage, int done) {
    return stage.cliName() + ": " + done + " of " + total(stage)
        + " tasks finished in an earlier run, skipped";
  }

  /** Every task record of the work dir with its modification time. */
  private static Map<Path, FileTime> recordTimes(WorkDir work) throws IOException {
    Map<Path, FileTime> times = new HashMap<>();
    for (Stage stage : Stage.values()) {
      Path ledger = work.ledger(stage).dir();
      if (Files.isDirectory(ledger)) {
        try (Stream<Path> files = Files.list(ledger)) {
          for (Path file : files.filter(f -> f.toString().endsWith(".done")).toList()) {
            times.put(file, Files.getLastModifiedTime(file));
          }
        }
      }
    }
    return times;
  }

  /** Records written before the last rerun are still there, unchanged: their tasks did not run again. */
  private static void assertRecordsUntouched(Map<Path, FileTime> before, Stage stage)
      throws IOException {
    for (Map.Entry<Path, FileTime> record : before.entrySet()) {
      assertTrue(Files.exists(record.getKey()), stage + ": record vanished " + record.getKey());
      assertEquals(record.getValue(), Files.getLastModifiedTime(record.getKey()),
          stage + ": finished task redone: " + record.getKey());
    }
  }

  /** A child JVM running {@code sunder run run.json}. */
  private record Child(Process process, Path log) {
    static Child start(Path dir, List<String> properties) throws IOException {
      return start(dir, properties, "local[2]");
    }

    static Child start(Path dir, List<String> properties, String master) throws IOException {
      List<String> command = ChildCli.command("1g", properties, "run",
          dir.resolve("run.json").toString(), "--master", master);
      Path log = Files.createTempFile(dir, "child", ".log");
      Process process = new ProcessBuilder(command).redirectErrorStream(true)
          .redirectOutput(log.toFile()).start();
      return new Child(process, log);
    }

    int waitFor() throws InterruptedException {
      if (!process.waitFor(3, TimeUnit.MINUTES)) {
        process.destroyForcibly();
        fail("child run did not finish in 3 minutes:\n" + output());
      }
      return process.exitValue();
    }

    /** Polls every 20 ms; SIGKILLs the child {@code afterMillis} after the condition holds. */
    void killWhen(BooleanSupplier condition, long afterMillis) throws InterruptedException {
      long deadline = System.nanoTime() + TimeUnit.MINUTES.toNanos(2);
      while (!condition.getAsBoolean()) {
        if (!process.isAlive()) {
          fail("child ended before the kill:\n" + output());
        }
        if (System.nanoTime() > deadline) {
          process.destroyForcibly();
          fail("condition not reached in 2 minutes:\n" + output());
        }
        Thread.sleep(20);
      }
      Thread.sleep(afterMillis);
      process.destroyForcibly();
      process.waitFor(1, TimeUnit.MINUTES);
    }

    String output() {
      try {
        return Files.readString(log, StandardCharsets.UTF_8);
      } catch (IOException e) {
        return "(no output: " + e + ")";
      }
    }
  }
}
