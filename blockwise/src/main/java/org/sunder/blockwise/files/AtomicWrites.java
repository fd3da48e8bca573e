package org.sunder.blockwise.files;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.concurrent.ThreadLocalRandom;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;

/**
 * Writes a file whole or not at all: the bytes go to a hidden temporary file in the target's
 * directory (named {@code .<name>.<random>.tmp}), which is then renamed over the target. A reader
 * sees the old content or the new, never a part; a failed write leaves no file behind. The one
 * atomic write of the project (the store, JSON metadata and the work-dir ledger use it).
 * Thread-safe: concurrent writers of one target each rename a whole file; the last rename wins.
 */
public final class AtomicWrites {
  private static final java.util.regex.Pattern TEMPORARY =
      java.util.regex.Pattern.compile("\\..+\\.[0-9a-z]{1,13}\\.tmp");

  private AtomicWrites() {}

  /**
   * Writes {@code parts} one after the other to {@code target}, creating parent directories.
   *
   * @throws StoreException of kind {@link ErrorKind#STORAGE} naming {@code target} when the
   *     directory or file cannot be written
   */
  public static void write(Path target, ByteBuffer... parts) {
    Path dir = target.toAbsolutePath().getParent();
    Path temp = dir.resolve("." + target.getFileName() + "."
        + Long.toUnsignedString(ThreadLocalRandom.current().nextLong(), 36) + ".tmp");
    try {
      Files.createDirectories(dir);
      try (FileChannel channel = FileChannel.open(temp, StandardOpenOption.CREATE_NEW,
          StandardOpenOption.WRITE)) {
        long remaining = 0;
        for (ByteBuffer part : parts) {
          remaining += part.remaining();
        }
        while (remaining > 0) {
          remaining -= channel.write(parts);
        }
      }
      move(temp, target);
    } catch (IOException e) {
      deleteQuietly(temp);
      throw new StoreException(ErrorKind.STORAGE,
          "cannot write " + target + ": " + e.getClass().getSimpleName() + " " + e.getMessage(), e);
    } catch (RuntimeException | Error e) {
      deleteQuietly(temp);
      throw e;
    }
  }

  private static void move(Path temp, Path target) throws IOException {
    try {
      Files.move(temp, target, StandardCopyOption.ATOMIC_MOVE);
    } catch (AtomicMoveNotSupportedException e) {
      Files.move(temp, target, StandardCopyOption.REPLACE_EXISTING);
    }
  }

  private static void deleteQuietly(Path temp) {
    try {
      Files.deleteIfExists(temp);
    } catch (IOException | RuntimeException ignored) {
      // the original failure is the one to report
    }
  }

  /** Whether {@code fileName} has the form of the temporaries {@link #write} creates. */
  public static boolean isTemporary(String fileName) {
    return TEMPORARY.matcher(fileName).matches();
  }

  /** Reads a whole file, or returns null if it does not exist. */
  public static byte[] readIfExists(Path file) {
    try {
      return Files.readAllBytes(file);
    } catch (NoSuchFileException e) {
      return null;
    } catch (IOException e) {
      throw new StoreException(ErrorKind.STORAGE,
          "cannot read " + file + ": " + e.getClass().getSimpleName() + " " + e.getMessage(), e);
    }
  }
}
