package org.sunder.spark.run;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockShapeChoice;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.spark.config.ConfigReader;
import org.sunder.spark.config.RunConfig;

class RunResolverTest {
  private static final long[] VOLUME = {12, 20, 28};
  private static final int[] CHUNKS = {6, 10, 14};

  private static RunSettings resolve(String json) {
    RunConfig config = new ConfigReader().parse(json).withDefaults();
    return RunResolver.resolve(config);
  }

  /** The partition section as the manifest records it, defaults written out. */
  private static String partitionJson(RunSettings s) {
    return RunIdentity.canonicalConfig(s).get("partition").toString();
  }

  private static SunderException fails(String json) {
    return assertThrows(SunderException.class, () -> resolve(json));
  }

  @Test
  void defaultsComeFromTheDataset(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    RunSettings s = resolve("{\"input\": {\"container\": \"" + root + "\"}}");
    assertArrayEquals(new long[] {28, 20, 12}, s.volumeShape());
    assertArrayEquals(new int[] {14, 10, 6}, s.chunkShape());
    assertArrayEquals(new int[] {0, 0, -1}, s.offsets()[0]);
    assertArrayEquals(new int[] {-4, 0, 0}, s.offsets()[4]);
    assertArrayEquals(new int[] {4, 3, 1}, s.halo());
    for (int d = 0; d < 3; d++) {
      assertEquals(0, s.blockShape()[d] % s.chunkShape()[d]);
    }
    assertEquals(root.toAbsolutePath().toString(), s.outputContainer());
    assertEquals("segmentation", s.outputDataset());
    assertEquals(dir.resolve("v.zarr.sunder-work/segmentation").toAbsolutePath().toString(),
        s.workDir());
  }

  @Test
  void theDefaultMethodFitsItsFragmentsToTheVoxelSize(@TempDir Path dir) throws Exception {
    Path root = dir.resolve("v.zarr");
    Container c = TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    c.mergeAttributes("affinities", java.util.Map.of("voxelSize", java.util.List.of(40, 8, 8)));
    com.fasterxml.jackson.databind.JsonNode p = new com.fasterxml.jackson.databind.ObjectMapper()
        .readTree(partitionJson(resolve("{\"input\": {\"container\": \"" + root + "\"}}")));
    assertEquals("fragments-multicut", p.get("method").asText());
    assertEquals("[40.0,8.0,8.0]", p.get("fragments").get("voxelSize").toString());
    assertTrue(p.get("fragments").get("perSlice").asBoolean(), "sections 5x coarser");
    // a ball of radius 50 nm: 4/3 pi 50^3 nm^3 over 40 * 8 * 8 nm^3 per voxel = 204.5 voxels
    assertEquals(205, p.get("minSegmentSize").asInt());

    c.mergeAttributes("affinities", java.util.Map.of("voxelSize", java.util.List.of(8, 8, 8)));
    p = new com.fasterxml.jackson.databind.ObjectMapper().readTree(partitionJson(
        resolve("{\"input\": {\"container\": \"" + root + "\"}}")));
    assertTrue(!p.get("fragments").get("perSlice").asBoolean(), "isotropic: 3D fragments");
    assertEquals(1023, p.get("minSegmentSize").asInt(), "523 599 nm^3 over 512 nm^3");

    // what the user wrote stands; the dataset's axes attribute orders its voxel size
    c.mergeAttributes("affinities", java.util.Map.of("voxelSize", java.util.List.of(8, 8, 40),
        "axes", "xyz"));
    p = new com.fasterxml.jackson.databind.ObjectMapper().readTree(partitionJson(resolve(
        "{\"input\": {\"container\": \"" + root + "\"}, \"partition\": {\"fragments\": "
            + "{\"perSlice\": false}}}")));
    assertEquals("[40.0,8.0,8.0]", p.get("fragments").get("voxelSize").toString());
    assertTrue(!p.get("fragments").get("perSlice").asBoolean());
    assertEquals("fragments-multicut", p.get("method").asText());

    // a configuration in x, y, z order still fits the fragments slowest axis first
    c.mergeAttributes("affinities", java.util.Map.of("voxelSize", java.util.List.of(40, 8, 8),
        "axes", "zyx"));
    p = new com.fasterxml.jackson.databind.ObjectMapper().readTree(partitionJson(resolve(
        "{\"axes\": \"xyz\", \"input\": {\"container\": \"" + root + "\"}}")));
    assertEquals("[40.0,8.0,8.0]", p.get("fragments").get("voxelSize").toString());
    assertTrue(p.get("fragments").get("perSlice").asBoolean());

    // the N5 convention, x first, when the tool's own attribute is absent
    Path n5 = dir.resolve("v.n5");
    TestContainers.withAffinities(n5, StorageFormat.N5, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX).mergeAttributes("affinities",
        java.util.Map.of("resolution", java.util.List.of(8, 8, 40)));
    p = new com.fasterxml.jackson.databind.ObjectMapper().readTree(partitionJson(resolve(
        "{\"input\": {\"container\": \"" + n5 + "\"}}")));
    assertEquals("[40.0,8.0,8.0]", p.get("fragments").get("voxelSize").toString());

    // a named method keeps its own defaults: no size filter unless asked for
    p = new com.fasterxml.jackson.databind.ObjectMapper().readTree(partitionJson(resolve(
        "{\"input\": {\"container\": \"" + root + "\"}, \"partition\": {\"method\": "
            + "\"fragments-multicut\"}}")));
    assertEquals(0, p.get("minSegmentSize").asInt(), p.toString());
  }

  @Test
  void explicitBlocksAndOffsetsAreInZyxOrder(@TempDir Path dir) {
    Path root = dir.resolve("v.n5");
    TestContainers.withAffinities(root, StorageFormat.N5, VOLUME, CHUNKS, new int[][] {
        {-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {-2, 0, 0}, {0, -5, 0}});
    RunSettings s = resolve("{\"input\": {\"container\": \"" + root + "\", \"offsets\":"
        + " [[-1, 0, 0], [0, -1, 0], [0, 0, -1], [-2, 0, 0], [0, -5, 0]]},"
        + " \"blocks\": {\"shape\": [6, 20, 14], \"halo\": [2, 5, 1]}}");
    assertArrayEquals(new int[] {14, 20, 6}, s.blockShape());
    assertArrayEquals(new int[] {1, 5, 2}, s.halo());
    assertEquals(2 * 1 * 2, s.grid().blockCount());
  }

  /** A repeated offset is named by its key and position as written, in the file's axis order. */
  @Test
  void aRepeatedOffsetIsNamedAsWritten(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    SunderException e = fails("{\"input\": {\"container\": \"" + root + "\", \"offsets\":"
        + " [[-1, 0, 0], [0, -1, 0], [0, 0, -1], [-4, 0, 0], [0, -1, 0]]}}");
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().startsWith("input.offsets[4]: [0, -1, 0] (zyx) repeats"
        + " input.offsets[1]"), e.getMessage());
  }

  /**
   * Two partition sections that mean the same method (one writes a default out) give the same
   * canonical section, so the same resume fingerprint.
   */
  @Test
  void equivalentPartitionSectionsHaveOneFingerprint(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    String input = "{\"input\": {\"container\": \"" + root + "\"}, ";
    RunSettings plain = resolve(input + "\"partition\": {\"method\": \"mutex-watershed\"}}");
    RunSettings spelled = resolve(input + "\"partition\": {\"method\": \"mutex-watershed\","
        + " \"weights\": {\"kind\": \"channel-role\"}, \"subsampling\": {\"kind\": \"hash\","
        + " \"keepFraction\": 0.2, \"seed\": 7}, \"minSegmentSize\": 0}}");
    assertEquals(partitionJson(plain), partitionJson(spelled));
    assertEquals(RunIdentity.manifest(plain, "r").sectionHashes().get("partition"),
        RunIdentity.manifest(spelled, "r").sectionHashes().get("partition"));
    assertTrue(partitionJson(plain).contains("\"weights\""), partitionJson(plain));
    assertTrue(partitionJson(plain).contains("\"keepFraction\":0.2"), "the manifest records the"
        + " default share of long-range edges: " + partitionJson(plain));
  }

  @Test
  void missingContainerIsNamed(@TempDir Path dir) {
    SunderException e = fails("{\"input\": {\"container\": \"" + dir.resolve("nope.zarr") + "\"}}");
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().startsWith("input.container: "), e.getMessage());
    assertTrue(e.getMessage().contains("does not exist"), e.getMessage());
  }

  @Test
  void missingDatasetListsWhatIsThere(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    SunderException e = fails("{\"input\": {\"container\": \"" + root
        + "\", \"affinities\": \"affs\"}}");
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().contains("input.affinities: no dataset 'affs'"), e.getMessage());
    assertTrue(e.getMessage().contains("[affinities]"), e.getMessage());
  }

  @Test
  void labelDatasetIsNotAnAffinityDataset(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    Container c = TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    TestContainers.labels(c, "labels", VOLUME, CHUNKS);
    SunderException e = fails("{\"input\": {\"container\": \"" + root
        + "\", \"affinities\": \"labels\", \"offsets\": [[-1, 0, 0]]}}");
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().contains("is not an affinity dataset"), e.getMessage());
    assertTrue(e.getMessage().contains("[12, 20, 28]"), e.getMessage());
  }

  @Test
  void offsetCountMustMatchChannels(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    SunderException e = fails("{\"input\": {\"container\": \"" + root
        + "\", \"offsets\": [[-1, 0, 0], [0, -1, 0], [0, 0, -1]]}}");
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("input.offsets: 3 offsets"), e.getMessage());
    assertTrue(e.getMessage().contains("has 5 channels"), e.getMessage());
    SunderException dims = fails("{\"input\": {\"container\": \"" + root
        + "\", \"offsets\": [[-1, 0, 0], [0, -1, 0], [0, 0, -1], [0, -3], [0, 0, -4]]}}");
    assertTrue(dims.getMessage().contains("input.offsets[3]: expected 3 integers"), dims.getMessage());
  }

  @Test
  void blockShapeMustBeWholeChunks(@TempDir Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    SunderException e = fails("{\"input\": {\"container\": \"" + root
        + "\"}, \"blocks\": {\"shape\": [6, 15, 14]}}");
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("blocks.shape: [6, 15, 14] (zyx)"), e.getMessage());
    assertTrue(e.getMessage().contains("[6, 10, 14] or [6, 20, 14]"), e.getMessage());
  }


  // ------------------------------------------------------------ the default block shape

  /** An affinity dataset of {@code zyx} voxels (metadata only) with the realistic 13 offsets. */
  private static Path realistic(Path dir, long[] zyx) {
    Path root = dir.resolve("big.zarr");
    Container c = Container.create(root, StorageFormat.ZARR);
    c.createDataset("affinities", DatasetSpec.of(new long[] {zyx[2], zyx[1], zyx[0], 13},
        new int[] {64, 64, 16, 13}, DataType.FLOAT32));
    c.mergeAttributes("affinities", Map.of("offsets", List.of(List.of(-1, 0, 0),
        List.of(0, -1, 0), List.of(0, 0, -1), List.of(-2, 0, 0), List.of(0, -3, 0),
        List.of(0, 0, -3), List.of(-3, 0, 0), List.of(0, -9, 0), List.of(0, 0, -9),
        List.of(0, -9, -9), List.of(0, 9, -9), List.of(0, -27, 0), List.of(0, 0, -27))));
    return root;
  }

  private static RunSettings resolve(String json, TaskBudget budget) {
    return RunResolver.resolve(new ConfigReader().parse(json).withDefaults(), budget);
  }

  private static TaskBudget budget(int cores, long executorMemory, long perTask) {
    return new TaskBudget(cores, executorMemory, cores, perTask, "test");
  }

  @Test
  void theDefaultShapeKeepsTheHaloOverheadAtTheTargetWhenMemoryAllows(@TempDir Path dir) {
    Path root = realistic(dir, new long[] {192, 512, 512});
    String json = "{\"input\": {\"container\": \"" + root + "\", \"missingChunks\": \"fill\"}}";
    RunSettings s = resolve(json, budget(2, 8L << 30, 4L << 30));
    // Halo 3 x 27 x 27 (zyx) from the longest offsets; the chooser's shape, whole chunks.
    assertArrayEquals(new int[] {27, 27, 3}, s.halo());
    BlockShapeOrigin origin = s.blockOrigin();
    assertEquals(BlockShapeOrigin.CHOSEN, origin.source());
    assertEquals(BlockShapeChoice.Limit.TARGET_REACHED, origin.limitedBy());
    double overhead = BlockShapeChoice.overhead(s.volumeShape(), s.blockShape(), s.halo());
    assertTrue(overhead <= BlockShapeChoice.TARGET_OVERHEAD, "overhead " + overhead);
    assertEquals(overhead, origin.overhead(), 1e-12);
    // The old default (128 x 128 x 64, about 2^20 voxels) read 1.84 x the volume: by hand,
    // x and y: 4 blocks of 128, extents 155 + 182 + 182 + 155 = 674 of 512; z: 3 blocks of 64,
    // extents 67 + 70 + 67 = 204 of 192; 674/512 x 674/512 x 204/192 = 1.841.
    assertEquals(1.841, BlockShapeChoice.overhead(new long[] {512, 512, 192},
        new int[] {128, 128, 64}, new int[] {27, 27, 3}), 0.001);
    for (int d = 0; d < 3; d++) {
      assertEquals(0, s.blockShape()[d] % s.chunkShape()[d]);
    }
    // Fragments-multicut: 13 x 4 + 150 + 8 bytes per extended voxel, and 2 x (13 x 4 + 20 + 21)
    // for the fragments' context, which holds every channel to move fragment borders.
    assertEquals(396, origin.bytesPerExtendedVoxel());
    assertTrue(s.grid().blockCount() >= 4, "at least 2 blocks per core");
  }

  @Test
  void aSmallBudgetLimitsTheShapeAndTheMethodSetsTheBytesPerVoxel(@TempDir Path dir) {
    Path root = realistic(dir, new long[] {192, 512, 512});
    String json = "{\"input\": {\"container\": \"" + root + "\", \"missingChunks\": \"fill\"},"
        + " \"partition\": {\"method\": \"mutex-watershed\"}}";
    long perTask = 512L << 20;
    RunSettings s = resolve(json, budget(2, 8L << 30, perTask));
    BlockShapeOrigin origin = s.blockOrigin();
    // Mutex Watershed: 13 x 4 + 600 + 8 bytes per extended voxel (KernelBenchmark's figure).
    assertEquals(660, origin.bytesPerExtendedVoxel());
    assertEquals(BlockShapeChoice.Limit.MEMORY_BUDGET, origin.limitedBy());
    long extended = BlockShapeChoice.largestExtendedVoxels(s.volumeShape(), s.blockShape(),
        s.halo());
    assertTrue(extended * 660 <= perTask, extended + " voxels");
    assertTrue(origin.limitText().contains("memory per task"), origin.limitText());
    // Fragment agglomeration: 13 x 4 + 150 + 8, and 4 x (3 x 4 + 20) for its context two halos
    // wide (at most 3.5 times the extended box).
    String agglomeration = "{\"input\": {\"container\": \"" + root
        + "\", \"missingChunks\": \"fill\"},"
        + " \"partition\": {\"method\": \"fragments-agglomeration\"}}";
    assertEquals(338, resolve(agglomeration, budget(2, 8L << 30, perTask)).blockOrigin()
        .bytesPerExtendedVoxel());
    // Many cores: the block count floor stops the growth first.
    RunSettings many = resolve("{\"input\": {\"container\": \"" + root
        + "\", \"missingChunks\": \"fill\"}}", budget(64, 1L << 40, 1L << 36));
    assertEquals(BlockShapeChoice.Limit.BLOCK_COUNT, many.blockOrigin().limitedBy());
    assertTrue(many.grid().blockCount() >= 128, "blocks " + many.grid().blockCount());
  }

  @Test
  void aConfiguredShapeIsKeptAndATaskLargerThanTheExecutorIsRefused(@TempDir Path dir) {
    Path root = realistic(dir, new long[] {192, 512, 512});
    String json = "{\"input\": {\"container\": \"" + root + "\", \"missingChunks\": \"fill\"},"
        + " \"blocks\": {\"shape\": [64, 128, 128]}}";
    RunSettings s = resolve(json, budget(2, 8L << 30, 4L << 30));
    assertArrayEquals(new int[] {128, 128, 64}, s.blockShape());
    assertEquals(BlockShapeOrigin.CONFIGURED, s.blockOrigin().source());
    // (64 + 6) x (128 + 54)^2 = 2318680 voxels x 396 bytes = 875.7 MiB > 256 MiB.
    SunderException e = assertThrows(SunderException.class,
        () -> resolve(json, budget(2, 256L << 20, 128L << 20)));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("blocks.shape: a block of [64, 128, 128] (zyx)"),
        e.getMessage());
    assertTrue(e.getMessage().contains("2318680 voxels") && e.getMessage().contains("875.7 MiB")
        && e.getMessage().contains("256.0 MiB"), e.getMessage());
    SunderException chosen = assertThrows(SunderException.class, () -> resolve(
        "{\"input\": {\"container\": \"" + root + "\", \"missingChunks\": \"fill\"}}",
        budget(2, 1L << 20, 1L << 20)));
    assertTrue(chosen.getMessage().contains("choose a smaller blocks.memoryPerTask"),
        chosen.getMessage());
  }
}
