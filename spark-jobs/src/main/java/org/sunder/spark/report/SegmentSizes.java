package org.sunder.spark.report;

import java.util.List;
import org.sunder.stitching.BlockSummary;
import org.sunder.stitching.FinalIdMap;

/**
 * The size of every final segment, from the partition stage's block summaries (voxels per local
 * id in each core) and the solve's final id map, without reading the segmentation.
 * O(provisional ids).
 */
public final class SegmentSizes {
  private SegmentSizes() {}

  /** {@code sizes[id]} voxels of final id {@code id}; index 0 unused. */
  public static long[] of(List<BlockSummary> summaries, FinalIdMap map) {
    long[] sizes = new long[Math.toIntExact(map.finalIdCount() + 1)];
    for (BlockSummary s : summaries) {
      long[] ids = map.finalIds()[s.block()];
      long[] local = s.segmentSizes();
      for (int k = 1; k <= local.length; k++) {
        sizes[(int) ids[k]] += local[k - 1];
      }
    }
    sizes[0] = 0;
    return sizes;
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
