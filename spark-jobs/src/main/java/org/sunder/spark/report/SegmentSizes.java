package org.sunder.spark.report;

import org.sunder.blockwise.grid.IdLayout;
import org.sunder.spark.stage.StageFiles;
import org.sunder.spark.workdir.WorkDir;

/**
 * The size of every final segment, from the partition stage's block summaries (voxels per local
 * id in each core) and each block's final id map, without reading the segmentation.
 * O(provisional ids).
 */
public final class SegmentSizes {
  private SegmentSizes() {}

  /**
   * {@code sizes[id]} voxels of final id {@code id}; index 0 unused. Reads one block's summary
   * and map at a time; holds one number per final id.
   */
  public static long[] of(WorkDir work, int blockCount, IdLayout layout, long finalIdCount) {
    long[] sizes = new long[Math.toIntExact(finalIdCount + 1)];
    for (int b = 0; b < blockCount; b++) {
      addBlock(sizes, StageFiles.blockMap(work, layout, b).finalIds(),
          StageFiles.summary(work, b).segmentSizes());
    }
    sizes[0] = 0;
    return sizes;
  }

  /**
   * Adds one block's segments to {@code sizes}.
   *
   * @param finalIds the block's map, per local id (index 0 unused)
   * @param segmentSizes voxels per local id ({@code segmentSizes[k - 1]})
   */
  public static void addBlock(long[] sizes, long[] finalIds, long[] segmentSizes) {
    for (int k = 1; k <= segmentSizes.length; k++) {
      sizes[(int) finalIds[k]] += segmentSizes[k - 1];
    }
  }

  /**
   * Counts of segments per power-of-two size bin: {@code counts[b]} segments have
   * {@code 2^b <= size < 2^(b+1)} voxels. Empty segments are not counted.
   */
  public static long[] log2Histogram(long[] sizes) {
    long[] counts = new long[64];
    int top = 0;
    for (int id = 1; id < sizes.length; id++) {
      if (sizes[id] > 0) {
        int bin = 63 - Long.numberOfLeadingZeros(sizes[id]);
        counts[bin]++;
        top = Math.max(top, bin + 1);
      }
    }
    return java.util.Arrays.copyOf(counts, top);
  }
}
