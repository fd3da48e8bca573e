package org.sunder.spark.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.spark.cli.ChildCli;
import org.sunder.spark.it.Scenes;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;

/**
 * Random kill trials of the local-mode command line: each trial runs {@code sunder run} in a
 * child JVM, SIGKILLs it at a moment drawn uniformly over the length of a whole run, SIGKILLs the
 * rerun (a resume) at a second random moment, then reruns to the end and compares the output
 * chunk files with an uninterrupted run's. Prints one line per trial and how many resumed
 * byte-identical, with the task records each stage had at each kill; exits 1 if any did not.
 * Not a test.
 *
 * <p>Arguments: {@code [trials (default 10)] [seed (default 13)] [dir]}. Run with
 * {@code bin/bench spark-jobs KillResumeSoak 20 7}. Each trial costs about three child runs.
 */
public final class KillResumeSoak {
  private static final int[] CHUNK_XYZ = {32, 28, 10};
  private static final String MWS = "{\"method\": \"mutex-watershed\"}";

  private KillResumeSoak() {}

  public static void main(String[] args) throws Exception {
    int trials = args.length > 0 ? Integer.parseInt(args[0]) : 10;
    long seed = args.length > 1 ? Long.parseLong(args[1]) : 13;
    Path dir = args.length > 2 ? Path.of(args[2]) : Files.createTempDirectory("kill-resume-soak");
    if (trials < 1) {
      throw new IllegalArgumentException("trials " + trials + ": expected at least 1");
    }
    Random random = new Random(seed);

    Path referenceDir = dir.resolve("reference");
    Scenes.Scene reference = Scenes.write(referenceDir, StorageFormat.N5,
        Degradation.moderate(13), CHUNK_XYZ, MWS);
    long start = System.nanoTime();
    Process whole = start(reference.config(), referenceDir.resolve("run.log"));
    int code = whole.waitFor();
    long runMillis = TimeUnit.NANOSECONDS.toMillis(System.nanoTime() - start);
    if (code != 0) {
      throw new IllegalStateException("the uninterrupted run failed with exit " + code
          + "; see " + referenceDir.resolve("run.log"));
    }
    List<String> expected = Scenes.chunkFiles(reference.container().resolve("segmentation"));
    System.out.printf(Locale.ROOT, "uninterrupted run: %d ms, %d chunk files; %d trials, seed %d,"
        + " in %s%n", runMillis, expected.size(), trials, seed, dir);

    int identical = 0;
    for (int trial = 0; trial < trials; trial++) {
      Path trialDir = dir.resolve("trial-" + trial);
      Scenes.Scene scene = Scenes.write(trialDir, StorageFormat.N5, Degradation.moderate(13),
          CHUNK_XYZ, MWS);
      long firstKill = (long) (random.nextDouble() * runMillis);
      long resumeKill = (long) (random.nextDouble() * runMillis);
      WorkDir work = new WorkDir(scene.container().resolveSibling("scene.n5.sunder-work")
          .resolve("segmentation"));
      String first = runAndKill(scene.config(), trialDir.resolve("first.log"), firstKill, work);
      String second = runAndKill(scene.config(), trialDir.resolve("resume.log"), resumeKill,
          work);
      Process last = start(scene.config(), trialDir.resolve("last.log"));
      if (!last.waitFor(10, TimeUnit.MINUTES)) {
        last.destroyForcibly();
      }
      int exit = last.isAlive() ? -1 : last.exitValue();
      boolean same = exit == 0
          && expected.equals(Scenes.chunkFiles(scene.container().resolve("segmentation")));
      identical += same ? 1 : 0;
      System.out.printf(Locale.ROOT, "trial %d: first run %s at %d ms, resume %s at %d ms;"
          + " last run exit %d, %s%n", trial, first, firstKill, second, resumeKill, exit,
          same ? "byte-identical" : "DIFFERENT (see " + trialDir + ")");
    }
    System.out.printf(Locale.ROOT, "%d of %d trials resumed byte-identical%n", identical, trials);
    if (identical != trials) {
      System.exit(1);
    }
  }

  /**
   * Starts a run and SIGKILLs it after {@code millis}; says whether the kill hit it and how many
   * task records each stage had then.
   */
  private static String runAndKill(Path config, Path log, long millis, WorkDir work)
      throws IOException, InterruptedException {
    Process process = start(config, log);
    if (process.waitFor(millis, TimeUnit.MILLISECONDS)) {
      return "finished (exit " + process.exitValue() + ") before the kill";
    }
    process.destroyForcibly();
    process.waitFor();
    StringBuilder records = new StringBuilder("killed (records:");
    for (Stage stage : Stage.values()) {
      records.append(' ').append(stage.cliName()).append(' ')
          .append(work.ledger(stage).finished().cardinality());
    }
    return records.append(')').toString();
  }

  /** A child JVM running {@code sunder run CONFIG --master local[2]}, output to {@code log}. */
  private static Process start(Path config, Path log) throws IOException {
    List<String> command = ChildCli.command("1g", List.of(), "run", config.toString(), "--master",
        "local[2]");
    return new ProcessBuilder(command).redirectErrorStream(true).redirectOutput(log.toFile())
        .start();
  }
}
