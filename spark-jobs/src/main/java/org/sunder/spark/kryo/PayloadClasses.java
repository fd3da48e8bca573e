package org.sunder.spark.kryo;

import java.util.List;

/**
 * The classes Sunder's stages send through Spark, in a fixed order (Kryo numbers registered
 * classes by registration order, so driver and executors must agree on it; new classes go at
 * the end so that recorded task results keep their numbers).
 */
public final class PayloadClasses {
  private PayloadClasses() {}

  /**
   * Payload classes that Kryo writes with Java serialisation: values of many nested types (grid,
   * offsets, partition method) sent once per run, where a compact encoding gains nothing.
   */
  public static final java.util.Set<Class<?>> JAVA_SERIALIZED =
      java.util.Set.of(org.sunder.stitching.setup.StitchingSetup.class);

  /** Every payload class, including the arrays they hold. */
  public static final List<Class<?>> ALL = List.of(
      int[].class, long[].class, double[].class, float[].class, byte[].class, boolean[].class,
      int[][].class, long[][].class, String[].class, Object[].class,
      java.util.ArrayList.class, java.util.BitSet.class,
      org.sunder.spark.run.RunSettings.class, org.sunder.stitching.setup.StitchingSetup.class,
      org.sunder.spark.run.BlockShapeOrigin.class, org.sunder.spark.run.TaskBudget.class,
      org.sunder.blockwise.grid.BlockShapeChoice.Limit.class,
      org.sunder.blockwise.graph.EdgeStatistics.class,
      org.sunder.blockwise.grid.IdLayout.class,
      org.sunder.blockwise.metrics.ContingencyTable.Pairs.class,
      org.sunder.stitching.task.BlockSummary.class,
      org.sunder.stitching.task.SeamEdges.class,
      org.sunder.stitching.solve.FinalIdMap.class,
      org.sunder.stitching.solve.SolveReport.class,
      org.sunder.stitching.solve.GlobalSolve.Result.class,
      org.sunder.blockwise.metrics.SeamPlanes.class,
      org.sunder.blockwise.metrics.SeamTally.class,
      org.sunder.stitching.task.BlockSummaryFile.Stored.class,
      org.sunder.stitching.task.SeamEdgesFile.Stored.class,
      org.sunder.stitching.solve.LevelTasks.PartRecord.class,
      org.sunder.stitching.solve.LevelTasks.DriverRecord.class,
      org.sunder.stitching.solve.LevelTasks.DownRecord.class,
      org.sunder.stitching.solve.LevelTasks.IdsRecord.class);
}
