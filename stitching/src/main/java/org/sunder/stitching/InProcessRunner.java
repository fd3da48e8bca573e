package org.sunder.stitching;

import java.util.ArrayList;
import java.util.List;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.BlockIdMap;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.RelabelTask;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

/**
 * Runs the stages of a blockwise run one after another in this thread: a loop over the tasks
 * of each stage, nothing more. Tests and benchmarks use it; the Spark jobs run the same task
 * functions on executors.
 */
public final class InProcessRunner {
  private InProcessRunner() {}

  /** Partition, seams, solve and relabel; returns the solve's result. */
  public static GlobalSolve.Result run(StitchingSetup setup) {
    setup.prepare();
    BlockGrid grid = setup.grid();
    List<BlockSummary> summaries = new ArrayList<>(grid.blockCount());
    for (int b = 0; b < grid.blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
    }
    List<SeamEdges> seams = new ArrayList<>(grid.faceCount());
    for (int f = 0; f < grid.faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
    }
    GlobalSolve.Result result = GlobalSolve.run(setup, summaries, seams);
    for (int b = 0; b < grid.blockCount(); b++) {
      BlockIdMap map = result.solved().blockMap(b);
      for (long[] chunk : grid.chunkPositionsOf(b)) {
        RelabelTask.run(setup, chunk, map);
      }
    }
    return result;
  }
}
