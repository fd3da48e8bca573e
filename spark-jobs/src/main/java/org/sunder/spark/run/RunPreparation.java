package org.sunder.spark.run;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.UUID;
import java.util.stream.Stream;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.ResumeDecision;
import org.sunder.spark.workdir.ResumePlanner;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.SunderVersion;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.spark.workdir.WorkDirLock;
import org.sunder.stitching.setup.OutputContainer;

/**
 * Readies the work dir and the output dataset for a run, refusing before anything is written
 * when the output belongs to something else or the work dir to another run, and while another
 * process holds the work dir's {@link WorkDirLock} (also with {@code --fresh}). The prepared run
 * holds that lock until it is closed. The output dataset carries the attribute {@value #MARKER}
 * with the run's id, which ties it to its work dir. Temporary chunk files that a killed run left
 * in the output dataset are removed. The inputs are checked and the output datasets created by
 * the run's {@link org.sunder.stitching.setup.StitchingSetup#prepare()}, as the in-process runner does.
 */
public final class RunPreparation {
  /** Attribute of the output dataset naming the run that owns it. */
  public static final String MARKER = "sunder";

  private RunPreparation() {}

  /**
   * @param fresh discard an earlier run's work dir and output (both must be Sunder's)
   */
  public static PreparedRun prepare(RunSettings settings, boolean fresh) {
    WorkDir work = new WorkDir(settings.workDirPath());
    WorkDirLock.requireFree(work.root());
    check(settings, work, fresh);
    WorkDirLock lock = WorkDirLock.acquire(work.root());
    try {
      PreparedRun run = prepareLocked(settings, work, check(settings, work, fresh), fresh, lock);
      lock.writeHolder();
      return run;
    } catch (RuntimeException e) {
      lock.close();
      throw e;
    }
  }

  /**
   * Every refusal {@link #prepare} can make before it writes, writing nothing: another process
   * holds the work dir, the output or work dir belongs to something else or another run, or the
   * earlier run's settings or input differ in a way that forbids resuming it.
   */
  public static void check(RunSettings settings, boolean fresh) {
    WorkDir work = new WorkDir(settings.workDirPath());
    WorkDirLock.requireFree(work.root());
    Found found = check(settings, work, fresh);
    if (!fresh && found.previous().isPresent()) {
      Manifest previous = found.previous().get();
      boolean relabelled = !work.ledger(Stage.RELABEL).finished().isEmpty();
      ResumePlanner.decide(previous, RunIdentity.manifest(settings, previous.runId()), relabelled,
          work.root().toString());
    }
  }

  /** What is on disk before a run: the output container, its owner run, the work dir's manifest. */
  private record Found(boolean output, String outputRun, Optional<Manifest> previous) {}

  /** Reads what is there and refuses on a conflict; writes nothing. */
  private static Found check(RunSettings settings, WorkDir work, boolean fresh) {
    Path outputRoot = Path.of(settings.outputContainer());
    String dataset = settings.outputDataset();
    boolean output = OutputContainer.exists(outputRoot);
    if (!output) {
      requireCreatable(outputRoot, "output.container");
    }
    requireCreatable(work.root(), "workDir");
    String outputRun = output ? ownerRun(dataset, outputRoot).orElse(null) : null;
    if (work.holdsForeignFiles()) {
      throw new SunderException(ErrorKind.CONFLICT, "work dir " + work.root()
          + " holds files that Sunder did not write; choose another work dir (key workDir)");
    }
    if (outputRun != null && !fresh) {
      requireOutputFits(settings, OutputContainer.layout(outputRoot, dataset), outputRoot);
    }
    Optional<Manifest> previous = work.manifest();
    if (previous.isPresent() && outputRun != null && !previous.get().runId().equals(outputRun)) {
      throw new SunderException(ErrorKind.CONFLICT, "work dir " + work.root() + " is from run "
          + previous.get().runId() + ", but output dataset '" + dataset + "' in " + outputRoot
          + " belongs to run " + outputRun + "; use --fresh to start over, or the matching work dir");
    }
    if (previous.isEmpty() && outputRun != null && !fresh) {
      throw new SunderException(ErrorKind.CONFLICT, "output dataset '" + dataset + "' in "
          + outputRoot + " was written by Sunder run " + outputRun + ", whose work dir is not at "
          + work.root() + "; use --fresh to overwrite it, or set workDir to that run's work dir");
    }
    return new Found(output, outputRun, previous);
  }

  private static PreparedRun prepareLocked(RunSettings settings, WorkDir work, Found found,
      boolean fresh, WorkDirLock lock) {
    Path outputRoot = Path.of(settings.outputContainer());
    String dataset = settings.outputDataset();
    boolean output = found.output();
    String outputRun = found.outputRun();
    Optional<Manifest> previous = found.previous();
    List<String> notes = new ArrayList<>();
    String runId;
    if (fresh) {
      if (previous.isPresent() || outputRun != null) {
        notes.add("--fresh: discarding the earlier run's records and output");
      }
      work.clearAll();
      if (outputRun != null) {
        deleteTree(outputRoot.resolve(dataset));
      }
      previous = Optional.empty();
      outputRun = null;
    }
    Manifest current;
    if (previous.isPresent()) {
      runId = previous.get().runId();
      current = RunIdentity.manifest(settings, runId);
      boolean relabelled = !work.ledger(Stage.RELABEL).finished().isEmpty();
      ResumeDecision decision = ResumePlanner.decide(previous.get(), current, relabelled,
          work.root().toString());
      notes.addAll(decision.notes());
      if (outputRun == null) {
        notes.add("the output dataset is missing; redoing every stage");
        work.clearFrom(Stage.PARTITION);
      } else if (decision.redoFrom() != null) {
        work.clearFrom(decision.redoFrom());
      }
      notes.add("resuming run " + runId + " from work dir " + work.root());
    } else {
      runId = UUID.randomUUID().toString();
      current = RunIdentity.manifest(settings, runId);
    }
    createOutput(settings, outputRoot, output, dataset, runId);
    int stale = OutputContainer.removeStaleTemporaries(outputRoot, dataset);
    if (stale > 0) {
      notes.add("removed " + stale + " temporary chunk file" + (stale == 1 ? "" : "s")
          + " that an interrupted run left in output dataset '" + dataset + "'");
    }
    work.writeManifest(current);
    return new PreparedRun(settings, work, current, notes, lock);
  }

  /** Refuses to resume into an output dataset whose shape or chunks no longer match the input. */
  private static void requireOutputFits(RunSettings s, OutputContainer.Layout existing,
      Path root) {
    if (Arrays.equals(existing.shape(), s.volumeShape())
        && Arrays.equals(existing.chunkShape(), s.chunkShape())) {
      return;
    }
    AxisOrder axes = new AxisOrder(s.axes());
    throw new SunderException(ErrorKind.CONFLICT, "output dataset '" + s.outputDataset() + "' in "
        + root + " has shape " + Arrays.toString(axes.toFile(existing.shape())) + " and chunks "
        + Arrays.toString(axes.toFile(existing.chunkShape())) + " (" + axes + "), but the input"
        + " now has shape " + Arrays.toString(axes.toFile(s.volumeShape())) + " and chunks "
        + Arrays.toString(axes.toFile(s.chunkShape())) + "; use --fresh to start over");
  }

  /** Refuses a path that cannot be created: its nearest existing ancestor is no writable directory. */
  private static void requireCreatable(Path path, String key) {
    Path existing = path.toAbsolutePath().normalize();
    while (existing != null && !Files.exists(existing)) {
      existing = existing.getParent();
    }
    if (existing == null || existing.equals(path)) {
      return;
    }
    if (!Files.isDirectory(existing) || !Files.isWritable(existing)) {
      throw new SunderException(ErrorKind.STORAGE, key + ": cannot create " + path + ": "
          + existing + (Files.isDirectory(existing) ? " is not writable" : " is not a directory"));
    }
  }

  private static Optional<String> ownerRun(String dataset, Path root) {
    return OutputContainer.marker(root, dataset, MARKER).map(marker -> {
      if (marker.get("runId") instanceof String id) {
        return id;
      }
      throw new SunderException(ErrorKind.CONFLICT, "output.dataset: '" + dataset + "' in "
          + root + " exists and was not written by Sunder; choose another output dataset or"
          + " remove it");
    });
  }

  /**
   * Creates the output container if needed, then the run's output datasets through the run's
   * one preparation step ({@link org.sunder.stitching.setup.StitchingSetup#prepare()}), and marks a
   * new label dataset with the run's id.
   */
  private static void createOutput(RunSettings s, Path root, boolean existing, String dataset,
      String runId) {
    if (!existing) {
      OutputContainer.create(root, Path.of(s.inputContainer()));
    }
    boolean created = !OutputContainer.holds(root, dataset);
    s.setup().prepare();
    if (created) {
      Map<String, Object> marker = new LinkedHashMap<>();
      marker.put("runId", runId);
      marker.put("workDir", s.workDir());
      marker.put("version", SunderVersion.get());
      Map<String, Object> attributes = new LinkedHashMap<>();
      attributes.put(MARKER, marker);
      attributes.put("axes", "zyx");
      OutputContainer.mergeAttributes(root, dataset, attributes);
    }
  }

  private static void deleteTree(Path dir) {
    if (!Files.exists(dir)) {
      return;
    }
    try (Stream<Path> walk = Files.walk(dir)) {
      for (Path path : walk.sorted(Comparator.reverseOrder()).toList()) {
        Files.delete(path);
      }
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot remove " + dir + ": " + e, e);
    }
  }
}
