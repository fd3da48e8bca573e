package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;
import java.util.stream.LongStream;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.ReducedGraphSolver;
import org.sunder.blockwise.partition.agglomeration.Agglomeration;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.FragmentsAgglomerationMethod;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.stitching.RandomReducedGraphs;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/** The solve on hand-made and random summaries, without any store. */
class GlobalSolveTest {
  private static final IdLayout LAYOUT = new IdLayout(10);
  private static final PartitionConfig MWS = PartitionConfig.mutexWatershed(null, null);
  private static final PartitionConfig MEAN =
      PartitionConfig.agglomeration(Linkage.MEAN, false, null, null);

  private static long id(int block, int local) {
    return LAYOUT.provisional(block, local);
  }

  private static EdgeStatistics edges(long[] u, long[] v, double... w) {
    return EdgeStatistics.ofEdges(u, v, w);
  }

  private static BlockSummary summary(int block, int segments, int[] boundary,
      EdgeStatistics inner, long[] separatedU, long[] separatedV) {
    long[] sizes = new long[segments];
    java.util.Arrays.fill(sizes, 10);
    int[] sides = new int[boundary.length];
    java.util.Arrays.fill(sides, 2);
    long[] firstVoxels = java.util.Arrays.stream(boundary).mapToLong(k -> id(block, k))
        .toArray();
    return new BlockSummary(block, sizes, boundary, sides, firstVoxels, inner, separatedU,
        separatedV, EdgeStatistics.empty());
  }

  @Test
  void joinsAcrossFacesAndNumbersFinalIdsConsecutively() {
    // Block 0: segments 1..3, boundary 2 and 3. Block 1: segments 1..2, boundary 1.
    BlockSummary b0 = summary(0, 3, new int[] {2, 3}, EdgeStatistics.empty(), new long[0],
        new long[0]);
    BlockSummary b1 = summary(1, 2, new int[] {1}, EdgeStatistics.empty(), new long[0],
        new long[0]);
    SeamEdges seam = new SeamEdges(0, edges(new long[] {id(0, 3), id(0, 2)},
        new long[] {id(1, 1), id(1, 1)}, 2.0, -1.0));
    GlobalSolve.Result result = GlobalSolve.solve(LAYOUT, 2, MEAN, List.of(b0, b1),
        List.of(seam));
    FinalIdMap map = result.finalIds();
    assertEquals(4, map.finalIdCount());
    assertEquals(1, map.apply(id(0, 1)));
    assertEquals(2, map.apply(id(0, 2)));
    assertEquals(3, map.apply(id(0, 3)));
    assertEquals(3, map.apply(id(1, 1)));
    assertEquals(4, map.apply(id(1, 2)));
    assertEquals(3, result.report().nodeCount());
    assertEquals(2, result.report().edgeCount());
    assertEquals(5, result.report().segmentCount());
  }

  /**
   * The trap the fragment methods fell into at faces: a face cuts objects A and B into halves,
   * and a single strongly attractive voxel edge joins A's lower half to B's upper half. Mean
   * linkage takes that pair first (13.8 against 6) and then cannot join the true halves. With
   * the halves reported as continued (both blocks saw one fragment run through enough voxel
   * pairs), the solve joins them first and separates A from B; with too few continued pairs it
   * does not join them.
   */
  @Test
  void continuedPiecesAreJoinedBeforeTheAgglomerationContinues() {
    PartitionConfig fragmentsMean = new PartitionConfig(
        new FragmentsAgglomerationMethod(), null, null, null, null, null, null, null);
    List<BlockSummary> blocks = new ArrayList<>();
    for (int b = 0; b < 2; b++) {
      EdgeStatistics inner = EdgeStatistics.of(new long[] {id(b, 1)}, new long[] {id(b, 2)},
          new double[] {-7000}, new long[] {1000}, new double[] {-13.8}, new double[] {1});
      blocks.add(summary(b, 2, new int[] {1, 2}, inner, new long[0], new long[0]));
    }
    EdgeStatistics across = EdgeStatistics.of(new long[] {id(0, 1), id(0, 2), id(0, 1)},
        new long[] {id(1, 1), id(1, 2), id(1, 2)}, new double[] {600, 600, 13.8},
        new long[] {100, 100, 1}, new double[] {1, 1, 13.8}, new double[] {13.8, 13.8, 13.8});
    for (long continued : new long[] {0, GlobalSolve.MIN_CONTINUED_PAIRS - 1,
        GlobalSolve.MIN_CONTINUED_PAIRS}) {
      EdgeStatistics halves = continued == 0 ? EdgeStatistics.empty()
          : EdgeStatistics.of(new long[] {id(0, 1), id(0, 2)}, new long[] {id(1, 1), id(1, 2)},
              new double[] {continued, continued}, new long[] {continued, continued},
              new double[] {1, 1}, new double[] {1, 1});
      FinalIdMap map = GlobalSolve.solve(LAYOUT, 2, fragmentsMean, blocks,
          List.of(new SeamEdges(0, across, halves))).finalIds();
      boolean joined = continued >= GlobalSolve.MIN_CONTINUED_PAIRS;
      assertEquals(joined, map.apply(id(0, 1)) == map.apply(id(1, 1)), "continued " + continued);
      assertEquals(joined, map.apply(id(0, 2)) == map.apply(id(1, 2)), "continued " + continued);
      assertEquals(!joined, map.apply(id(0, 1)) == map.apply(id(1, 2)), "continued " + continued);
      assertNotEquals(map.apply(id(0, 1)), map.apply(id(0, 2)));
    }
  }

  /**
   * Ties fall as in a one-block run: random fragment graphs whose weights take three values
   * (many equal means), each fragment cut into pieces with provisional ids in random order,
   * the pieces of a fragment continued into each other and each pair's statistics on one pair
   * of their pieces. Joined and ordered by first voxel, the mean-linkage solve gives the
   * partition of the agglomeration of the fragments themselves (numbered in first-voxel order,
   * as a one-block run numbers them); in provisional-id order it gives another on some graphs.
   */
  @Test
  void joinedPiecesAreSolvedInTheOrderOfTheirFirstVoxels() {
    Random random = new Random(8);
    Agglomeration oneBlock = new Agglomeration(Linkage.MEAN, false);
    ReducedGraphSolver solver = MEAN.createSolver();
    int differentInIdOrder = 0;
    for (int trial = 0; trial < 100; trial++) {
      int fragments = 4 + random.nextInt(20);
      EdgeStatistics.Accumulator whole = new EdgeStatistics.Accumulator(16);
      for (int e = 0; e < 3 * fragments; e++) {
        int a = random.nextInt(fragments);
        int b = random.nextInt(fragments);
        if (a != b) {
          double w = new double[] {-1, 1, 2}[random.nextInt(3)];
          whole.add(a, b, w, 1, w, w);
        }
      }
      EdgeStatistics fragmentGraph = whole.build();
      int[] want = RandomReducedGraphs.canonical(
          oneBlock.run(fragments, fragmentGraph).clustering().clusterOf());
      // pieces: fragment f has pieces firstPiece[f] .. firstPiece[f + 1] - 1, first voxels
      // ascending with f; nodes hold the pieces in a random order
      int[] firstPiece = new int[fragments + 1];
      for (int f = 0; f < fragments; f++) {
        firstPiece[f + 1] = firstPiece[f] + (f == 0 ? 2 : 1 + random.nextInt(3));
      }
      int pieces = firstPiece[fragments];
      List<Integer> order = new ArrayList<>();
      for (int p = 0; p < pieces; p++) {
        order.add(p);
      }
      Collections.shuffle(order, random);
      int[] nodeOfPiece = new int[pieces];
      long[] firstVoxels = new long[pieces];
      long[] ids = new long[pieces];
      for (int node = 0; node < pieces; node++) {
        nodeOfPiece[order.get(node)] = node;
        firstVoxels[node] = 1000L + 7L * order.get(node);
        ids[node] = 50L + node;
      }
      EdgeStatistics.Accumulator edges = new EdgeStatistics.Accumulator(16);
      for (int e = 0; e < fragmentGraph.size(); e++) {
        int a = (int) fragmentGraph.u(e);
        int b = (int) fragmentGraph.v(e);
        int pa = firstPiece[a] + random.nextInt(firstPiece[a + 1] - firstPiece[a]);
        int pb = firstPiece[b] + random.nextInt(firstPiece[b + 1] - firstPiece[b]);
        edges.add(nodeOfPiece[pa], nodeOfPiece[pb], fragmentGraph.sum(e),
            fragmentGraph.count(e), fragmentGraph.min(e), fragmentGraph.max(e));
      }
      EdgeStatistics.Accumulator continued = new EdgeStatistics.Accumulator(16);
      for (int f = 0; f < fragments; f++) {
        for (int p = firstPiece[f] + 1; p < firstPiece[f + 1]; p++) {
          continued.add(nodeOfPiece[p - 1], nodeOfPiece[p], 1);
        }
      }
      ReducedGraph graph = new ReducedGraph(ids, edges.build(), new int[0], new int[0],
          continued.build());
      int[] fragmentOfNode = new int[pieces];
      for (int f = 0; f < fragments; f++) {
        for (int p = firstPiece[f]; p < firstPiece[f + 1]; p++) {
          fragmentOfNode[nodeOfPiece[p]] = f;
        }
      }
      int[] got = GlobalSolve.clustersJoiningContinuations(graph, firstVoxels, solver);
      assertArrayEquals(want, RandomReducedGraphs.canonical(byFragment(got, fragmentOfNode,
          fragments)), "trial " + trial);
      int[] inIdOrder = GlobalSolve.clustersJoiningContinuations(graph,
          LongStream.range(0, pieces).toArray(), solver);
      differentInIdOrder += Arrays.equals(want, RandomReducedGraphs.canonical(
          byFragment(inIdOrder, fragmentOfNode, fragments))) ? 0 : 1;
    }
    assertTrue(differentInIdOrder > 5, "graphs whose ties fall otherwise in id order: "
        + differentInIdOrder);
  }

  /** Per fragment, the cluster of its pieces (all pieces of a fragment share one). */
  private static int[] byFragment(int[] clusterOfNode, int[] fragmentOfNode, int fragments) {
    int[] out = new int[fragments];
    for (int node = 0; node < clusterOfNode.length; node++) {
      out[fragmentOfNode[node]] = clusterOfNode[node];
    }
    return out;
  }

  @Test
  void mutexWatershedKeepsABlocksSeparationsWhileMeanLinkageMayUndoThem() {
    // Block 0 has boundary segments 1 and 2, separated inside the block by a repulsive edge
    // (weak inside the core), both strongly attracted to segment 1 of block 1.
    EdgeStatistics inner = edges(new long[] {id(0, 1)}, new long[] {id(0, 2)}, 0.5);
    BlockSummary b0 = summary(0, 2, new int[] {1, 2}, inner, new long[] {id(0, 1)},
        new long[] {id(0, 2)});
    BlockSummary b1 = summary(1, 1, new int[] {1}, EdgeStatistics.empty(), new long[0],
        new long[0]);
    SeamEdges seam = new SeamEdges(0, edges(new long[] {id(0, 1), id(0, 2)},
        new long[] {id(1, 1), id(1, 1)}, 0.9, 0.8));
    FinalIdMap mws = GlobalSolve.solve(LAYOUT, 2, MWS, List.of(b0, b1), List.of(seam))
        .finalIds();
    assertNotEquals(mws.apply(id(0, 1)), mws.apply(id(0, 2)));
    assertEquals(mws.apply(id(0, 1)), mws.apply(id(1, 1)));
    FinalIdMap mean = GlobalSolve.solve(LAYOUT, 2, MEAN, List.of(b0, b1), List.of(seam))
        .finalIds();
    assertEquals(mean.apply(id(0, 1)), mean.apply(id(0, 2)));
    assertEquals(2, mws.finalIdCount());
    assertEquals(1, mean.finalIdCount());
  }

  @Test
  void resultDoesNotDependOnTheOrderOfSummariesAndSeams() {
    Random random = new Random(13);
    int blocks = 6;
    List<BlockSummary> summaries = new ArrayList<>();
    List<SeamEdges> seams = new ArrayList<>();
    for (int b = 0; b < blocks; b++) {
      int segments = 3 + random.nextInt(5);
      int[] boundary = {1, 2, segments};
      summaries.add(summary(b, segments, boundary,
          edges(new long[] {id(b, 1)}, new long[] {id(b, 2)}, random.nextGaussian()),
          new long[0], new long[0]));
    }
    for (int f = 0; f < blocks - 1; f++) {
      int s = summaries.get(f + 1).segmentCount();
      seams.add(new SeamEdges(f, edges(
          new long[] {id(f, 1), id(f, 2), id(f, summaries.get(f).segmentCount())},
          new long[] {id(f + 1, 2), id(f + 1, 1), id(f + 1, s)},
          random.nextGaussian(), random.nextGaussian(), random.nextGaussian())));
    }
    for (PartitionConfig config : List.of(MWS, MEAN)) {
      FinalIdMap reference = GlobalSolve.solve(LAYOUT, blocks, config, summaries, seams)
          .finalIds();
      Set<Long> ids = new HashSet<>();
      for (int b = 0; b < blocks; b++) {
        for (int k = 1; k <= summaries.get(b).segmentCount(); k++) {
          ids.add(reference.apply(id(b, k)));
        }
      }
      assertEquals(reference.finalIdCount(), ids.size());
      assertTrue(ids.contains(1L) && ids.contains(reference.finalIdCount()));
      for (int trial = 0; trial < 5; trial++) {
        List<BlockSummary> s = new ArrayList<>(summaries);
        List<SeamEdges> e = new ArrayList<>(seams);
        Collections.shuffle(s, random);
        Collections.shuffle(e, random);
        assertEquals(reference, GlobalSolve.solve(LAYOUT, blocks, config, s, e).finalIds());
      }
    }
  }

  @Test
  void missingSummaryOrForeignIdIsReported() {
    BlockSummary b0 = summary(0, 2, new int[] {1}, EdgeStatistics.empty(), new long[0],
        new long[0]);
    SunderException missing = assertThrows(SunderException.class,
        () -> GlobalSolve.solve(LAYOUT, 2, MEAN, List.of(b0), List.of()));
    assertEquals(ErrorKind.INVALID_INPUT, missing.kind());
    assertTrue(missing.getMessage().contains("1 block summaries for 2 blocks"));
    BlockSummary b1 = summary(1, 2, new int[] {1}, EdgeStatistics.empty(), new long[0],
        new long[0]);
    SeamEdges foreign = new SeamEdges(0, edges(new long[] {id(0, 2)}, new long[] {id(1, 1)},
        1.0));
    SunderException e = assertThrows(SunderException.class,
        () -> GlobalSolve.solve(LAYOUT, 2, MEAN, List.of(b0, b1), List.of(foreign)));
    assertEquals(ErrorKind.INTERNAL, e.kind());
    assertTrue(e.getMessage().contains("local id 2"), e.getMessage());
  }
}
