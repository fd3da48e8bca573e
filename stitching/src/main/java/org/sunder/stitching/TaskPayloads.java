package org.sunder.stitching;

import java.util.List;

/**
 * The classes of the values stitching's tasks return (and the classes those hold), in a fixed
 * order: whoever ships them between processes registers them in this order, after its own, so
 * that recorded task results keep their numbers. New classes go at the end.
 */
public final class TaskPayloads {
  private TaskPayloads() {}

  /** Every class a task result is made of, in registration order. */
  public static final List<Class<?>> CLASSES = List.of(
      org.sunder.blockwise.graph.EdgeStatistics.class,
      org.sunder.blockwise.grid.IdLayout.class,
      org.sunder.stitching.task.BoxCounts.class,
      org.sunder.stitching.task.BlockSummary.class,
      org.sunder.stitching.task.SeamEdges.class,
      org.sunder.stitching.solve.FinalIdMap.class,
      org.sunder.stitching.solve.SolveReport.class,
      org.sunder.stitching.solve.GlobalSolve.Result.class,
      org.sunder.blockwise.metrics.SeamPlanes.class,
      org.sunder.blockwise.metrics.SeamTally.class,
      org.sunder.stitching.task.BlockSummaryFile.Stored.class,
      org.sunder.stitching.task.SeamEdgesFile.Stored.class,
      org.sunder.stitching.task.SeamAuditTally.class,
      org.sunder.stitching.solve.LevelTasks.PartRecord.class,
      org.sunder.stitching.solve.LevelTasks.DriverRecord.class,
      org.sunder.stitching.solve.LevelTasks.DownRecord.class,
      org.sunder.stitching.solve.LevelTasks.IdsRecord.class);
}
