package org.sunder.spark.kryo;

import java.util.List;
import java.util.stream.Stream;
import org.sunder.stitching.TaskPayloads;

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

  /**
   * Every payload class, including the arrays they hold: the run's own classes, then the
   * stitching tasks' results ({@link TaskPayloads#CLASSES}, where new task result classes go).
   */
  public static final List<Class<?>> ALL = Stream.concat(Stream.of(
      int[].class, long[].class, double[].class, float[].class, byte[].class, boolean[].class,
      int[][].class, long[][].class, String[].class, Object[].class,
      java.util.ArrayList.class, java.util.BitSet.class,
      org.sunder.spark.run.RunSettings.class, org.sunder.stitching.setup.StitchingSetup.class,
      org.sunder.spark.run.BlockShapeOrigin.class, org.sunder.spark.run.TaskBudget.class,
      org.sunder.blockwise.grid.BlockShapeChoice.Limit.class),
      TaskPayloads.CLASSES.stream()).toList();
}
