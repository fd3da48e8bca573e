package org.sunder.stitching.task;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The pyramid stage's work on the run's containers: the level datasets {@code <labels>_s1},
 * {@code <labels>_s2}, ... beside the segmentation, one chunk of a level from the level before
 * ({@link LabelPyramid#writeChunk}), and the OME-NGFF 0.4 attributes ({@link MultiscaleMetadata})
 * on the group that holds the levels.
 */
public final class PyramidTask {
  private PyramidTask() {}

  /** The path of level {@code level}'s dataset (level 0: the segmentation). */
  public static String levelPath(String dataset, int level) {
    return level == 0 ? dataset : dataset + "_s" + level;
  }

  /** Creates the datasets of levels 1 and up, like level 0; refuses one of another shape. */
  public static void createLevels(StitchingSetup setup, LabelPyramid pyramid) {
    Container output = setup.openOutput();
    DatasetSpec base = output.openDataset(setup.labelsPath()).spec();
    for (int level = 1; level < pyramid.levelCount(); level++) {
      String path = levelPath(setup.labelsPath(), level);
      long[] shape = pyramid.shapes()[level];
      if (output.datasetExists(path)) {
        long[] existing = output.openDataset(path).shape();
        if (!Arrays.equals(existing, shape)) {
          throw new SunderException(ErrorKind.CONFLICT, "pyramid level dataset '" + path
              + "' in " + output.root() + " has shape " + Arrays.toString(existing)
              + " (memory order), not " + Arrays.toString(shape) + " as this run needs; remove"
              + " it or choose another output.dataset");
        }
        continue;
      }
      output.createDataset(path, new DatasetSpec(shape, base.chunkShape(), base.dataType(),
          base.codec(), base.fillValue(), base.endianness(), base.chunkOrder(),
          base.dimensionSeparator()));
    }
  }

  /** Writes chunk {@code index} of level {@code level} from the level before; returns its voxels. */
  public static long writeChunk(StitchingSetup setup, LabelPyramid pyramid, int level,
      long index) {
    Container output = setup.openOutput();
    Dataset source = output.openDataset(levelPath(setup.labelsPath(), level - 1));
    Dataset target = output.openDataset(levelPath(setup.labelsPath(), level));
    return pyramid.writeChunk(source, target, level, pyramid.chunkPosition(level, index));
  }

  /** Merges the {@code multiscales} and {@code image-label} attributes into the levels' group. */
  public static void writeMetadata(StitchingSetup setup, LabelPyramid pyramid, String unit) {
    String dataset = setup.labelsPath();
    int slash = dataset.lastIndexOf('/');
    String group = slash < 0 ? "" : dataset.substring(0, slash);
    String name = dataset.substring(slash + 1);
    List<String> paths = new ArrayList<>();
    for (int level = 0; level < pyramid.levelCount(); level++) {
      paths.add(levelPath(name, level));
    }
    setup.openOutput().mergeAttributes(group,
        MultiscaleMetadata.attributes(pyramid, paths, name, unit));
  }

  /** The affinity dataset's attributes (where {@code voxelSize}, {@code axes} and {@code unit} live). */
  public static Map<String, Object> inputAttributes(StitchingSetup setup) {
    return setup.openInput().readAttributes(setup.affinitiesPath());
  }
}
