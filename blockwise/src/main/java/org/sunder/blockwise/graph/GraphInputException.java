package org.sunder.blockwise.graph;

import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * Raised when offsets, affinities, masks, labels or weight settings handed to the graph layer
 * are not what it expects. The message names the value at fault and what was expected; the kind
 * is {@link ErrorKind#INVALID_CONFIG} for settings and {@link ErrorKind#INVALID_INPUT} for data.
 */
public final class GraphInputException extends SunderException {
  private static final long serialVersionUID = 1L;

  public GraphInputException(ErrorKind kind, String message) {
    super(kind, message);
  }
}
