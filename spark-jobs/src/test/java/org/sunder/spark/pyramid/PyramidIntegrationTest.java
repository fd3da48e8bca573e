package org.sunder.spark.pyramid;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.spark.cli.CliRun;
import org.sunder.spark.it.Scenes;
import org.sunder.spark.it.SharedSpark;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.testing.PythonReference;

/**
 * A run builds the segmentation's label pyramid as a stage of its own, on Spark
 * ({@code local[2]}), and describes it with OME-NGFF 0.4 metadata, in Zarr and in N5. The
 * small scene (64 x 56 x 20 voxels, x y z, voxels 8 x 8 x 24 nm, chunks 16 x 14 x 5) gives
 * three levels below the segmentation. References: Python's {@code zarr} opens every level
 * (N5 through its {@code N5FSStore}), numpy recomputes each level as the mode of the one
 * before, and {@code jsonschema} validates the attributes against the specification's schemas.
 */
class PyramidIntegrationTest {
  private static final int[] CHUNK_XYZ = {16, 14, 5};
  private static final int[] BLOCK_XYZ = {32, 28, 10};
  private static final ObjectMapper JSON = new ObjectMapper();
  @RegisterExtension
  static final SharedSpark.PerClass SPARK = SharedSpark.perClass("local[2]");

  private static Path resourceDir() throws URISyntaxException {
    return Path.of(PyramidIntegrationTest.class.getResource("check_pyramid.py").toURI())
        .getParent();
  }

  private static String script() throws IOException {
    try (InputStream in = PyramidIntegrationTest.class.getResourceAsStream("check_pyramid.py")) {
      return new String(in.readAllBytes(), StandardCharsets.UTF_8);
    }
  }

  private static CliRun run(Path config) {
    CliRun run = CliRun.with(SPARK.source(), "run", config.toString());
    assertEquals(0, run.exitCode(), run.out() + run.err());
    return run;
  }

  @ParameterizedTest
  @EnumSource(StorageFormat.class)
  void pyramidLevelsAreModesOfTheLevelBeforeAndTheMetadataFollowsOmeNgff(StorageFormat format,
      @TempDir Path dir) throws Exception {
    PythonReference.requireModules("zarr", "numpy", "jsonschema");
    Path root = dir.resolve(format == StorageFormat.N5 ? "scene.n5" : "scene.zarr");
    SyntheticScenario.write(Container.create(root, format), SynthSpec.small(13),
        ScenarioOptions.defaults().withDegradation(Degradation.moderate(13))
            .withChunkShape(CHUNK_XYZ));
    Path config = dir.resolve("run.json");
    Scenes.writeConfig(config, root, BLOCK_XYZ, "{}", null);
    CliRun first = run(config);
    // levels: x y halve first (z is 3x coarser), then all three: 16 + 2 + 1 chunks
    assertTrue(first.out().contains("pyramid   19 tasks (0 skipped, 19 run)"), first.out());

    String out = PythonReference.runChecked(script(), root.toString(),
        format == StorageFormat.N5 ? "n5" : "zarr", resourceDir().toString());
    JsonNode result = JSON.readTree(out.strip());
    assertEquals(4, result.get("levels").asInt(), out);
    assertEquals("[[20,56,64],[20,28,32],[10,14,16],[5,7,8]]", result.get("shapes").toString());
    // the input's voxelSize attribute (zyx, nm) as level 0's scale, unit spelled out
    assertEquals("[24.0,8.0,8.0]", result.get("scale0").toString());
    assertEquals("nanometer", result.get("unit").asText());

    // resume: a rerun skips every pyramid task; a lost chunk and its record are redone
    WorkDir work = new WorkDir(root.resolveSibling(root.getFileName() + ".sunder-work")
        .resolve("segmentation"));
    Path level2 = root.resolve("segmentation_s2");
    List<String> before = Scenes.chunkFiles(level2);
    Files.delete(work.ledger(Stage.PYRAMID).dir().resolve("16.done"));  // level 2, chunk 0
    Files.delete(level2.resolve("0/0/0"));
    CliRun again = run(config);
    assertTrue(again.out().contains("pyramid: 16 of 16 tasks finished in an earlier run, skipped"),
        again.out());
    assertTrue(again.out().contains("pyramid: 1 of 2 tasks finished in an earlier run, skipped"),
        again.out());
    assertTrue(again.out().contains("pyramid   19 tasks (18 skipped, 1 run)"), again.out());
    assertEquals(before, Scenes.chunkFiles(level2));
    PythonReference.runChecked(script(), root.toString(),
        format == StorageFormat.N5 ? "n5" : "zarr", resourceDir().toString());
  }
}
