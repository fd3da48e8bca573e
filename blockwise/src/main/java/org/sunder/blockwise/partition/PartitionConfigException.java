package org.sunder.blockwise.partition;

import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/** A partition setting is missing, unknown or out of range; the message names its key. */
public final class PartitionConfigException extends SunderException {
  private static final long serialVersionUID = 1L;

  public PartitionConfigException(ErrorKind kind, String message) {
    super(kind, message);
  }
}
