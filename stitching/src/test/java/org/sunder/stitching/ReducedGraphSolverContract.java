package org.sunder.stitching;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.ReducedGraph;

/**
 * The contract every {@link ReducedGraphSolver} keeps, run against each implementation by a
 * subclass: it returns a valid partition of the nodes (one cluster per node; a node without
 * edges alone; two nodes joined only by attractive voxel edges together, two with only
 * repulsive ones apart), it is deterministic (the same graph, the same clusters, also from a
 * second instance), and, where the method allows it, a blockwise run on exact affinities gives
 * the one-block result.
 */
abstract class ReducedGraphSolverContract {
  private static final long[] SHAPE = {64, 56, 20};
  private static final int[] CHUNK = {8, 8, 4};
  private static final int[] BLOCK = {32, 32, 12};
  private static final int[] HALO = {3, 3, 2};

  @TempDir
  Path dir;

  /** A new instance of the solver under test. */
  abstract ReducedGraphSolver solver();

  /**
   * The partition configuration whose global solve uses this solver and whose blockwise result
   * on exact affinities equals its one-block result; {@code null} when that does not hold for
   * the method (the subclass says why).
   */
  abstract PartitionConfig exactOneBlockConfig();

  @Test
  void everyNodeGetsOneClusterAndANodeWithoutEdgesStaysAlone() {
    Random random = new Random(13);
    for (int trial = 0; trial < 40; trial++) {
      ReducedGraph graph = randomGraph(random, 2 + random.nextInt(40));
      int[] clusters = solver().clusters(graph);
      assertEquals(graph.nodeCount(), clusters.length, "trial " + trial);
      boolean[] hasEdge = new boolean[graph.nodeCount()];
      for (int e = 0; e < graph.edges().size(); e++) {
        hasEdge[(int) graph.edges().u(e)] = true;
        hasEdge[(int) graph.edges().v(e)] = true;
      }
      for (int i = 0; i < clusters.length; i++) {
        for (int j = i + 1; j < clusters.length; j++) {
          if (!hasEdge[i] || !hasEdge[j]) {
            assertNotEquals(clusters[i], clusters[j], "trial " + trial + ": isolated node "
                + (hasEdge[i] ? j : i) + " joined another");
          }
        }
      }
    }
  }

  @Test
  void attractionJoinsAndRepulsionSeparatesTwoNodes() {
    ReducedGraph attract = twoNodes(new double[] {0.8, 1.5, 2.0});
    int[] joined = solver().clusters(attract);
    assertEquals(joined[0], joined[1], "only attractive voxel edges between them");
    ReducedGraph repel = twoNodes(new double[] {-0.8, -1.5, -2.0});
    int[] apart = solver().clusters(repel);
    assertNotEquals(apart[0], apart[1], "only repulsive voxel edges between them");
  }

  @Test
  void theSameGraphGivesTheSameClusters() {
    Random random = new Random(29);
    for (int trial = 0; trial < 20; trial++) {
      ReducedGraph graph = randomGraph(random, 5 + random.nextInt(60));
      int[] first = canonical(solver().clusters(graph));
      assertArrayEquals(first, canonical(solver().clusters(graph)), "trial " + trial);
      ReducedGraph copy = new ReducedGraph(graph.nodeIds().clone(), EdgeStatistics.of(
          graph.edges().copyU(), graph.edges().copyV(), graph.edges().copySum(),
          graph.edges().copyCount(), graph.edges().copyMin(), graph.edges().copyMax()),
          graph.separatedU().clone(), graph.separatedV().clone());
      assertArrayEquals(first, canonical(solver().clusters(copy)), "trial " + trial + " copy");
    }
  }

  /**
   * Exact affinities (an affinity is 1 exactly when both voxels carry the same non-zero label,
   * DESIGN "Synthetic data"): 8 blocks give the one-block result (variation of information 0),
   * the identity check of the design's decisions.
   */
  @Test
  void exactAffinitiesGiveTheOneBlockResult() {
    PartitionConfig config = exactOneBlockConfig();
    Assumptions.assumeTrue(config != null, "the one-block equality does not hold for "
        + solver().name());
    assertEquals(solver().getClass(), GlobalSolve.solverFor(config).getClass());
    TissueScene scene = TissueScene.small(12, SHAPE, Degradation.none());
    Path root = dir.resolve("exact");
    SceneStore.write(scene, root, StorageFormat.ZARR, CHUNK);
    StitchingSetup setup = SceneStore.setup(scene, root, CHUNK, BLOCK, HALO, config);
    assertEquals(8, setup.grid().blockCount());
    InProcessRunner.run(setup);
    Segmentation whole = SceneStore.wholeVolume(scene, config);
    long[] expected = new long[whole.labels().length];
    for (int i = 0; i < expected.length; i++) {
      expected[i] = whole.labels()[i];
    }
    BlockwiseRunTest.assertEqualUpToRenaming(expected, SceneStore.readLabels(setup));
  }

  /** Clusters renumbered by first appearance, so two equal partitions give equal arrays. */
  static int[] canonical(int[] clusters) {
    Map<Integer, Integer> first = new HashMap<>();
    int[] out = new int[clusters.length];
    for (int i = 0; i < clusters.length; i++) {
      out[i] = first.computeIfAbsent(clusters[i], c -> first.size());
    }
    return out;
  }

  private static ReducedGraph twoNodes(double[] voxelWeights) {
    long[] u = new long[voxelWeights.length];
    long[] v = new long[voxelWeights.length];
    java.util.Arrays.fill(v, 1);
    return new ReducedGraph(new long[] {10, 11}, EdgeStatistics.ofEdges(u, v, voxelWeights),
        new int[0], new int[0]);
  }

  /**
   * About {@code 1.5 n} random pairs among the first {@code n - 2} nodes (the last two have no
   * edges), each from 1 to 6 voxel edges with weights from a normal distribution around a
   * per-pair mean; a few pairs kept apart by their block.
   */
  static ReducedGraph randomGraph(Random random, int n) {
    int linked = Math.max(2, n - 2);
    int pairs = 3 * linked / 2;
    long[] u = new long[pairs * 6];
    long[] v = new long[pairs * 6];
    double[] w = new double[pairs * 6];
    int m = 0;
    for (int p = 0; p < pairs; p++) {
      int a = random.nextInt(linked);
      int b = random.nextInt(linked);
      if (a == b) {
        continue;
      }
      double mean = random.nextGaussian();
      int edges = 1 + random.nextInt(6);
      for (int k = 0; k < edges; k++) {
        u[m] = Math.min(a, b);
        v[m] = Math.max(a, b);
        w[m++] = mean + 0.5 * random.nextGaussian();
      }
    }
    EdgeStatistics stats = EdgeStatistics.ofEdges(java.util.Arrays.copyOf(u, m),
        java.util.Arrays.copyOf(v, m), java.util.Arrays.copyOf(w, m));
    int separated = random.nextInt(3);
    int[] su = new int[separated];
    int[] sv = new int[separated];
    for (int i = 0; i < separated; i++) {
      su[i] = random.nextInt(linked - 1);
      sv[i] = su[i] + 1 + random.nextInt(linked - 1 - su[i]);
    }
    long[] ids = new long[n];
    for (int i = 0; i < n; i++) {
      ids[i] = 100 + i;
    }
    return new ReducedGraph(ids, stats, su, sv);
  }
}
