package org.sunder.spark.workdir;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * Decides whether a rerun may continue an earlier run's work dir. The same configuration and
 * input continue where the run stopped. A change that only affects stages after the ones that
 * hold finished work is accepted and those stages are redone; any other change is refused with a
 * message that lists what changed, unless the user starts over.
 *
 * <p>Which stage a configuration section affects first: {@code input}, {@code output},
 * {@code blocks}, {@code partition} and {@code axes} affect partition (everything);
 * {@code solve} affects solve, except once relabel has rewritten chunks in place, when the
 * provisional ids it would need are gone; {@code evaluate} affects only evaluate.
 */
public final class ResumePlanner {
  private ResumePlanner() {}

  /** The first stage a change of configuration section {@code section} affects. */
  public static Stage firstAffected(String section) {
    return switch (section) {
      case "solve" -> Stage.SOLVE;
      case "evaluate" -> Stage.EVALUATE;
      default -> Stage.PARTITION;
    };
  }

  /**
   * @param previous the work dir's manifest
   * @param current the manifest this run would write
   * @param anyRelabelled whether relabel has rewritten any chunk
   * @param workDir shown in messages
   */
  public static ResumeDecision decide(Manifest previous, Manifest current, boolean anyRelabelled,
      String workDir) {
    if (!Manifest.TOOL.equals(previous.tool())) {
      throw conflict(workDir, List.of("the manifest was not written by Sunder"));
    }
    List<String> changes = new ArrayList<>();
    if (!Objects.equals(previous.version(), current.version())) {
      changes.add("tool version: " + previous.version() + " -> " + current.version());
    }
    if (!Objects.equals(previous.inputFingerprint(), current.inputFingerprint())) {
      changes.add("input data changed: was " + previous.inputSummary() + ", now "
          + current.inputSummary());
    }
    Stage redoFrom = null;
    for (Map.Entry<String, String> entry : current.sectionHashes().entrySet()) {
      String before = previous.sectionHashes().get(entry.getKey());
      if (!entry.getValue().equals(before)) {
        Stage affected = firstAffected(entry.getKey());
        if (affected == Stage.SOLVE && anyRelabelled) {
          affected = Stage.PARTITION;
        }
        redoFrom = redoFrom == null || affected.ordinal() < redoFrom.ordinal() ? affected : redoFrom;
      }
    }
    List<String> keyChanges = new ArrayList<>();
    JsonDiff.diff("", previous.config(), current.config(), keyChanges);
    if (!changes.isEmpty() || redoFrom == Stage.PARTITION) {
      changes.addAll(keyChanges);
      if (redoFrom == Stage.PARTITION && anyRelabelled
          && keyChanges.stream().allMatch(line -> line.startsWith("solve."))) {
        changes.add("(relabel has already replaced the provisional ids that a new solve needs)");
      }
      throw conflict(workDir, changes);
    }
    List<String> notes = new ArrayList<>();
    if (redoFrom != null) {
      notes.add("settings changed that affect " + redoFrom.cliName() + " and later stages only;"
          + " redoing them: " + String.join("; ", keyChanges));
    }
    return new ResumeDecision(redoFrom, notes);
  }

  private static SunderException conflict(String workDir, List<String> changes) {
    return new SunderException(ErrorKind.CONFLICT, "work dir " + workDir
        + " belongs to a run with other settings or input:\n  " + String.join("\n  ", changes)
        + "\nRerun with the original settings to resume it, use --fresh to start over"
        + " (this discards its results), or choose another work dir.");
  }
}
