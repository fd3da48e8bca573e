package org.sunder.spark.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.spark.SparkConf;
import org.junit.jupiter.api.Test;

class RunPlanTest {
  private static final long MIB = 1L << 20;

  @Test
  void warnsWhenTheTasksOfOneExecutorNeedMoreThanItsMemory() {
    assertTrue(RunPlan.memoryWarning(500 * MIB, 2, 1024 * MIB).isEmpty());
    String warning = RunPlan.memoryWarning(600 * MIB, 2, 1024 * MIB).orElseThrow();
    assertTrue(warning.contains("2 partition tasks at once on one executor: about 1200.0 MiB"), warning);
    assertTrue(warning.contains("blocks.shape"), warning);
    assertTrue(RunPlan.memoryWarning(2048 * MIB, 1, 1024 * MIB).orElseThrow()
        .contains("1 partition task at once"));
  }

  @Test
  void executorMemoryComesFromTheSparkConfigurationElseTheHeap() {
    assertEquals(3L << 30, RunPlan.executorMemory(new SparkConf(false)
        .set("spark.executor.memory", "3g")));
    assertEquals(Runtime.getRuntime().maxMemory(), RunPlan.executorMemory(new SparkConf(false)));
  }
}
