package org.sunder.spark.run;

import java.util.List;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.WorkDir;

/**
 * A run ready for its stages: settings, its work dir with the manifest written, and the output
 * dataset created.
 *
 * @param notes what preparation decided (resumed, redone stages), for the user
 */
public record PreparedRun(RunSettings settings, WorkDir workDir, Manifest manifest,
    List<String> notes) {
  public PreparedRun {
    notes = List.copyOf(notes);
  }
}
