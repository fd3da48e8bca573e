package org.sunder.spark.run;

import java.nio.file.Path;
import org.sunder.blockwise.grid.BlockGrid;

/**
 * A run's settings with every default resolved, in memory order (dimension 0 fastest): what the
 * driver broadcasts to every task once. Paths are absolute strings.
 *
 * @param axes axis order of the configuration file, for messages and reports
 * @param inputContainer container of the affinities
 * @param affinities affinity dataset (channel axis last in memory)
 * @param offsets one offset per channel, memory order
 * @param mask mask dataset in the input container, or {@code null}
 * @param outputContainer container of the segmentation
 * @param outputDataset segmentation dataset (uint64)
 * @param workDir manifest and task records
 * @param volumeShape spatial shape of the affinities
 * @param chunkShape spatial chunk shape of the affinities and the segmentation
 * @param blockShape block core shape (whole chunks)
 * @param halo context per axis
 * @param partitionJson the partition section as JSON
 * @param maxDriverEdges largest reduced graph gathered on the driver
 * @param truthContainer container of the ground truth
 * @param groundTruth ground-truth dataset, or {@code null} (no evaluation)
 * @param ignoreBackground ignore ground-truth label 0 in scores
 * @param hooks test-only task behaviour
 */
public record RunSettings(String axes, String inputContainer, String affinities, int[][] offsets,
    String mask, String outputContainer, String outputDataset, String workDir, long[] volumeShape,
    int[] chunkShape, int[] blockShape, int[] halo, String partitionJson, long maxDriverEdges,
    String truthContainer, String groundTruth, boolean ignoreBackground, TaskHooks hooks) {

  /** The block grid of this run. */
  public BlockGrid grid() {
    return BlockGrid.of(volumeShape, chunkShape, blockShape, halo);
  }

  public Path workDirPath() {
    return Path.of(workDir);
  }

  /** Whether a ground truth is configured. */
  public boolean evaluates() {
    return groundTruth != null;
  }

  /** Number of spatial voxels. */
  public long voxelCount() {
    long n = 1;
    for (long s : volumeShape) {
      n *= s;
    }
    return n;
  }
}
