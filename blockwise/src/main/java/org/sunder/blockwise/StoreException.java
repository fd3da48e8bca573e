package org.sunder.blockwise;


/**
 * An error of the storage layer. Its kind tells what went wrong: {@link ErrorKind#INVALID_INPUT}
 * for a missing or malformed container, dataset, metadata key, a chunk that is truncated, has a
 * wrong header or fails to decompress (corrupt data is invalid input), or a request that does not
 * fit the dataset (box out of bounds, array shape or type mismatch); {@link ErrorKind#STORAGE}
 * for I/O failures (permissions, a full disk, an unreadable directory);
 * {@link ErrorKind#INVALID_CONFIG} for a bad codec or dataset specification; and
 * {@link ErrorKind#CONFLICT} for creating something that already exists. The message names the
 * file, the key or the chunk grid position and what was expected.
 */
public class StoreException extends SunderException {
  private static final long serialVersionUID = 1L;

  public StoreException(ErrorKind kind, String message) {
    super(kind, message);
  }

  public StoreException(ErrorKind kind, String message, Throwable cause) {
    super(kind, message, cause);
  }
}
