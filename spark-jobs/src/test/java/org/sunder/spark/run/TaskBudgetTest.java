package org.sunder.spark.run;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.spark.SparkConf;
import org.junit.jupiter.api.Test;
import org.sunder.spark.config.ByteSize;

class TaskBudgetTest {
  @Test
  void aClusterTaskGetsTheExecutorMemoryDividedByItsCores() {
    SparkConf conf = new SparkConf(false).set("spark.executor.memory", "3g")
        .set("spark.executor.cores", "4").set("spark.cores.max", "64");
    TaskBudget budget = TaskBudget.of(conf, null);
    assertEquals(3L << 30, budget.executorMemory());
    assertEquals(768L << 20, budget.memoryPerTask());
    assertEquals(64, budget.cores());
    assertEquals(128, budget.minBlocks());
    assertTrue(budget.memorySource().contains("spark.executor.memory"), budget.memorySource());
    SparkConf instances = new SparkConf(false).set("spark.executor.memory", "16g")
        .set("spark.executor.cores", "4").set("spark.executor.instances", "16");
    assertEquals(64, TaskBudget.of(instances, null).cores());
  }

  @Test
  void inLocalModeTheHeapIsSharedByTheCoresGiven() {
    long heap = Runtime.getRuntime().maxMemory();
    TaskBudget three = TaskBudget.of(new SparkConf(false), 3, null);
    assertEquals(heap, three.executorMemory());
    assertEquals(heap / 3, three.memoryPerTask());
    assertEquals(3, three.cores());
    assertTrue(three.memorySource().contains("heap"), three.memorySource());
    TaskBudget machine = TaskBudget.of(new SparkConf(false), null);
    assertEquals(Runtime.getRuntime().availableProcessors(), machine.cores());
  }

  @Test
  void blocksMemoryPerTaskWins() {
    TaskBudget set = TaskBudget.of(new SparkConf(false), 2, ByteSize.parse("512m"));
    assertEquals(512L << 20, set.memoryPerTask());
    assertEquals("blocks.memoryPerTask", set.memorySource());
  }
}
