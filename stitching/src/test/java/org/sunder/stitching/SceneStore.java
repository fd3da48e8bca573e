package org.sunder.stitching;

import java.nio.file.Path;
import net.imglib2.img.array.ArrayImgs;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.stitching.setup.StitchingSetup;

/** Writes a {@link TissueScene} into a container and builds the setup of a run over it. */
public final class SceneStore {
  private SceneStore() {}

  static final String AFFINITIES = "affinities";
  static final String LABELS = "segmentation";

  public static void write(TissueScene scene, Path root, StorageFormat format, int[] chunk) {
    Container container = Container.create(root, format);
    int c = scene.offsets.length;
    long[] shape = {scene.shape[0], scene.shape[1], scene.shape[2], c};
    int[] chunks = {chunk[0], chunk[1], chunk[2], c};
    container.createDataset(AFFINITIES, DatasetSpec.of(shape, chunks, DataType.FLOAT32))
        .write(ArrayImgs.floats(scene.affinities.clone(), shape), new long[4]);
  }

  public static StitchingSetup setup(TissueScene scene, Path root, int[] chunk, int[] block, int[] halo,
      PartitionConfig config) {
    long[] volume = {scene.shape[0], scene.shape[1], scene.shape[2]};
    BlockGrid grid = BlockGrid.of(volume, chunk, block, halo);
    return StitchingSetup.of(root, AFFINITIES, "", root, LABELS, grid,
        Offsets.of(scene.offsets), config);
  }

  /** The whole-volume partition, as one process holding everything would compute it. */
  static Segmentation wholeVolume(TissueScene scene, PartitionConfig config) {
    return config.create().partition(scene.wholeBlock());
  }

  static long[] readLabels(StitchingSetup setup) {
    long[] min = new long[3];
    long[] max = setup.grid().volumeShape();
    for (int d = 0; d < 3; d++) {
      max[d]--;
    }
    return ((net.imglib2.img.basictypeaccess.array.LongArray) setup.openLabels()
        .read(new net.imglib2.FinalInterval(min, max)).update(null)).getCurrentStorageArray();
  }

  public static int[][] offsets() {
    return new int[][] {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {-3, 0, 0}, {0, -3, 0},
        {0, 0, -2}, {-2, -2, 0}, {2, -2, -1}};
  }
}
