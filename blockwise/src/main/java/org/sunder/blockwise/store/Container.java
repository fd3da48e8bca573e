package org.sunder.blockwise.store;

import java.io.IOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;

/**
 * A handle on an N5 or Zarr v2 container: a root directory on the local file system holding
 * groups and datasets addressed by {@code "/"}-separated paths relative to the root ({@code ""}
 * is the root itself).
 *
 * <p>Thread-safe. Attribute merges are serialised within one {@code Container}; across
 * processes the last rename wins. Metadata files are written atomically (temporary file, then
 * rename). Creating the same dataset from two processes at once is not detected.
 */
public final class Container {
  private static final ContainerLayout N5 = new N5Layout();
  private static final ContainerLayout ZARR = new ZarrLayout();

  private final Path root;
  private final ContainerLayout layout;
  private final Object attributeLock = new Object();

  private Container(Path root, ContainerLayout layout) {
    this.root = root;
    this.layout = layout;
  }

  /**
   * Opens an existing container and detects its format ({@code .zgroup}/{@code .zarray}: Zarr;
   * {@code attributes.json}: N5).
   *
   * @throws StoreException INVALID_INPUT if {@code root} is missing or holds neither format
   */
  public static Container open(Path root) {
    Objects.requireNonNull(root, "root");
    Path absolute = root.toAbsolutePath().normalize();
    if (!Files.isDirectory(absolute)) {
      throw new StoreException(ErrorKind.INVALID_INPUT, "container " + absolute
          + " does not exist or is not a directory; expected an N5 or Zarr container");
    }
    for (ContainerLayout layout : new ContainerLayout[] {ZARR, N5}) {
      if (layout.isRoot(absolute)) {
        layout.checkRoot(absolute);
        return new Container(absolute, layout);
      }
    }
    throw new StoreException(ErrorKind.INVALID_INPUT, "container " + absolute
        + " holds neither .zgroup/.zarray (Zarr) nor attributes.json (N5)");
  }

  /**
   * Opens {@code root} as a container of {@code format}, creating the directory and its root
   * group metadata if absent.
   *
   * @throws StoreException CONFLICT if {@code root} is a container of the other format
   */
  public static Container create(Path root, StorageFormat format) {
    Objects.requireNonNull(root, "root");
    Objects.requireNonNull(format, "format");
    Path absolute = root.toAbsolutePath().normalize();
    ContainerLayout layout = format == StorageFormat.N5 ? N5 : ZARR;
    ContainerLayout other = format == StorageFormat.N5 ? ZARR : N5;
    if (other.isRoot(absolute)) {
      throw new StoreException(ErrorKind.CONFLICT, "container " + absolute + " is already "
          + other.format() + ", cannot create it as " + format);
    }
    try {
      Files.createDirectories(absolute);
    } catch (IOException e) {
      throw new StoreException(ErrorKind.STORAGE, "cannot create container directory "
          + absolute + ": " + e.getMessage(), e);
    }
    if (layout.isRoot(absolute)) {
      layout.checkRoot(absolute);
    }
    layout.createRoot(absolute);
    return new Container(absolute, layout);
  }

  public StorageFormat format() {
    return layout.format();
  }

  /** The absolute root directory. */
  public Path root() {
    return root;
  }

  public boolean datasetExists(String path) {
    return layout.isDataset(resolve(path));
  }

  /**
   * Why {@code path} is not a dataset although its metadata file holds some dataset keys (an N5
   * {@code attributes.json} with {@code dimensions} but no {@code dataType}, say), or
   * {@code null} when it is a dataset or holds no dataset metadata at all.
   */
  public String datasetProblem(String path) {
    Path dir = resolve(normalize(path));
    if (layout.isDataset(dir) || layout.format() != StorageFormat.N5) {
      return null; // a Zarr dataset is recognised by its .zarray file alone
    }
    Map<String, Object> attributes = JsonFiles.readOrEmpty(dir.resolve(N5Layout.ATTRIBUTES));
    if (java.util.stream.Stream.of("dimensions", "blockSize", "dataType", "compression")
        .noneMatch(attributes::containsKey)) {
      return null;
    }
    try {
      layout.readDatasetMetadata(dir);
      return null;
    } catch (StoreException e) {
      return e.getMessage();
    }
  }

  public boolean groupExists(String path) {
    Path dir = resolve(path);
    return Files.isDirectory(dir) && layout.isGroup(dir);
  }

  /** Creates the group and any missing parent groups; fine if it exists already. */
  public void createGroup(String path) {
    String normalized = normalize(path);
    createParents(normalized, true);
  }

  private void createParents(String path, boolean includingLast) {
    String[] parts = path.isEmpty() ? new String[0] : path.split("/");
    int last = includingLast ? parts.length : parts.length - 1;
    Path dir = root;
    for (int i = 0; i < last; i++) {
      dir = dir.resolve(parts[i]);
      if (layout.isDataset(dir)) {
        throw new StoreException(ErrorKind.INVALID_INPUT, "cannot create '" + path
            + "' in container " + root + ": '" + String.join("/", List.of(parts).subList(0, i + 1))
            + "' is a dataset, expected a group");
      }
      layout.createGroup(dir);
    }
  }

  /**
   * Creates a dataset (and missing parent groups) and returns it. For N5 the byte order, chunk
   * order, separator and fill value of {@code spec} are replaced by N5's.
   *
   * @throws StoreException CONFLICT if a dataset or group exists at {@code path}
   */
  public Dataset createDataset(String path, DatasetSpec spec) {
    Objects.requireNonNull(spec, "spec");
    String normalized = normalize(path);
    Path dir = resolve(normalized);
    if (layout.isDataset(dir) || (Files.isDirectory(dir) && layout.isGroup(dir))) {
      throw new StoreException(ErrorKind.CONFLICT, "dataset '" + normalized + "' in container "
          + root + " already exists" + (layout.isDataset(dir) ? "" : " as a group"));
    }
    DatasetSpec stored = layout.normalize(spec);
    Codecs.create(stored.codec(), layout.format(), stored.dataType());
    createParents(normalized, false);
    layout.writeDatasetMetadata(dir, stored);
    return new Dataset(dir, normalized, stored, layout, root);
  }

  /**
   * Opens an existing dataset.
   *
   * @throws StoreException INVALID_INPUT if there is none at {@code path} or its metadata is
   *     malformed; the message names the metadata file and key
   */
  public Dataset openDataset(String path) {
    String normalized = normalize(path);
    Path dir = resolve(normalized);
    if (!layout.isDataset(dir)) {
      throw new StoreException(ErrorKind.INVALID_INPUT, "dataset '" + normalized
          + "' does not exist in " + layout.format() + " container " + root);
    }
    DatasetSpec spec = layout.readDatasetMetadata(dir);
    return new Dataset(dir, normalized, spec, layout, root);
  }

  /** The user attributes of a group or dataset (N5's own keys left out); a new mutable map. */
  public Map<String, Object> readAttributes(String path) {
    String normalized = normalize(path);
    Path dir = existing(normalized);
    return layout.readAttributes(dir, normalized.isEmpty());
  }

  /**
   * Sets the given top-level attributes of a group or dataset, keeping all others; rewrites the
   * attribute file atomically. Values are anything Jackson writes as JSON (maps, lists, numbers,
   * strings, booleans, arrays).
   */
  public void mergeAttributes(String path, Map<String, ?> attributes) {
    Objects.requireNonNull(attributes, "attributes");
    String normalized = normalize(path);
    Path dir = existing(normalized);
    synchronized (attributeLock) {
      layout.mergeAttributes(dir, attributes, normalized.isEmpty());
    }
  }

  /** Names of the groups and datasets directly under the group at {@code groupPath}, sorted. */
  public List<String> list(String groupPath) {
    String normalized = normalize(groupPath);
    Path dir = existing(normalized);
    List<String> children = new ArrayList<>();
    try (DirectoryStream<Path> entries = Files.newDirectoryStream(dir, Files::isDirectory)) {
      for (Path entry : entries) {
        String name = entry.getFileName().toString();
        if (!name.startsWith(".") && (layout.isDataset(entry) || layout.isGroup(entry))
            && !(layout.format() == StorageFormat.N5 && layout.isDataset(dir))) {
          children.add(name);
        }
      }
    } catch (IOException e) {
      throw new StoreException(ErrorKind.STORAGE, "cannot list " + dir + ": " + e.getMessage(), e);
    }
    children.sort(null);
    return children;
  }

  private Path existing(String normalized) {
    Path dir = resolve(normalized);
    if (!Files.isDirectory(dir) || !(layout.isDataset(dir) || layout.isGroup(dir))) {
      throw new StoreException(ErrorKind.INVALID_INPUT, "'" + normalized
          + "' is neither a group nor a dataset in " + layout.format() + " container " + root);
    }
    return dir;
  }

  private Path resolve(String path) {
    String normalized = normalize(path);
    return normalized.isEmpty() ? root : root.resolve(normalized);
  }

  /**
   * Strips leading and trailing slashes and checks the segments: no empty ones, no {@code .},
   * {@code ..} or names starting with a dot, no backslashes.
   */
  static String normalize(String path) {
    Objects.requireNonNull(path, "path");
    String stripped = path.replaceAll("^/+", "").replaceAll("/+$", "");
    if (stripped.isEmpty()) {
      return "";
    }
    for (String part : stripped.split("/", -1)) {
      if (part.isEmpty() || part.startsWith(".") || part.contains("\\")) {
        throw new StoreException(ErrorKind.INVALID_INPUT, "path '" + path + "' has segment '"
            + part + "'; expected non-empty names not starting with '.' and without '\\'");
      }
    }
    return stripped;
  }

  @Override
  public String toString() {
    return layout.format() + " container " + root;
  }
}
