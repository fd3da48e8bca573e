package org.sunder.spark.stage;

import java.util.List;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.spark.run.RunSettings;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.setup.EvaluationTarget;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.BlockIdMap;
import org.sunder.stitching.solve.RelabelTask;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.BlockSummaryFile;
import org.sunder.stitching.task.EvaluateTask;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamEdgesFile;
import org.sunder.stitching.task.SeamTask;

/** The task bodies of the distributed stages: thin calls into the stitching task functions. */
final class StageBodies {
  private StageBodies() {}

  /**
   * Partition: block index -> provisional ids written, the block summary written to the work
   * dir ({@link StageFiles#summaryFile}), its figures and checksum returned.
   */
  static final class Partition implements TaskBody {
    private static final long serialVersionUID = 1L;

    @Override
    public Object run(RunSettings settings, int block) {
      BlockSummary summary = PartitionTask.run(settings.setup(), block);
      return BlockSummaryFile.write(
          StageFiles.summaryFile(new WorkDir(settings.workDirPath()), block), summary);
    }
  }

  /**
   * Seams: face index -> the face's seam edges written to the work dir
   * ({@link StageFiles#seamFile}), their figures and checksum returned.
   */
  static final class Seams implements TaskBody {
    private static final long serialVersionUID = 1L;

    @Override
    public Object run(RunSettings settings, int face) {
      SeamEdges seams = SeamTask.run(settings.setup(), face);
      return SeamEdgesFile.write(StageFiles.seamFile(new WorkDir(settings.workDirPath()), face),
          seams);
    }
  }

  /**
   * Relabel: every chunk of one block's core rewritten with final ids, from that block's map
   * alone ({@link StageFiles#blockMap}: its segment count and its share of the solve's
   * numbering); returns voxels changed.
   */
  static final class Relabel implements TaskBody {
    private static final long serialVersionUID = 1L;

    @Override
    public Object run(RunSettings settings, int block) {
      StitchingSetup setup = settings.setup();
      BlockIdMap ids = StageFiles.blockMap(new WorkDir(settings.workDirPath()), setup.idLayout(),
          block);
      long changed = 0;
      List<long[]> chunks = setup.grid().chunkPositionsOf(block);
      for (long[] chunk : chunks) {
        changed += RelabelTask.run(setup, chunk, ids);
      }
      return changed;
    }
  }

  /** Evaluate: the contingency table of one block's core. */
  static final class Evaluate implements TaskBody {
    private static final long serialVersionUID = 1L;

    @Override
    public Object run(RunSettings settings, int block) {
      BlockGrid grid = settings.grid();
      Block b = grid.block(block);
      return EvaluateTask.count(target(settings), b.coreMin(), b.coreMax());
    }
  }

  static EvaluationTarget target(RunSettings s) {
    return new EvaluationTarget(s.outputContainer(), s.outputDataset(), s.truthContainer(),
        s.groundTruth(), s.mask().isPresent() ? s.inputContainer() : null, s.mask().orElse(null),
        s.ignoreBackground());
  }
}
