package org.sunder.blockwise;

import java.util.Objects;

/**
 * The base of every error Sunder raises on purpose. Its message is written for the user: it
 * names the file, dataset, key or value at fault and says what was expected. Subclasses per
 * area (storage, configuration, input) add nothing but their name and default kind.
 */
public class SunderException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  private final ErrorKind kind;

  public SunderException(ErrorKind kind, String message) {
    super(message);
    this.kind = Objects.requireNonNull(kind, "kind");
  }

  public SunderException(ErrorKind kind, String message, Throwable cause) {
    super(message, cause);
    this.kind = Objects.requireNonNull(kind, "kind");
  }

  /** What kind of error this is; decides the command line's exit code. */
  public ErrorKind kind() {
    return kind;
  }
}
