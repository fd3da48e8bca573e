package org.sunder.blockwise.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/** Groups, datasets, listing and attribute merging in both formats. */
class ContainerTest {
  @TempDir
  Path tmp;

  @ParameterizedTest
  @EnumSource(StorageFormat.class)
  void groupsDatasetsAndAttributes(StorageFormat format) throws java.io.IOException {
    Path root = tmp.resolve("c");
    Container container = Container.create(root, format);
    assertEquals(format, Container.open(root).format());
    assertEquals(format, Container.create(root, format).format());
    container.createGroup("a/b");
    assertTrue(container.groupExists("a"));
    assertTrue(container.groupExists("/a/b/"));
    assertFalse(container.datasetExists("a/b"));
    container.createDataset("a/volume",
        DatasetSpec.of(new long[] {5, 4, 3}, new int[] {2, 2, 2}, DataType.FLOAT32));
    assertTrue(container.datasetExists("a/volume"));
    assertFalse(container.groupExists("a/volume"));
    assertEquals(List.of("b", "volume"), container.list("a"));
    assertEquals(List.of("a"), container.list(""));

    Map<String, Object> first = new LinkedHashMap<>();
    first.put("axes", "zyx");
    first.put("offsets", List.of(List.of(0, 0, 1), List.of(0, 1, 0)));
    container.mergeAttributes("a/volume", first);
    container.mergeAttributes("a/volume", Map.of("resolution", List.of(40, 4, 4), "axes", "ZYX"));
    Map<String, Object> attributes = container.readAttributes("a/volume");
    assertEquals(Map.of("axes", "ZYX", "resolution", List.of(40, 4, 4),
        "offsets", List.of(List.of(0, 0, 1), List.of(0, 1, 0))), attributes);
    assertEquals(new long[] {5, 4, 3}.length,
        container.openDataset("a/volume").shape().length);
    container.mergeAttributes("", Map.of("note", "synthetic"));
    assertEquals(Map.of("note", "synthetic"), Container.open(root).readAttributes(""));
    try (var files = Files.list(root.resolve("a/volume"))) {
      assertTrue(files.noneMatch(p -> p.getFileName().toString().endsWith(".tmp")));
    }
  }
}
