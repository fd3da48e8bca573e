package org.sunder.spark.run;

import java.io.Serializable;
import java.nio.file.Path;
import java.util.Optional;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * A run, every default resolved and validated once on the driver ({@link RunResolver}): the
 * {@link StitchingSetup} every task uses, plus what only the driver and the evaluation need.
 * The driver broadcasts it once; tasks read the setup from it and never parse or validate
 * anything again. Paths are absolute strings; shapes are in memory order (dimension 0 fastest).
 *
 * @param axes axis order of the configuration file, for messages and reports
 * @param setup input, output, grid, offsets and partition method of every task
 * @param workDir manifest and task records
 * @param maxDriverEdges largest reduced graph gathered on the driver
 * @param truthContainer container of the ground truth
 * @param groundTruth ground-truth dataset, or {@code null} (no evaluation)
 * @param ignoreBackground ignore ground-truth label 0 in scores
 * @param blockOrigin where the block shape came from, its halo overhead and the budget it was
 *     chosen for, or {@code null} when unknown (settings made without a {@link RunResolver})
 */
public record RunSettings(String axes, StitchingSetup setup, String workDir, long maxDriverEdges,
    String truthContainer, String groundTruth, boolean ignoreBackground,
    BlockShapeOrigin blockOrigin) implements Serializable {

  /** Settings without a recorded block shape origin. */
  public RunSettings(String axes, StitchingSetup setup, String workDir, long maxDriverEdges,
      String truthContainer, String groundTruth, boolean ignoreBackground) {
    this(axes, setup, workDir, maxDriverEdges, truthContainer, groundTruth, ignoreBackground,
        null);
  }

  /** These settings with {@code origin} as the block shape's origin. */
  public RunSettings withBlockOrigin(BlockShapeOrigin origin) {
    return new RunSettings(axes, setup, workDir, maxDriverEdges, truthContainer, groundTruth,
        ignoreBackground, origin);
  }

  /** The block grid of this run. */
  public BlockGrid grid() {
    return setup.grid();
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
    return Shapes.elementCount(setup.grid().volumeShape());
  }

  public String inputContainer() {
    return setup.inputRoot();
  }

  public String affinities() {
    return setup.affinitiesPath();
  }

  /** One offset per channel, memory order. */
  public int[][] offsets() {
    return setup.offsetVectors();
  }

  /** The mask dataset in the input container, if any. */
  public Optional<String> mask() {
    return setup.mask();
  }

  public String outputContainer() {
    return setup.outputRoot();
  }

  public String outputDataset() {
    return setup.labelsPath();
  }

  public long[] volumeShape() {
    return setup.grid().volumeShape();
  }

  public int[] chunkShape() {
    return setup.grid().chunkShape();
  }

  public int[] blockShape() {
    return setup.grid().blockShape();
  }

  public int[] halo() {
    return setup.grid().halo();
  }
}
