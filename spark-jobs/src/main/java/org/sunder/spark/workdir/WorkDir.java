package org.sunder.spark.workdir;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Optional;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.files.AtomicWrites;

/**
 * A run's work dir: {@code manifest.json} and, per stage, a {@link StageLedger} under
 * {@code stages/}. Plain files on a file system every executor sees.
 */
public final class WorkDir {
  private static final String MANIFEST = "manifest.json";
  /** The run report's file name in the work dir. */
  public static final String REPORT = "report.html";
  private static final ObjectMapper JSON = new ObjectMapper()
      .enable(SerializationFeature.INDENT_OUTPUT);

  private final Path root;

  public WorkDir(Path root) {
    this.root = root.toAbsolutePath().normalize();
  }

  public Path root() {
    return root;
  }

  /** The manifest, if this work dir has one. */
  public Optional<Manifest> manifest() {
    Path file = root.resolve(MANIFEST);
    if (!Files.isRegularFile(file)) {
      return Optional.empty();
    }
    try {
      return Optional.of(JSON.readValue(file.toFile(), Manifest.class));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.CONFLICT, "work dir " + root + " has a manifest that"
          + " Sunder cannot read (" + e.getMessage() + "); use another work dir or --fresh", e);
    }
  }

  /** Where the run report goes. */
  public Path reportFile() {
    return root.resolve(REPORT);
  }

  /**
   * Whether the directory exists and holds anything other than a Sunder manifest, stages and
   * run report.
   */
  public boolean holdsForeignFiles() {
    if (!Files.isDirectory(root)) {
      return false;
    }
    try (DirectoryStream<Path> entries = Files.newDirectoryStream(root)) {
      for (Path entry : entries) {
        String name = entry.getFileName().toString();
        if (!name.equals(MANIFEST) && !name.equals("stages") && !name.equals(REPORT)
            && !name.startsWith(".")) {
          return true;
        }
      }
      return false;
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot list work dir " + root + ": " + e, e);
    }
  }

  /** Writes the manifest atomically. */
  public void writeManifest(Manifest manifest) {
    try {
      byte[] bytes = JSON.writeValueAsBytes(manifest);
      AtomicWrites.write(root.resolve(MANIFEST), ByteBuffer.wrap(bytes));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.INTERNAL, "cannot encode the manifest: " + e, e);
    }
  }

  /** The finished-task records of one stage. */
  public StageLedger ledger(Stage stage) {
    return new StageLedger(root.resolve("stages"), stage);
  }

  /** Removes the records of {@code first} and every later stage. */
  public void clearFrom(Stage first) {
    for (Stage stage : Stage.values()) {
      if (stage.ordinal() >= first.ordinal()) {
        ledger(stage).clear();
      }
    }
  }

  /** Removes the manifest and every record. */
  public void clearAll() {
    clearFrom(Stage.values()[0]);
    try {
      Files.deleteIfExists(root.resolve(MANIFEST));
      Files.deleteIfExists(root.resolve(REPORT));
      Files.deleteIfExists(root.resolve("stages"));
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot clear work dir " + root + ": " + e, e);
    }
  }
}
