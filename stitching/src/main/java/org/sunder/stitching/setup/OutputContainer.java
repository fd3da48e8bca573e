package org.sunder.stitching.setup;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.Optional;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.StorageFormat;

/**
 * The output container of a run as the driver sees it before and while it prepares the run:
 * whether it exists, which run owns a dataset in it (an attribute the run writes), the shape of
 * an existing dataset, and creating it in the input's format. Metadata only; O(1) files.
 */
public final class OutputContainer {
  private OutputContainer() {}

  /**
   * Whether a container exists at {@code root}.
   *
   * @throws SunderException CONFLICT if something that is no N5 or Zarr container is there
   */
  public static boolean exists(Path root) {
    if (!Files.exists(root)) {
      return false;
    }
    try {
      Container.open(root);
      return true;
    } catch (SunderException e) {
      throw new SunderException(ErrorKind.CONFLICT, "output.container: " + root
          + " exists and is not an N5 or Zarr container; choose another path", e);
    }
  }

  /**
   * The value of attribute {@code marker} of {@code dataset} in the existing container at
   * {@code root}, as a map; empty when there is no such dataset.
   *
   * @throws SunderException CONFLICT if something that is no dataset is in the way, or the
   *     dataset lacks the attribute (it was not written by Sunder)
   */
  public static Optional<Map<?, ?>> marker(Path root, String dataset, String marker) {
    Container container = Container.open(root);
    if (!container.datasetExists(dataset)) {
      if (container.groupExists(dataset) || Files.exists(root.resolve(dataset))) {
        throw new SunderException(ErrorKind.CONFLICT, "output.dataset: '" + dataset + "' in "
            + root + " exists and is not a dataset written by Sunder; choose another name");
      }
      return Optional.empty();
    }
    if (container.readAttributes(dataset).get(marker) instanceof Map<?, ?> map) {
      return Optional.of(map);
    }
    throw new SunderException(ErrorKind.CONFLICT, "output.dataset: '" + dataset + "' in " + root
        + " exists and was not written by Sunder; choose another output dataset or remove it");
  }

  /**
   * Shape and chunk shape of an existing dataset, memory order.
   *
   * @param shape the dataset's shape
   * @param chunkShape its chunk shape
   */
  public record Layout(long[] shape, int[] chunkShape) {}

  /** The layout of the existing {@code dataset} in the container at {@code root}. */
  public static Layout layout(Path root, String dataset) {
    Dataset d = Container.open(root).openDataset(dataset);
    return new Layout(d.shape(), d.chunkShape());
  }

  /** Whether the container at {@code root} holds {@code dataset}. */
  public static boolean holds(Path root, String dataset) {
    return Container.open(root).datasetExists(dataset);
  }

  /**
   * Creates an empty container at {@code root} (and its parent folders): N5 when its name ends
   * in {@code .n5}, else in the format of the input container.
   *
   * @throws SunderException STORAGE if the folders cannot be created
   */
  public static void create(Path root, Path inputContainer) {
    try {
      Files.createDirectories(root.toAbsolutePath().getParent());
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "output.container: cannot create "
          + root + ": " + e, e);
    }
    StorageFormat format = root.getFileName().toString().endsWith(".n5") ? StorageFormat.N5
        : formatOf(inputContainer);
    Container.create(root, format);
  }

  /** Adds {@code attributes} to {@code dataset}'s attributes. */
  public static void mergeAttributes(Path root, String dataset, Map<String, Object> attributes) {
    Container.open(root).mergeAttributes(dataset, attributes);
  }

  /**
   * Removes the temporary chunk files that an interrupted run left in {@code dataset}; returns
   * how many.
   */
  public static int removeStaleTemporaries(Path root, String dataset) {
    return Container.open(root).openDataset(dataset).removeStaleTemporaries();
  }

  private static StorageFormat formatOf(Path input) {
    String name = input.getFileName().toString();
    if (name.endsWith(".zarr")) {
      return StorageFormat.ZARR;
    }
    if (name.endsWith(".n5")) {
      return StorageFormat.N5;
    }
    return Container.open(input).format();
  }
}
