package org.sunder.spark.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.spark.run.TestContainers;

/**
 * Mistakes a user can make on the command line: each gets a message naming what is wrong, the
 * exit code of its error kind, no stack trace, and leaves every file as it was.
 */
class CliBadInputTest {
  private static final long[] VOLUME = {12, 20, 28};
  private static final int[] CHUNKS = {6, 10, 14};

  @TempDir
  Path dir;
  private Path input;

  @BeforeEach
  void scene() {
    input = dir.resolve("v.zarr");
    Container c = TestContainers.withAffinities(input, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    TestContainers.labels(c, "labels", VOLUME, CHUNKS);
  }

  private Path config(String json) throws IOException {
    Path file = dir.resolve("run.json");
    Files.writeString(file, json);
    return file;
  }

  /** Every file under dir (except the config) with its size and modification time. */
  private Map<String, String> snapshot() throws IOException {
    Map<String, String> files = new TreeMap<>();
    try (Stream<Path> walk = Files.walk(dir)) {
      for (Path p : walk.filter(Files::isRegularFile).toList()) {
        if (!p.getFileName().toString().equals("run.json")) {
          files.put(dir.relativize(p).toString(), Files.size(p) + " "
              + Files.getLastModifiedTime(p).toMillis());
        }
      }
    }
    return files;
  }

  private CliRun fails(ErrorKind kind, String json, String... expected) throws IOException {
    Path file = config(json);
    Map<String, String> before = snapshot();
    CliRun run = CliRun.withoutSpark("run", file.toString());
    assertEquals(kind.exitCode(), run.exitCode(), run.err());
    for (String text : expected) {
      assertTrue(run.err().contains(text), () -> "expected '" + text + "' in: " + run.err());
    }
    assertFalse(run.err().contains("\tat "), "no stack trace: " + run.err());
    assertEquals(before, snapshot(), "nothing written or changed");
    return run;
  }

  @Test
  void missingKey() throws IOException {
    fails(ErrorKind.INVALID_CONFIG, "{\"input\": {\"affinities\": \"affinities\"}}",
        "missing key 'input.container'");
  }

  @Test
  void unknownKey() throws IOException {
    fails(ErrorKind.INVALID_CONFIG, "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"block\": {}}", "unknown key 'block'", "blocks");
  }

  @Test
  void wrongTypeOfValue() throws IOException {
    fails(ErrorKind.INVALID_CONFIG, "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"blocks\": {\"shape\": \"big\"}}", "key 'blocks.shape'", "list of integers");
  }

  @Test
  void unknownPartitionMethod() throws IOException {
    fails(ErrorKind.INVALID_CONFIG, "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"partition\": {\"method\": \"watershed-of-dreams\"}}", "partition", "method");
  }

  @Test
  void offsetsNotMatchingChannels() throws IOException {
    fails(ErrorKind.INVALID_CONFIG, "{\"input\": {\"container\": \"" + input + "\","
        + " \"offsets\": [[-1, 0, 0], [0, -1, 0]]}}", "input.offsets: 2 offsets",
        "has 5 channels");
  }

  @Test
  void nonAffinityDataset() throws IOException {
    fails(ErrorKind.INVALID_INPUT, "{\"input\": {\"container\": \"" + input + "\","
        + " \"affinities\": \"labels\", \"offsets\": [[-1, 0, 0]]}}",
        "'labels'", "is not an affinity dataset");
  }

  @Test
  void outputThatIsNotOurs() throws IOException {
    fails(ErrorKind.CONFLICT, "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"output\": {\"dataset\": \"labels\"}}", "'labels'", "was not written by Sunder");
  }

  @Test
  void unwritableOutputPath() throws IOException {
    Path file = dir.resolve("plain-file");
    Files.writeString(file, "x");
    fails(ErrorKind.STORAGE, "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"output\": {\"container\": \"" + file.resolve("out.zarr") + "\"},"
        + " \"workDir\": \"" + dir.resolve("work") + "\"}", "out.zarr");
  }

  @Test
  void workDirFromAnotherRun() throws IOException {
    Path work = dir.resolve("shared-work");
    String first = "{\"input\": {\"container\": \"" + input + "\"}, \"workDir\": \"" + work + "\"}";
    org.sunder.spark.run.RunPreparation.prepare(org.sunder.spark.run.RunLoader.resolve(
        config(first), null), false).close();
    fails(ErrorKind.CONFLICT, "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"output\": {\"dataset\": \"other-seg\"}, \"workDir\": \"" + work + "\"}",
        "work dir " + work, "output.dataset", "--fresh");
  }

  @Test
  void badOptionAndUnknownStage() throws IOException {
    CliRun option = CliRun.withoutSpark("run", "--frsh", "x.json");
    assertEquals(ErrorKind.INVALID_CONFIG.exitCode(), option.exitCode());
    assertTrue(option.err().contains("--frsh"), option.err());
    CliRun stage = CliRun.withoutSpark("stage", "stitch", config("{}").toString());
    assertEquals(ErrorKind.INVALID_CONFIG.exitCode(), stage.exitCode());
    assertTrue(stage.err().contains("unknown stage 'stitch'"), stage.err());
    assertTrue(stage.err().contains("partition, seams, solve, relabel, evaluate"), stage.err());
  }

  @Test
  void missingConfigFile() {
    CliRun run = CliRun.withoutSpark("run", dir.resolve("nope.json").toString());
    assertEquals(ErrorKind.INVALID_CONFIG.exitCode(), run.exitCode());
    assertTrue(run.err().contains("nope.json does not exist"), run.err());
    assertEquals(List.of(), List.of(run.err().split("\n")).stream()
        .filter(l -> l.startsWith("\tat ")).toList());
  }
}
