package org.sunder.stitching.setup;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;

/**
 * What a run checks about one of its input datasets before it writes anything: shape, chunk
 * shape, data type and attributes, read once from the container's metadata, and which chunk
 * files are missing. Errors name the configuration key the dataset came from.
 *
 * @param container the container, absolute
 * @param name the dataset's path in the container
 * @param shape shape, memory order (dimension 0 fastest)
 * @param chunkShape chunk shape, memory order
 * @param dataType data type, lower case ({@code float32}, {@code uint8}, ...)
 * @param attributes the dataset's attributes
 */
public record InputDataset(Path container, String name, long[] shape, int[] chunkShape,
    String dataType, Map<String, Object> attributes) {

  /**
   * Reads dataset {@code name} of the container at {@code container}.
   *
   * @param containerKey configuration key of the container, for messages
   * @param key configuration key of the dataset, for messages
   * @throws SunderException INVALID_INPUT if the container or dataset is missing or unreadable
   */
  public static InputDataset read(Path container, String containerKey, String name, String key) {
    Container c = open(container, containerKey);
    if (!c.datasetExists(name)) {
      String why = c.datasetProblem(name);
      if (why != null) {
        throw new SunderException(ErrorKind.INVALID_INPUT, key + ": '" + name + "' in "
            + c.root() + " is not a readable dataset: " + why);
      }
      List<String> members = c.list("");
      throw new SunderException(ErrorKind.INVALID_INPUT, key + ": no dataset '" + name + "' in "
          + c.root() + (members.isEmpty() ? " (it is empty)" : "; it holds " + members));
    }
    Dataset dataset = c.openDataset(name);
    return new InputDataset(container, name, dataset.shape(), dataset.chunkShape(),
        dataset.dataType().name().toLowerCase(Locale.ROOT), c.readAttributes(name));
  }

  private static Container open(Path path, String key) {
    if (!Files.isDirectory(path)) {
      throw new SunderException(ErrorKind.INVALID_INPUT, key + ": " + path
          + (Files.exists(path) ? " is not a directory" : " does not exist")
          + "; expected an N5 or Zarr container");
    }
    try {
      return Container.open(path);
    } catch (SunderException e) {
      throw new SunderException(e.kind(), key + ": " + e.getMessage(), e);
    }
  }

  /** Whether the values are float32 or float64. */
  public boolean isFloat() {
    return DataType.valueOf(dataType.toUpperCase(Locale.ROOT)).isFloat();
  }

  /** Whether the values are float32 or uint8, the types affinities come in. */
  public boolean holdsAffinityValues() {
    return dataType.equals("float32") || dataType.equals("uint8");
  }

  /** Whether the values are uint8, the type of a mask. */
  public boolean isUint8() {
    return dataType.equals("uint8");
  }

  /**
   * The chunk files that do not exist: their count, the number of chunks, and the grid
   * positions (memory order) of the first {@code shown}. One walk of the dataset's directory
   * tree and a hash set: O(chunks) time and memory.
   *
   * @param missing chunks without a file
   * @param total chunks of the dataset
   * @param first grid positions of the first missing chunks, in index order
   */
  public record MissingChunks(long missing, long total, List<long[]> first) {}

  /** See {@link MissingChunks}. */
  public MissingChunks missingChunks(int shown) {
    Dataset dataset = Container.open(container).openDataset(name);
    long[] grid = dataset.gridShape();
    Set<Path> present = files(container.resolve(name).toAbsolutePath().normalize());
    long total = 1;
    for (long g : grid) {
      total *= g;
    }
    List<long[]> first = new ArrayList<>();
    long missing = 0;
    long[] position = new long[grid.length];
    for (long i = 0; i < total; i++) {
      if (!present.contains(dataset.chunkFile(position).toAbsolutePath().normalize())) {
        missing++;
        if (first.size() < shown) {
          first.add(position.clone());
        }
      }
      for (int d = 0; d < grid.length && ++position[d] == grid[d]; d++) {
        position[d] = 0;
      }
    }
    return new MissingChunks(missing, total, first);
  }

  /** Every regular file under {@code dir} (the chunk files and the metadata), normalized. */
  private static Set<Path> files(Path dir) {
    if (!Files.isDirectory(dir)) {
      return Set.of();
    }
    try (Stream<Path> walk = Files.walk(dir)) {
      return walk.filter(Files::isRegularFile).map(p -> p.toAbsolutePath().normalize())
          .collect(Collectors.toCollection(HashSet::new));
    } catch (IOException | UncheckedIOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot list " + dir + ": " + e.getMessage(),
          e);
    }
  }
}
