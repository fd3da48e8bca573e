package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.stitching.SceneStore;
import org.sunder.stitching.TissueScene;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

/**
 * The level-by-level solve from per-part inputs gives the single-level solve's final ids,
 * number for number, on a blockwise run over degraded synthetic tissue.
 */
class SuperBlockSolveTest {
  private static final long[] SHAPE = {64, 56, 20};
  private static final int[] CHUNK = {8, 8, 4};
  private static final int[] BLOCK = {16, 8, 4};
  private static final int[] HALO = {3, 3, 2};
  private static final Degradation MILD = new Degradation(7, 0.7, 0.08, 0.01, 0.0005, 0);

  @TempDir
  Path dir;

  private record Tables(List<BlockSummary> summaries, List<SeamEdges> seams, long pairs) {}

  private static Tables tables(StitchingSetup setup) {
    setup.validateInputs();
    setup.createLabels();
    BlockGrid grid = setup.grid();
    List<BlockSummary> summaries = new ArrayList<>();
    long pairs = 0;
    for (int b = 0; b < grid.blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
      pairs += summaries.get(b).innerEdges().size();
    }
    List<SeamEdges> seams = new ArrayList<>();
    for (int f = 0; f < grid.faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
      pairs += seams.get(f).edges().size();
    }
    return new Tables(summaries, seams, pairs);
  }

  @Test
  void mutexWatershedAndMeanAgglomerationEqualTheSingleLevelFinalIds() {
    PartitionConfig[] configs = {PartitionConfig.mutexWatershed(null, null),
        PartitionConfig.agglomeration(Linkage.MEAN, false, null, null)};
    int leveled = 0;
    for (PartitionConfig config : configs) {
      TissueScene scene = TissueScene.small(11, SHAPE, MILD);
      Path root = dir.resolve(config.method().jsonName());
      SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
      StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
      Tables t = tables(setup);
      FinalIdMap expected = GlobalSolve.run(setup, t.summaries(), t.seams()).finalIds();
      for (long bound = t.pairs() - 1; bound >= t.pairs() / 16; bound = bound * 3 / 4) {
        GlobalSolve.Result levels;
        try {
          levels = SuperBlockSolve.run(setup, t.pairs(), bound, t.summaries()::get,
              t.seams()::get, dir.resolve("levels-" + config.method().jsonName() + bound));
        } catch (SunderException tooSmall) {
          // the rest after every level does not fit under so low a bound: a clear error
          assertEquals(ErrorKind.INVALID_CONFIG, tooSmall.kind());
          assertTrue(tooSmall.getMessage().contains("solve.maxDriverEdges"));
          continue;
        }
        assertTrue(levels.report().method().contains("levels of super-blocks"),
            levels.report().method());
        assertEquals(expected, levels.finalIds(), config.method().jsonName() + " bound "
            + bound + ": " + levels.report());
        if (!levels.report().method().contains("(0 levels")) {
          leveled++;
        }
      }
      assertTrue(leveled >= 1, config.method().jsonName() + ": no solve used a level");
      leveled = 0;
    }
  }

  @Test
  void multicutAndFragmentMethodsGetAClearError() {
    PartitionConfig multicut = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}");
    assertTrue(!SuperBlockSolve.supports(multicut));
    SunderException e = assertThrows(SunderException.class,
        () -> SuperBlockSolve.requireFits(multicut, 500, 100));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("fragments-multicut")
        && e.getMessage().contains("solve.maxDriverEdges = 100"), e.getMessage());
  }
}
