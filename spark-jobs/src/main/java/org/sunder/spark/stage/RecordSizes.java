package org.sunder.spark.stage;

import java.util.Iterator;
import java.util.List;
import org.apache.spark.api.java.function.FlatMapFunction;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;

/**
 * Counts, on the executors, the edges the reduced graph would gather on the driver: the inner
 * edges of every block summary plus the seam edges of every face (an upper bound on the reduced
 * graph's pairs), from the tasks' small records. Lets the driver check its bound before it loads
 * anything.
 */
final class RecordSizes implements FlatMapFunction<Iterator<Integer>, Long> {
  private static final long serialVersionUID = 1L;

  private final String workDir;
  private final int blockCount;

  /** Task indices {@code < blockCount} are blocks (partition records), the rest faces. */
  RecordSizes(String workDir, int blockCount) {
    this.workDir = workDir;
    this.blockCount = blockCount;
  }

  @Override
  public Iterator<Long> call(Iterator<Integer> indices) {
    WorkDir work = new WorkDir(java.nio.file.Path.of(workDir));
    long edges = 0;
    while (indices.hasNext()) {
      int i = indices.next();
      if (i < blockCount) {
        edges += StageFiles.summaryRecord(work, i).pairs();
      } else {
        int face = i - blockCount;
        edges += StageFiles.seamRecord(work, face).edges();
      }
    }
    return List.of(edges).iterator();
  }
}
