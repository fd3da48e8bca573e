package org.sunder.spark.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.spark.config.ConfigReader;
import org.sunder.spark.workdir.Stage;

class RunPreparationTest {
  private static final long[] VOLUME = {12, 20, 28};
  private static final int[] CHUNKS = {6, 10, 14};

  private static RunSettings settings(Path root, String extra) {
    return RunResolver.resolve(new ConfigReader().parse("{\"input\": {\"container\": \"" + root
        + "\"}" + extra + "}").withDefaults());
  }

  private static Path input(Path dir) {
    Path root = dir.resolve("v.zarr");
    TestContainers.withAffinities(root, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    return root;
  }

  @Test
  void firstRunCreatesOutputAndManifestAndRerunResumes(@TempDir Path dir) {
    Path root = input(dir);
    PreparedRun first = RunPreparation.prepare(settings(root, ""), false);
    Container c = Container.open(root);
    assertTrue(c.datasetExists("segmentation"));
    Map<?, ?> marker = (Map<?, ?>) c.readAttributes("segmentation").get(RunPreparation.MARKER);
    assertEquals(first.manifest().runId(), marker.get("runId"));
    first.workDir().ledger(Stage.PARTITION).record(0, new byte[] {1});
    first.close();
    PreparedRun second = RunPreparation.prepare(settings(root, ""), false);
    second.close();
    assertEquals(first.manifest().runId(), second.manifest().runId());
    assertTrue(second.workDir().ledger(Stage.PARTITION).isFinished(0));
    assertTrue(second.notes().stream().anyMatch(n -> n.startsWith("resuming run")), second.notes().toString());
  }

  @Test
  void fragmentMethodsGetAContinuationDatasetBesideTheLabels(@TempDir Path dir) {
    Path root = input(dir);
    RunPreparation.prepare(settings(root, ", \"partition\": {\"method\": \"mutex-watershed\"}"),
        false).close();
    assertFalse(Container.open(root).datasetExists("segmentation-continuations"));
    for (String method : new String[] {"fragments-multicut", "fragments-agglomeration"}) {
      Path other = input(dir.resolve(method));
      RunPreparation.prepare(settings(other,
          ", \"partition\": {\"method\": \"" + method + "\"}"), false);
      Container c = Container.open(other);
      assertTrue(c.datasetExists("segmentation-continuations"), method);
      assertEquals(c.openDataset("segmentation").chunkShape().length,
          c.openDataset("segmentation-continuations").chunkShape().length);
    }
  }

  @Test
  void changedPartitionIsRefusedAndFreshStartsOver(@TempDir Path dir) {
    Path root = input(dir);
    PreparedRun first = RunPreparation.prepare(settings(root, ""), false);
    first.workDir().ledger(Stage.PARTITION).record(0, new byte[] {1});
    first.close();
    SunderException e = assertThrows(SunderException.class, () -> RunPreparation.prepare(
        settings(root, ", \"partition\": {\"method\": \"agglomeration\"}"), false));
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertTrue(e.getMessage().contains("partition.method: \"fragments-multicut\" -> \"agglomeration\""), e.getMessage());
    assertFalse(e.getMessage().contains("maxDriverEdges"), e.getMessage());
    assertTrue(first.workDir().ledger(Stage.PARTITION).isFinished(0));
    PreparedRun fresh = RunPreparation.prepare(
        settings(root, ", \"partition\": {\"method\": \"agglomeration\"}"), true);
    fresh.close();
    assertNotEquals(first.manifest().runId(), fresh.manifest().runId());
    assertFalse(fresh.workDir().ledger(Stage.PARTITION).isFinished(0));
  }

  @Test
  void foreignOutputDatasetIsRefusedUntouched(@TempDir Path dir) throws Exception {
    Path root = input(dir);
    TestContainers.labels(Container.open(root), "segmentation", VOLUME, CHUNKS);
    Path zarray = root.resolve("segmentation/.zarray");
    String before = Files.readString(zarray);
    for (boolean fresh : new boolean[] {false, true}) {
      SunderException e = assertThrows(SunderException.class,
          () -> RunPreparation.prepare(settings(root, ""), fresh));
      assertEquals(ErrorKind.CONFLICT, e.kind());
      assertTrue(e.getMessage().contains("was not written by Sunder"), e.getMessage());
    }
    assertEquals(before, Files.readString(zarray));
    assertFalse(Files.exists(dir.resolve("v.zarr.sunder-work")));
  }

  @Test
  void workDirOfAnotherRunIsRefused(@TempDir Path dir) {
    Path root = input(dir);
    PreparedRun first = RunPreparation.prepare(settings(root, ""), false);
    first.close();
    String other = dir.resolve("other-work").toString();
    RunPreparation.prepare(settings(root, ", \"output\": {\"dataset\": \"seg2\"}, \"workDir\": \""
        + other + "\""), false).close();
    SunderException e = assertThrows(SunderException.class, () -> RunPreparation.prepare(
        settings(root, ", \"workDir\": \"" + other + "\""), false));
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertTrue(e.getMessage().contains("belongs to run " + first.manifest().runId()), e.getMessage());
  }

  @Test
  void outputThatIsAFileIsRefused(@TempDir Path dir) throws Exception {
    Path root = input(dir);
    Path file = dir.resolve("notes.txt");
    Files.writeString(file, "mine");
    SunderException e = assertThrows(SunderException.class, () -> RunPreparation.prepare(
        settings(root, ", \"output\": {\"container\": \"" + file + "\"}"), false));
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertEquals("mine", Files.readString(file));
    SunderException unwritable = assertThrows(SunderException.class, () -> RunPreparation.prepare(
        settings(root, ", \"output\": {\"container\": \"" + file.resolve("out.zarr") + "\"},"
            + " \"workDir\": \"" + dir.resolve("w") + "\""), false));
    assertEquals(ErrorKind.STORAGE, unwritable.kind());
    assertTrue(unwritable.getMessage().contains("out.zarr"), unwritable.getMessage());
  }
}
