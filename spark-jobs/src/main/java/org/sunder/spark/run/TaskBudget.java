package org.sunder.spark.run;

import java.io.Serializable;
import org.apache.spark.SparkConf;
import org.sunder.spark.config.ByteSize;
import org.sunder.spark.config.ConfigException;

/**
 * The cores and memory a run's tasks get, as far as the driver can know them before the run.
 *
 * <p>Rules: one executor's memory is {@code spark.executor.memory} when this process's Spark
 * configuration sets it (as {@code spark-submit --executor-memory} does), else this JVM's heap
 * (local mode runs the tasks here). Its cores are {@code spark.executor.cores}, else this
 * machine's processors. The run's cores are the cores given (plan's {@code --cores}), else
 * {@code spark.cores.max}, else {@code spark.executor.instances} x the executor's cores, else the
 * executor's cores. In local mode the cores given are also the executor's. The memory of one task is {@code blocks.memoryPerTask} when the
 * configuration sets it, else the executor's memory divided by its cores (as many tasks run at
 * once as it has cores).
 *
 * @param cores cores of the whole run (at least 1)
 * @param executorMemory bytes of one executor (or of this JVM's heap in local mode)
 * @param executorCores cores of one executor
 * @param memoryPerTask bytes one task may hold
 * @param memorySource where {@code memoryPerTask} comes from, for messages
 */
public record TaskBudget(int cores, long executorMemory, int executorCores, long memoryPerTask,
    String memorySource) implements Serializable {

  public TaskBudget {
    if (cores < 1 || executorCores < 1 || executorMemory < 1 || memoryPerTask < 1) {
      throw new IllegalArgumentException("cores " + cores + ", executor cores " + executorCores
          + ", executor memory " + executorMemory + ", memory per task " + memoryPerTask);
    }
  }

  /** The budget of a run started by this process with {@code conf}. */
  public static TaskBudget of(SparkConf conf, ByteSize configured) {
    return of(conf, 0, configured);
  }

  /**
   * The budget of a run on {@code cores} cores ({@code 0}: as {@code conf} and this machine say)
   * with {@code configured} memory per task ({@code null}: the default rule).
   */
  public static TaskBudget of(SparkConf conf, int cores, ByteSize configured) {
    boolean cluster = conf.contains("spark.executor.memory");
    long memory = cluster ? conf.getSizeAsBytes("spark.executor.memory")
        : Runtime.getRuntime().maxMemory();
    int executorCores = conf.getInt("spark.executor.cores",
        Runtime.getRuntime().availableProcessors());
    if (executorCores < 1) {
      throw new ConfigException("spark.executor.cores: expected at least 1, got " + executorCores);
    }
    int total = cores > 0 ? cores
        : conf.contains("spark.cores.max") ? conf.getInt("spark.cores.max", executorCores)
        : conf.contains("spark.executor.instances")
            ? conf.getInt("spark.executor.instances", 1) * executorCores : executorCores;
    total = Math.max(1, total);
    String executor = cluster ? "spark.executor.memory " + ByteSize.format(memory)
        : "this JVM's heap " + ByteSize.format(memory);
    if (configured != null) {
      return new TaskBudget(total, memory, executorCores, configured.bytes(),
          "blocks.memoryPerTask");
    }
    int perExecutor = cluster || cores <= 0 ? executorCores : cores;
    return new TaskBudget(total, memory, perExecutor, Math.max(1, memory / perExecutor),
        executor + " / " + perExecutor + (perExecutor == 1 ? " core" : " cores"));
  }

  /** Blocks the default shape keeps at least, so that every core has work: twice the cores. */
  public long minBlocks() {
    return 2L * cores;
  }
}
