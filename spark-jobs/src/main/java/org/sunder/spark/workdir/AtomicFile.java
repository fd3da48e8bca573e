package org.sunder.spark.workdir;

import java.io.IOException;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.concurrent.ThreadLocalRandom;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * Writes a file so that readers see either the old content or the whole new content: the bytes
 * go to a temporary file in the same directory, which is then renamed into place.
 */
public final class AtomicFile {
  private AtomicFile() {}

  /** Writes {@code bytes} to {@code target} atomically, creating parent directories. */
  public static void write(Path target, byte[] bytes) {
    Path dir = target.toAbsolutePath().getParent();
    Path tmp = dir.resolve("." + target.getFileName() + ".tmp-"
        + Long.toHexString(ThreadLocalRandom.current().nextLong()));
    try {
      Files.createDirectories(dir);
      Files.write(tmp, bytes);
      try {
        Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
      } catch (AtomicMoveNotSupportedException e) {
        Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING);
      }
    } catch (IOException e) {
      try {
        Files.deleteIfExists(tmp);
      } catch (IOException ignored) {
        // the original failure is the one to report
      }
      throw new SunderException(ErrorKind.STORAGE, "cannot write " + target + ": " + e, e);
    }
  }
}
