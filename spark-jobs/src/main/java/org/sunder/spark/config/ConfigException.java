package org.sunder.spark.config;

import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/** A run configuration value is missing, unknown or out of range; the message names the key. */
public final class ConfigException extends SunderException {
  private static final long serialVersionUID = 1L;

  public ConfigException(String message) {
    super(ErrorKind.INVALID_CONFIG, message);
  }

  public ConfigException(String message, Throwable cause) {
    super(ErrorKind.INVALID_CONFIG, message, cause);
  }
}
