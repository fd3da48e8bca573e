package org.sunder.spark.run;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Collectors;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.config.RunConfig;
import org.sunder.stitching.setup.InputDataset;

/**
 * Checks that every chunk file of the affinity dataset exists, so that a chunk lost in a copy
 * is not read as zeros (the store's rule for missing chunks) and segmented as background
 * ({@link InputDataset#missingChunks}: O(chunks) time and memory on the driver).
 */
final class MissingChunks {
  /** How many missing chunk positions a message lists. */
  static final int SHOWN = 5;

  private MissingChunks() {}

  /** Throws INVALID_INPUT naming the first missing chunks, in {@code axes} order. */
  static void refuse(InputDataset affinities, AxisOrder axes) {
    InputDataset.MissingChunks chunks = affinities.missingChunks(SHOWN);
    if (chunks.missing() > 0) {
      List<String> shown = new ArrayList<>();
      for (long[] position : chunks.first()) {
        shown.add(describe(position, axes));
      }
      throw new SunderException(ErrorKind.INVALID_INPUT, "input.affinities: dataset '"
          + affinities.name() + "' in " + affinities.container() + " lacks " + chunks.missing()
          + " of " + chunks.total() + " chunk files, e.g. at chunk " + String.join(", ", shown)
          + (chunks.missing() > shown.size() ? ", ..." : "") + " (chunk grid position, " + axes
          + " then channel); restore them, or set input.missingChunks to \""
          + RunConfig.MISSING_FILL + "\" if missing chunks mean the fill value");
    }
  }

  /** A chunk position as the user writes it: spatial axes in {@code axes} order, channel last. */
  static String describe(long[] memory, AxisOrder axes) {
    long[] spatial = axes.toFile(Arrays.copyOf(memory, axes.dimensions()));
    return Arrays.stream(spatial).mapToObj(Long::toString)
        .collect(Collectors.joining(", ", "[", "; channel chunk " + memory[axes.dimensions()]
            + "]"));
  }
}
