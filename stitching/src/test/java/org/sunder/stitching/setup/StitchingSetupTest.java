package org.sunder.stitching.setup;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.ObjectInputStream;
import java.io.ObjectOutputStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.stitching.InProcessRunner;
import org.sunder.stitching.SceneStore;
import org.sunder.stitching.TissueScene;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

class StitchingSetupTest {
  private static final int[] CHUNK = {8, 8, 4};

  @TempDir
  Path dir;

  private StitchingSetup setup(Path root, PartitionConfig config) {
    TissueScene scene = TissueScene.small(2, new long[] {24, 16, 8}, Degradation.none());
    SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
    return SceneStore.setup(scene, root, CHUNK, new int[] {16, 8, 8}, new int[] {3, 3, 2},
        config);
  }

  @Test
  void affinitiesWithTheWrongChannelCountAreRejectedBeforeAnythingIsWritten() {
    Path root = dir.resolve("c");
    StitchingSetup good = setup(root, PartitionConfig.mutexWatershed(null, null));
    StitchingSetup bad = new StitchingSetup(good.inputRoot(), good.affinitiesPath(), "",
        good.outputRoot(), good.labelsPath(), good.grid(),
        Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0}), good.partition());
    SunderException e = assertThrows(SunderException.class, () -> InProcessRunner.run(bad));
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().contains("'affinities'")
        && e.getMessage().contains("expected 2 channels"),
        e.getMessage());
    assertTrue(!Container.open(root).datasetExists(good.labelsPath()));
  }

  /** The in-process runner refuses what the command line refuses: a mask that is not uint8. */
  @Test
  void aMaskThatIsNotUint8IsRejectedBeforeAnythingIsWritten() {
    Path root = dir.resolve("m");
    StitchingSetup good = setup(root, PartitionConfig.mutexWatershed(null, null));
    Container.open(root).createDataset("mask",
        DatasetSpec.of(good.grid().volumeShape(), CHUNK, DataType.FLOAT32));
    StitchingSetup masked = new StitchingSetup(good.inputRoot(), good.affinitiesPath(), "mask",
        good.outputRoot(), good.labelsPath(), good.grid(), good.offsets(), good.partition());
    SunderException e = assertThrows(SunderException.class, () -> InProcessRunner.run(masked));
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().contains("mask 'mask'") && e.getMessage().contains("UINT8"),
        e.getMessage());
    assertTrue(!Container.open(root).datasetExists(good.labelsPath()));
  }

  @Test
  void aLabelDatasetOfAnotherShapeIsAConflict() {
    Path root = dir.resolve("d");
    StitchingSetup setup = setup(root, PartitionConfig.mutexWatershed(null, null));
    Container.open(root).createDataset(setup.labelsPath(),
        DatasetSpec.of(new long[] {24, 16, 9}, CHUNK, DataType.UINT64));
    SunderException e = assertThrows(SunderException.class, setup::createLabels);
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertTrue(e.getMessage().contains("[24, 16, 9]"), e.getMessage());
  }

  @Test
  void setupAndTaskResultsSurviveJavaSerialisation() throws Exception {
    Path root = dir.resolve("e");
    StitchingSetup setup = setup(root, PartitionConfig.agglomeration(Linkage.MEAN, false, null,
        Subsampling.hash(0.5, 3)));
    assertEquals(setup.partition(), roundTrip(setup).partition());
    assertEquals(setup.grid(), roundTrip(setup).grid());
    setup.createLabels();
    List<BlockSummary> summaries = new ArrayList<>();
    for (int b = 0; b < setup.grid().blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
    }
    assertEquals(summaries.get(0), roundTrip(summaries.get(0)));
    List<SeamEdges> seams = new ArrayList<>();
    for (int f = 0; f < setup.grid().faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
    }
    assertTrue(seams.get(0).edges().size() > 0);
    assertEquals(seams.get(0), roundTrip(seams.get(0)));
    GlobalSolve.Result result = GlobalSolve.run(setup, summaries, seams);
    assertEquals(result.finalIds(), roundTrip(result).finalIds());
    assertEquals(result.report(), roundTrip(result.report()));
  }

  @SuppressWarnings("unchecked")
  private static <T> T roundTrip(T value) throws Exception {
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    try (ObjectOutputStream out = new ObjectOutputStream(bytes)) {
      out.writeObject(value);
    }
    try (ObjectInputStream in = new ObjectInputStream(
        new ByteArrayInputStream(bytes.toByteArray()))) {
      return (T) in.readObject();
    }
  }
}
