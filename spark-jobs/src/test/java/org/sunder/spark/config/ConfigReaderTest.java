package org.sunder.spark.config;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;

class ConfigReaderTest {
  private final ConfigReader reader = new ConfigReader();

  @Test
  void minimalConfigGetsDefaults() {
    RunConfig config = reader.parse("{\"input\": {\"container\": \"v.n5\"}}").withDefaults();
    assertEquals("zyx", config.axes());
    assertEquals("affinities", config.input().affinities());
    assertEquals("v.n5", config.output().container());
    assertEquals("segmentation", config.output().dataset());
    assertEquals(RunConfig.DEFAULT_MAX_DRIVER_EDGES, config.solve().maxDriverEdges());
    assertEquals(Boolean.TRUE, config.evaluate().ignoreBackground());
    assertTrue(config.partition().isObject());
  }

  @Test
  void offsetsAndBlocksAreRead() {
    RunConfig config = reader.parse("{\"axes\": \"zyx\", \"input\": {\"container\": \"a.zarr\","
        + " \"offsets\": [[-1, 0, 0], [0, -1, 0], [0, 0, -4]]}, \"blocks\": {\"shape\": [8, 16, 32]}}")
        .withDefaults();
    assertArrayEquals(new int[] {0, 0, -4}, config.input().offsets()[2]);
    assertArrayEquals(new int[] {8, 16, 32}, config.blocks().shape());
  }

  @Test
  void unknownKeyIsNamedWithItsPathAndTheKnownKeys() {
    ConfigException e = assertThrows(ConfigException.class,
        () -> reader.parse("{\"input\": {\"container\": \"v.n5\", \"ofsets\": []}}"));
    assertTrue(e.getMessage().contains("'input.ofsets'"), e.getMessage());
    assertTrue(e.getMessage().contains("offsets"), e.getMessage());
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
  }

  @Test
  void wrongTypeIsNamedWithItsPath() {
    ConfigException e = assertThrows(ConfigException.class, () -> reader.parse(
        "{\"input\": {\"container\": \"v.n5\", \"offsets\": [[-1, 0, 0], \"x\"]}}"));
    assertTrue(e.getMessage().contains("input.offsets[1]"), e.getMessage());
    ConfigException shape = assertThrows(ConfigException.class, () -> reader.parse(
        "{\"input\": {\"container\": \"v.n5\"}, \"blocks\": {\"shape\": 64}}"));
    assertTrue(shape.getMessage().contains("blocks.shape"), shape.getMessage());
    assertTrue(shape.getMessage().contains("list of integers"), shape.getMessage());
  }

  @Test
  void missingInputContainerIsNamed() {
    ConfigException e = assertThrows(ConfigException.class,
        () -> reader.parse("{\"input\": {\"affinities\": \"aff\"}}").withDefaults());
    assertTrue(e.getMessage().contains("'input.container'"), e.getMessage());
    ConfigException none = assertThrows(ConfigException.class,
        () -> reader.parse("{}").withDefaults());
    assertTrue(none.getMessage().contains("'input'"), none.getMessage());
  }

  @Test
  void malformedJsonNamesLine(@TempDir Path dir) throws Exception {
    Path file = dir.resolve("run.json");
    Files.writeString(file, "{\n \"input\": {\"container\": \"v.n5\",}\n}");
    ConfigException e = assertThrows(ConfigException.class, () -> reader.read(file));
    assertTrue(e.getMessage().contains(file.toString()), e.getMessage());
    assertTrue(e.getMessage().contains("line 2"), e.getMessage());
  }

  @Test
  void badAxesAndBoundAreNamed() {
    ConfigException axes = assertThrows(ConfigException.class,
        () -> reader.parse("{\"axes\": \"zyy\", \"input\": {\"container\": \"v\"}}").withDefaults());
    assertTrue(axes.getMessage().startsWith("axes:"), axes.getMessage());
    ConfigException bound = assertThrows(ConfigException.class, () -> reader.parse(
        "{\"input\": {\"container\": \"v\"}, \"solve\": {\"maxDriverEdges\": 0}}").withDefaults());
    assertTrue(bound.getMessage().contains("solve.maxDriverEdges"), bound.getMessage());
  }

  @Test
  void missingFileIsNamed(@TempDir Path dir) {
    Path file = dir.resolve("absent.json");
    ConfigException e = assertThrows(ConfigException.class, () -> reader.read(file));
    assertTrue(e.getMessage().contains(file.toString()));
  }
}
