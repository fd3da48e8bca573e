package org.sunder.spark.run;

import java.util.List;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.spark.workdir.WorkDirLock;

/**
 * A run ready for its stages: settings, its work dir with the manifest written, and the output
 * dataset created. Holds the work dir's lock until closed.
 *
 * @param notes what preparation decided (resumed, redone stages), for the user
 * @param lock this process's claim on the work dir
 */
public record PreparedRun(RunSettings settings, WorkDir workDir, Manifest manifest,
    List<String> notes, WorkDirLock lock) implements AutoCloseable {
  public PreparedRun {
    notes = List.copyOf(notes);
  }

  /** Releases the work dir's lock. */
  @Override
  public void close() {
    lock.close();
  }
}
