package org.sunder.spark.stage;

import org.sunder.spark.workdir.Stage;
import java.util.Iterator;
import java.util.List;
import org.apache.spark.api.java.function.FlatMapFunction;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.BlockSummary;
import org.sunder.stitching.SeamEdges;

/**
 * Counts, on the executors, the edges the reduced graph would gather on the driver: the inner
 * edges of every block summary plus the seam edges of every face (an upper bound on the reduced
 * graph's pairs). Lets the driver check its bound before it loads anything.
 */
final class RecordSizes implements FlatMapFunction<Iterator<Integer>, Long> {
  private static final long serialVersionUID = 1L;

  private final String workDir;
  private final int blockCount;
  private final PayloadCodec codec = new PayloadCodec();

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
        BlockSummary summary = codec.decode(work.ledger(Stage.PARTITION).read(i),
            BlockSummary.class, "partition record " + i);
        edges += summary.innerEdges().size() + summary.interiorEdges().size();
      } else {
        int face = i - blockCount;
        edges += codec.decode(work.ledger(Stage.SEAMS).read(face), SeamEdges.class,
            "seams record " + face).edges().size();
      }
    }
    return List.of(edges).iterator();
  }
}
