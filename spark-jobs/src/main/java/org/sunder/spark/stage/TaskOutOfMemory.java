package org.sunder.spark.stage;

/**
 * A stage task ran out of memory. Thrown in place of the {@link OutOfMemoryError} (whose memory
 * is free again once the task's stack unwinds), without it as cause: Spark ends the whole
 * executor, and in local mode the whole process with exit 52, on an error whose cause chain
 * holds an {@code OutOfMemoryError}. The command line maps it to its own exit code with a hint.
 */
public final class TaskOutOfMemory extends RuntimeException {
  private static final long serialVersionUID = 1L;

  public TaskOutOfMemory(String message) {
    super(message);
  }
}
