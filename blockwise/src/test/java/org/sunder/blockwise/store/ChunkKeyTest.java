package org.sunder.blockwise.store;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Where one chunk lands on disk, in pure Java. The expected keys are derived by hand from the
 * specifications (digest in FORMATS.md): Zarr v2 ("Zarr Storage Specification Version 2") names
 * a chunk by its grid indices slowest axis first, joined by the dimension separator; N5 (the
 * "File-system specification" of its README) by grid positions fastest axis first, one
 * directory per axis. A key in the wrong axis order would otherwise surface only in the Python
 * interop tests.
 *
 * <p>The volume is 20 x 9 x 7 voxels in memory order (x fastest), chunks 6 x 4 x 3; the voxel
 * (x 13, y 2, z 5) is in chunk x 13 / 6 = 2, y 2 / 4 = 0, z 5 / 3 = 1.
 */
class ChunkKeyTest {
  private static final long[] SHAPE = {20, 9, 7};
  private static final int[] CHUNKS = {6, 4, 3};
  private static final long[] VOXEL = {13, 2, 5};

  @Test
  void zarrKeysAreSlowestAxisFirstJoinedByADot(@TempDir Path tmp) throws IOException {
    // z.y.x = "1.0.2"
    assertEquals(List.of("1.0.2"), chunkFilesAfterOneWrite(tmp, StorageFormat.ZARR, "."));
  }

  @Test
  void zarrKeysWithTheSlashSeparatorAreNestedDirectories(@TempDir Path tmp) throws IOException {
    // z/y/x = "1/0/2"
    assertEquals(List.of("1/0/2"), chunkFilesAfterOneWrite(tmp, StorageFormat.ZARR, "/"));
  }

  @Test
  void n5KeysAreFastestAxisFirst(@TempDir Path tmp) throws IOException {
    // x/y/z = "2/0/1"
    assertEquals(List.of("2/0/1"), chunkFilesAfterOneWrite(tmp, StorageFormat.N5, null));
  }

  @Test
  void theChunkFileOfAGridPositionIsTheSameKey(@TempDir Path tmp) {
    Dataset zarr = Container.create(tmp.resolve("z"), StorageFormat.ZARR)
        .createDataset("d", DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT8)
            .withDimensionSeparator("."));
    assertEquals("1.0.2", zarr.chunkFile(new long[] {2, 0, 1}).getFileName().toString());
    assertEquals("0.2.3", zarr.chunkFile(new long[] {3, 2, 0}).getFileName().toString());
  }

  private static List<String> chunkFilesAfterOneWrite(Path tmp, StorageFormat format,
      String separator) throws IOException {
    DatasetSpec spec = DatasetSpec.of(SHAPE, CHUNKS, DataType.UINT8);
    if (separator != null) {
      spec = spec.withDimensionSeparator(separator);
    }
    Path root = tmp.resolve("c");
    Dataset dataset = Container.create(root, format).createDataset("d", spec);
    dataset.write(ElementArrays.wrap(new byte[] {7}, DataType.UINT8, new long[] {1, 1, 1}),
        VOXEL);
    Path dir = root.resolve("d");
    try (Stream<Path> files = Files.walk(dir)) {
      return files.filter(Files::isRegularFile)
          .map(p -> dir.relativize(p).toString())
          .filter(name -> !name.startsWith(".") && !name.equals("attributes.json"))
          .sorted()
          .collect(Collectors.toList());
    }
  }
}
