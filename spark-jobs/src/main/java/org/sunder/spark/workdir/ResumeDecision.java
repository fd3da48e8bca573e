package org.sunder.spark.workdir;

import java.util.List;

/**
 * What a run does with an existing work dir.
 *
 * @param redoFrom the first stage whose records are dropped and redone, or {@code null} to keep all
 * @param notes lines to tell the user (what changed, what is redone)
 */
public record ResumeDecision(Stage redoFrom, List<String> notes) {
  public ResumeDecision {
    notes = List.copyOf(notes);
  }
}
