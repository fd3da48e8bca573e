package org.sunder.spark.run;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import net.imglib2.img.array.ArrayImgs;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;

/** Small containers for tests of configuration and preparation (random values, seeded). */
public final class TestContainers {
  /** Nearest-neighbour offsets plus two long-range ones, zyx. */
  public static final int[][] OFFSETS_ZYX = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {0, -3, 0},
      {0, 0, -4}};

  private TestContainers() {}

  /**
   * A container with float32 {@code affinities} of spatial shape {@code zyx} (chunks
   * {@code chunkZyx}, all channels in one chunk) and the attributes {@code offsets} and
   * {@code axes}.
   */
  public static Container withAffinities(Path root, StorageFormat format, long[] zyx,
      int[] chunkZyx, int[][] offsetsZyx) {
    Container container = Container.create(root, format);
    int channels = offsetsZyx.length;
    long[] shape = {zyx[2], zyx[1], zyx[0], channels};
    int[] chunks = {chunkZyx[2], chunkZyx[1], chunkZyx[0], channels};
    Dataset dataset = container.createDataset("affinities",
        DatasetSpec.of(shape, chunks, DataType.FLOAT32));
    float[] values = new float[(int) (shape[0] * shape[1] * shape[2] * shape[3])];
    Random random = new Random(13);
    for (int i = 0; i < values.length; i++) {
      values[i] = random.nextFloat();
    }
    dataset.write(ArrayImgs.floats(values, shape), new long[4]);
    Map<String, Object> attributes = new LinkedHashMap<>();
    attributes.put("offsets", List.of(offsetsZyx));
    attributes.put("axes", "zyx");
    container.mergeAttributes("affinities", attributes);
    return container;
  }

  /** A uint64 dataset of spatial shape {@code zyx}, all zeros. */
  public static void labels(Container container, String name, long[] zyx, int[] chunkZyx) {
    container.createDataset(name, DatasetSpec.of(new long[] {zyx[2], zyx[1], zyx[0]},
        new int[] {chunkZyx[2], chunkZyx[1], chunkZyx[0]}, DataType.UINT64));
  }
}
