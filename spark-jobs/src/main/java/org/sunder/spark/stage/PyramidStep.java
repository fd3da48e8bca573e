package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.Arrays;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.Stage;
import org.sunder.stitching.setup.VoxelSize;
import org.sunder.stitching.task.LabelPyramid;
import org.sunder.stitching.task.MultiscaleMetadata;
import org.sunder.stitching.task.PyramidTask;

/**
 * The pyramid stage: the segmentation's coarser levels ({@link LabelPyramid}, mode
 * downsampling) as datasets {@code <dataset>_s1}, {@code <dataset>_s2}, ... beside it, one task
 * per chunk of a level, level after level (a level reads the one before); then the OME-NGFF 0.4
 * {@code multiscales} and {@code image-label} attributes ({@link MultiscaleMetadata}) on the
 * group that holds them. Task {@code i} of the stage is chunk {@code i - offset(L)} of level
 * {@code L}; finished tasks are skipped on a rerun like every stage's.
 */
public final class PyramidStep {
  private PyramidStep() {}

  /** The pyramid of the run's segmentation, with the voxel size of its input. */
  public static LabelPyramid plan(RunSettings s) {
    return LabelPyramid.plan(s.volumeShape(), s.chunkShape(), voxelSize(s));
  }

  /** The path of level {@code level}'s dataset (level 0: the segmentation). */
  public static String levelPath(String dataset, int level) {
    return PyramidTask.levelPath(dataset, level);
  }

  /** The first task index of each level, and the task count after the last ({@code levels + 1} entries). */
  public static int[] taskOffsets(LabelPyramid pyramid) {
    int[] offsets = new int[pyramid.levelCount() + 1];
    for (int level = 1; level < pyramid.levelCount(); level++) {
      offsets[level + 1] = Math.addExact(offsets[level], Math.toIntExact(pyramid.chunkCount(level)));
    }
    offsets[1] = 0;
    return offsets;
  }

  /** Runs the stage: creates the level datasets, runs their tasks, writes the metadata. */
  public static StageReport run(StageRunner runner, RunSettings s, PrintStream out) {
    long start = System.nanoTime();
    LabelPyramid pyramid = plan(s);
    PyramidTask.createLevels(s.setup(), pyramid);
    int[] offsets = taskOffsets(pyramid);
    int total = 0;
    int skipped = 0;
    int ran = 0;
    for (int level = 1; level < pyramid.levelCount(); level++) {
      StageReport r = runner.run(Stage.PYRAMID, offsets[level], offsets[level + 1],
          new LevelChunk(pyramid, offsets, level));
      total += r.total();
      skipped += r.skipped();
      ran += r.ran();
    }
    PyramidTask.writeMetadata(s.setup(), pyramid, unit(s));
    return new StageReport(Stage.PYRAMID, total, skipped, ran, (System.nanoTime() - start) / 1e9);
  }

  /** The input's voxel size in memory order (see {@link VoxelSize}), or ones when unknown. */
  public static double[] voxelSize(RunSettings s) {
    int n = s.volumeShape().length;
    double[] size = VoxelSize.fromAttributes(PyramidTask.inputAttributes(s.setup()), n, s.axes());
    if (size == null) {
      size = new double[n];
      Arrays.fill(size, 1);
    }
    return size;
  }

  private static String unit(RunSettings s) {
    return PyramidTask.inputAttributes(s.setup()).get("unit") instanceof String u ? u : null;
  }

  /** Task body: one chunk of one level, from the level before. */
  static final class LevelChunk implements TaskBody {
    private static final long serialVersionUID = 1L;
    private final LabelPyramid pyramid;
    private final int[] offsets;
    private final int level;

    LevelChunk(LabelPyramid pyramid, int[] offsets, int level) {
      this.pyramid = pyramid;
      this.offsets = offsets.clone();
      this.level = level;
    }

    @Override
    public Object run(RunSettings settings, int index) {
      return PyramidTask.writeChunk(settings.setup(), pyramid, level, index - offsets[level]);
    }
  }
}
