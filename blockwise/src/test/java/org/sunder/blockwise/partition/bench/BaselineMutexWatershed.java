package org.sunder.blockwise.partition.bench;

import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.mutex.MutexWatershed;

/**
 * Baseline for {@link PartitionBenchmark}: the Mutex Watershed through the explicit path, i.e. a
 * CSR copy of the grid's edges ({@link GridGraph#toSignedGraph()}, double weights) sorted by the
 * stable 64-bit key radix sort. Same partition as the implicit grid path; shows what the
 * implicit edges and the packed in-place sort save.
 */
final class BaselineMutexWatershed {
  private BaselineMutexWatershed() {}

  static Segmentation partition(GridGraph grid) {
    return Segmentation.fromClusters(MutexWatershed.partition(grid.toSignedGraph()).clusterOf(),
        grid.block().maskOrNull());
  }
}
