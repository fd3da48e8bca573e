package org.sunder.spark.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class RunPlanTest {
  private static final long MIB = 1L << 20;

  @Test
  void warnsWhenTheTasksOfOneExecutorNeedMoreThanItsMemory() {
    assertTrue(RunPlan.memoryWarning(500 * MIB, 2, 1024 * MIB).isEmpty());
    String warning = RunPlan.memoryWarning(600 * MIB, 2, 1024 * MIB).orElseThrow();
    assertTrue(warning.contains("2 partition tasks at once on one executor: about 1.2 GiB, more than its 1.0 GiB"), warning);
    assertTrue(warning.contains("blocks.shape"), warning);
    assertTrue(RunPlan.memoryWarning(2048 * MIB, 1, 1024 * MIB).orElseThrow()
        .contains("1 partition task at once"));
  }

  @Test
  void taskRecordsCountEveryStagesTasks() {
    // 8 blocks, 12 faces: partition 8 + seams 12 + solve 1 + relabel 8 + evaluate 8 + pyramid 3.
    assertEquals(40, RunPlan.taskRecords(8, 12, true, 3));
    assertEquals(29, RunPlan.taskRecords(8, 12, false, 0));
  }
}
