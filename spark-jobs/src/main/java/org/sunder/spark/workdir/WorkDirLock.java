package org.sunder.spark.workdir;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.net.InetAddress;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.OverlappingFileLockException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Instant;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * The exclusive claim of one driver process on a work dir, held for the whole run: an operating
 * system lock ({@link FileChannel#tryLock()}, POSIX {@code fcntl} locks on Linux, which NFSv4
 * supports) on the file {@value #FILE} in the work dir. The operating system drops the lock when
 * the process ends in any way, also by SIGKILL or a crash, so a dead run never blocks the next.
 * The file names the holder (host, process id, start time) for the message a refused run
 * prints. The lock file is never deleted: deleting it would let two processes lock two
 * different files of the same name.
 *
 * <p>Needs a file system with working locks; on one that ignores locks (some NFSv3 setups
 * without a lock daemon) two runs are not kept apart.
 */
public final class WorkDirLock implements AutoCloseable {
  /** The lock file's name inside the work dir (hidden, so it is not a foreign file). */
  public static final String FILE = ".sunder.lock";

  private final Path file;
  private final FileChannel channel;
  private final FileLock lock;

  private WorkDirLock(Path file, FileChannel channel, FileLock lock) {
    this.file = file;
    this.channel = channel;
    this.lock = lock;
  }

  /**
   * Refuses when another process holds the lock of {@code workDir}; writes nothing (a work dir
   * or lock file that does not exist is not held).
   *
   * @throws SunderException CONFLICT naming the holder
   */
  public static void requireFree(Path workDir) {
    Path file = workDir.toAbsolutePath().normalize().resolve(FILE);
    if (!Files.isRegularFile(file)) {
      return;
    }
    try (FileChannel channel = FileChannel.open(file, StandardOpenOption.WRITE)) {
      FileLock lock = tryLock(channel);
      if (lock == null) {
        throw held(file);
      }
      lock.release();
    } catch (IOException e) {
      throw cannotLock(file, e);
    }
  }

  /**
   * Takes the lock of {@code workDir}, creating the directory and the lock file if needed.
   *
   * @throws SunderException CONFLICT naming the holder when another process holds it, STORAGE
   *     when the lock file cannot be written or the file system refuses locks
   */
  public static WorkDirLock acquire(Path workDir) {
    Path root = workDir.toAbsolutePath().normalize();
    Path file = root.resolve(FILE);
    FileChannel channel = null;
    try {
      Files.createDirectories(root);
      channel = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.READ,
          StandardOpenOption.WRITE);
      FileLock lock = tryLock(channel);
      if (lock == null) {
        channel.close();
        throw held(file);
      }
      return new WorkDirLock(file, channel, lock);
    } catch (IOException e) {
      closeQuietly(channel);
      throw cannotLock(file, e);
    }
  }

  /** Writes who holds the lock into the lock file. */
  public void writeHolder() {
    String text = "host " + hostName() + "\npid " + ProcessHandle.current().pid()
        + "\nstarted " + Instant.now() + "\n";
    try {
      channel.truncate(0);
      channel.write(ByteBuffer.wrap(text.getBytes(StandardCharsets.UTF_8)), 0);
      channel.force(false);
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot write " + file + ": " + e, e);
    }
  }

  /** Releases the lock (the lock file stays). */
  @Override
  public void close() {
    try {
      if (lock.isValid()) {
        lock.release();
      }
    } catch (IOException ignored) {
      // closing the channel below releases it too
    }
    closeQuietly(channel);
  }

  /** Whether this lock is still held (false once closed). */
  public boolean isHeld() {
    return lock.isValid();
  }

  private static FileLock tryLock(FileChannel channel) throws IOException {
    try {
      return channel.tryLock();
    } catch (OverlappingFileLockException e) {
      return null; // held by this process, through another channel
    }
  }

  private static SunderException held(Path file) {
    return new SunderException(ErrorKind.CONFLICT, "work dir " + file.getParent()
        + " is in use by " + holder(file) + "; wait for that run to end, or use another work"
        + " dir (key workDir, or --work-dir)");
  }

  private static SunderException cannotLock(Path file, IOException e) {
    return new SunderException(ErrorKind.STORAGE, "work dir: cannot lock " + file + ": " + e
        + " (the work dir needs a file system with working file locks)", e);
  }

  /** The holder named in {@code file}, or a generic description. */
  static String holder(Path file) {
    try {
      String text = Files.readString(file, StandardCharsets.UTF_8).trim();
      if (!text.isEmpty()) {
        return "another run (" + String.join(", ", text.split("\n")) + "; lock file " + file
            + ")";
      }
    } catch (IOException e) {
      // fall through
    }
    return "another run (lock file " + file + ", holder not yet recorded)";
  }

  private static String hostName() {
    try {
      return InetAddress.getLocalHost().getHostName();
    } catch (IOException e) {
      return ManagementFactory.getRuntimeMXBean().getName();
    }
  }

  private static void closeQuietly(FileChannel channel) {
    if (channel != null) {
      try {
        channel.close();
      } catch (IOException ignored) {
        // nothing to release
      }
    }
  }
}
