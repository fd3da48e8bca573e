package org.sunder.blockwise;

/**
 * What kind of mistake or failure an error reports. The command line maps each kind to its own
 * exit code, so scripts around Sunder can tell a bad configuration from a corrupt chunk.
 */
public enum ErrorKind {
  /** A configuration value or command-line option is missing, unknown or out of range. */
  INVALID_CONFIG(2),
  /** An input container, dataset, array or chunk (corrupt, truncated) is not what was expected. */
  INVALID_INPUT(3),
  /** Storage failed: an I/O error such as missing permissions or a full disk. */
  STORAGE(4),
  /** The output or work dir belongs to another run, or was changed since. */
  CONFLICT(5),
  /** A bug or an unexpected failure inside Sunder. */
  INTERNAL(70);

  private final int exitCode;

  ErrorKind(int exitCode) {
    this.exitCode = exitCode;
  }

  /** The process exit code the command line uses for this kind. */
  public int exitCode() {
    return exitCode;
  }
}
