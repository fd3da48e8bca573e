package org.sunder.spark.workdir;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.BitSet;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.files.AtomicWrites;

/**
 * The record of one stage's finished tasks in a work dir: one file per task, named by the task's
 * index, holding the task's serialized result. A task's record is written (atomically) only
 * after all its outputs are in place, so resume may trust every record it finds. Safe to use
 * from many processes at once, as long as no two write the same task (Spark's retries write the
 * same bytes, and the rename makes the last one win).
 */
public final class StageLedger {
  private static final String SUFFIX = ".done";
  private static final String TIMING_SUFFIX = ".timing";

  private final Stage stage;
  private final Path dir;

  StageLedger(Path stagesDir, Stage stage) {
    this(stage, stagesDir.resolve(stage.cliName()));
  }

  private StageLedger(Stage stage, Path dir) {
    this.stage = stage;
    this.dir = dir;
  }

  /**
   * The ledger of one step of this stage whose tasks run as a Spark job of their own (a level of
   * the hierarchical solve), in the subfolder {@code name}: cleared with the stage, not counted
   * among its own records.
   */
  public StageLedger step(String name) {
    if (!name.matches("[a-z0-9-]+")) {
      throw new IllegalArgumentException("step name '" + name + "'");
    }
    return new StageLedger(stage, dir.resolve(name));
  }

  public Stage stage() {
    return stage;
  }

  public Path dir() {
    return dir;
  }

  /** Records that task {@code index} finished, with its result bytes. */
  public void record(int index, byte[] result) {
    AtomicWrites.write(dir.resolve(index + SUFFIX), ByteBuffer.wrap(result));
  }

  /**
   * Records when task {@code index} started (epoch milliseconds) and how long its body took;
   * written before the task's record, read by the run report ({@link #timings()}).
   */
  public void recordTiming(int index, long startMillis, double seconds) {
    AtomicWrites.write(dir.resolve(index + TIMING_SUFFIX),
        ByteBuffer.wrap((startMillis + " " + seconds).getBytes(StandardCharsets.US_ASCII)));
  }

  /**
   * The timings of the recorded tasks that have one, as rows {@code {index, startMillis,
   * endMillis}} (one directory listing; O(tasks)).
   */
  public java.util.List<long[]> timings() {
    java.util.List<long[]> rows = new java.util.ArrayList<>();
    BitSet done = finished();
    try (DirectoryStream<Path> files = Files.newDirectoryStream(dir, "*" + TIMING_SUFFIX)) {
      for (Path file : files) {
        String name = file.getFileName().toString();
        int index = Integer.parseInt(name.substring(0, name.length() - TIMING_SUFFIX.length()));
        if (!done.get(index)) {
          continue;
        }
        String[] parts = Files.readString(file).trim().split(" ");
        long start = Long.parseLong(parts[0]);
        rows.add(new long[] {index, start, start + Math.round(Double.parseDouble(parts[1]) * 1000)});
      }
    } catch (NoSuchFileException e) {
      return rows;
    } catch (IOException | RuntimeException e) {
      throw new SunderException(ErrorKind.CONFLICT, "cannot read the task timings in " + dir
          + ": " + e, e);
    }
    return rows;
  }

  /** Whether task {@code index} has a record. */
  public boolean isFinished(int index) {
    return Files.isRegularFile(dir.resolve(index + SUFFIX));
  }

  /** The result bytes recorded for task {@code index}. */
  public byte[] read(int index) {
    Path file = dir.resolve(index + SUFFIX);
    try {
      return Files.readAllBytes(file);
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot read the record of " + stage.cliName()
          + " task " + index + " at " + file + ": " + e, e);
    }
  }

  /** The indices of all recorded tasks (one directory listing). */
  public BitSet finished() {
    BitSet done = new BitSet();
    try (DirectoryStream<Path> files = Files.newDirectoryStream(dir, "*" + SUFFIX)) {
      for (Path file : files) {
        String name = file.getFileName().toString();
        try {
          done.set(Integer.parseInt(name.substring(0, name.length() - SUFFIX.length())));
        } catch (NumberFormatException e) {
          throw new SunderException(ErrorKind.CONFLICT, "unexpected file " + file
              + " in the work dir; it was not written by Sunder");
        }
      }
    } catch (NoSuchFileException e) {
      return done;
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot list " + dir + ": " + e, e);
    }
    return done;
  }

  /**
   * Removes every record of this stage, with the files its tasks left beside them (the solve's
   * level files sit in a subdirectory).
   */
  public void clear() {
    if (!Files.isDirectory(dir)) {
      return;
    }
    try (java.util.stream.Stream<Path> walk = Files.walk(dir)) {
      for (Path file : walk.sorted(java.util.Comparator.reverseOrder()).toList()) {
        Files.delete(file);
      }
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot clear " + dir + ": " + e, e);
    }
  }

}
