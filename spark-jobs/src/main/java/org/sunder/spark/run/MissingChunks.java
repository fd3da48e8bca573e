package org.sunder.spark.run;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Dataset;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.config.RunConfig;

/**
 * Checks that every chunk file of the affinity dataset exists, so that a chunk lost in a copy
 * is not read as zeros (the store's rule for missing chunks) and segmented as background. One
 * walk of the dataset's directory tree and a hash set: O(chunks) time and memory on the driver.
 */
final class MissingChunks {
  /** How many missing chunk positions a message lists. */
  static final int SHOWN = 5;

  private MissingChunks() {}

  /** Throws INVALID_INPUT naming the first missing chunks, in {@code axes} order. */
  static void refuse(Dataset affinities, String name, Path container, AxisOrder axes) {
    long[] grid = affinities.gridShape();
    Set<Path> present = files(container.resolve(name).toAbsolutePath().normalize());
    long total = 1;
    for (long g : grid) {
      total *= g;
    }
    List<String> shown = new ArrayList<>();
    long missing = 0;
    long[] position = new long[grid.length];
    for (long i = 0; i < total; i++) {
      if (!present.contains(affinities.chunkFile(position).toAbsolutePath().normalize())) {
        missing++;
        if (shown.size() < SHOWN) {
          shown.add(describe(position, axes));
        }
      }
      for (int d = 0; d < grid.length && ++position[d] == grid[d]; d++) {
        position[d] = 0;
      }
    }
    if (missing > 0) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "input.affinities: dataset '" + name
          + "' in " + container + " lacks " + missing + " of " + total + " chunk files, e.g. at"
          + " chunk " + String.join(", ", shown) + (missing > shown.size() ? ", ..." : "")
          + " (chunk grid position, " + axes + " then channel); restore them, or set"
          + " input.missingChunks to \"" + RunConfig.MISSING_FILL + "\" if missing chunks"
          + " mean the fill value");
    }
  }

  /** A chunk position as the user writes it: spatial axes in {@code axes} order, channel last. */
  static String describe(long[] memory, AxisOrder axes) {
    long[] spatial = axes.toFile(Arrays.copyOf(memory, axes.dimensions()));
    return Arrays.stream(spatial).mapToObj(Long::toString)
        .collect(Collectors.joining(", ", "[", "; channel chunk " + memory[axes.dimensions()]
            + "]"));
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
