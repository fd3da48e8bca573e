package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.RegionGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.SettledPartition;
import org.sunder.stitching.SceneStore;
import org.sunder.stitching.TissueScene;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.BoxIndex;
import org.sunder.stitching.task.CoreSegments;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamExtraction;

/**
 * The central bookkeeping property: inner edges of all blocks plus seam edges of all faces are
 * exactly the whole volume's region graph of the provisional labels, restricted to pairs of
 * boundary segments, and every pair across cores is between boundary segments. So no voxel edge
 * is counted twice or lost, diagonal long-range offsets and subsampling included.
 */
public class ReducedGraphTest {

  @Test
  void innerAndSeamEdgesAreTheWholeRegionGraphOfBoundarySegments() {
    Random random = new Random(13);
    for (int trial = 0; trial < 12; trial++) {
      int[] shape = {14 + random.nextInt(10), 11 + random.nextInt(8), 7 + random.nextInt(6)};
      int[][] vectors = trial % 2 == 0 ? SceneStore.offsets()
          : new int[][] {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {4, -1, 0}, {-2, 3, 2}};
      Offsets offsets = Offsets.of(vectors);
      Subsampling subsampling = trial % 3 == 0 ? Subsampling.none()
          : trial % 3 == 1 ? Subsampling.hash(0.4, trial) : Subsampling.stride(2, 1, 2);
      WeightRule rule = WeightRule.byValue(WeightRule.Transform.LOGIT, null);
      int[] chunk = {2 + random.nextInt(3), 2 + random.nextInt(3), 1 + random.nextInt(3)};
      int[] blockShape = {chunk[0] * (2 + random.nextInt(2)), chunk[1] * (1 + random.nextInt(3)),
          chunk[2] * (1 + random.nextInt(3))};
      int[] halo = {random.nextInt(4), random.nextInt(4), random.nextInt(3)};
      BlockGrid grid = BlockGrid.of(new long[] {shape[0], shape[1], shape[2]}, chunk,
          blockShape, halo);
      check(grid, shape, offsets, rule, subsampling, random);
    }
    assertTrue(continuedPairs > 100, "continued voxel pairs seen: " + continuedPairs);
  }

  /**
   * The continued pairs of a face straight from the definition: voxel pairs across it that
   * both blocks' partitions of their extended boxes put in one piece, counted per pair of
   * provisional ids.
   */
  private static EdgeStatistics continuedByDefinition(BlockGrid grid, Face face,
      int[][] pieceLabels, long[] provisional, int[] shape) {
    Block lower = grid.block(face.lowerBlock());
    Block upper = grid.block(face.upperBlock());
    long[] min = face.lateralMin();
    long[] max = face.lateralMax();
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(16);
    for (long z = min[2]; z <= max[2]; z++) {
      for (long y = min[1]; y <= max[1]; y++) {
        for (long x = min[0]; x <= max[0]; x++) {
          long[] q = {x, y, z};
          long[] p = q.clone();
          p[face.axis()]--;
          int lp = extendedIndex(lower, p);
          int lq = extendedIndex(lower, q);
          int up = extendedIndex(upper, p);
          int uq = extendedIndex(upper, q);
          if (lq < 0 || up < 0) {
            continue;
          }
          int[] a = pieceLabels[lower.index()];
          int[] b = pieceLabels[upper.index()];
          if (a[lp] != 0 && a[lp] == a[lq] && b[up] != 0 && b[up] == b[uq]) {
            acc.add(provisional[(int) (p[0] + shape[0] * (p[1] + (long) shape[1] * p[2]))],
                provisional[(int) (q[0] + shape[0] * (q[1] + (long) shape[1] * q[2]))], 1);
          }
        }
      }
    }
    return acc.build();
  }

  private static int extendedIndex(Block block, long[] global) {
    long[] min = block.extendedMin();
    long[] max = block.extendedMax();
    int[] extent = block.extendedShape();
    for (int d = 0; d < 3; d++) {
      if (global[d] < min[d] || global[d] > max[d]) {
        return -1;
      }
    }
    return (int) ((global[0] - min[0])
        + extent[0] * ((global[1] - min[1]) + (long) extent[1] * (global[2] - min[2])));
  }

  /** Continued voxel pairs seen over all trials, so that the comparison is not vacuous. */
  private long continuedPairs;

  private void check(BlockGrid grid, int[] shape, Offsets offsets, WeightRule rule,
      Subsampling subsampling, Random random) {
    int n = shape[0] * shape[1] * shape[2];
    float[] affinities = new float[n * offsets.count()];
    for (int i = 0; i < affinities.length; i++) {
      affinities[i] = random.nextFloat();
    }
    IdLayout layout = IdLayout.forGrid(grid);
    long[] provisional = new long[n];
    long[] continuations = new long[n];
    int[][] pieceLabels = new int[grid.blockCount()][];
    List<BlockSummary> summaries = new ArrayList<>();
    for (Block block : grid.blocks()) {
      AffinityBlock ext = crop(affinities, shape, offsets, block.extendedMin(),
          block.extendedMax());
      Segmentation segmentation = blobs(ext, block.index());
      // some pieces unsettled: they enter the solve wherever they lie
      boolean[] unsettled = new boolean[segmentation.segmentCount() + 1];
      for (int label = 1; label < unsettled.length; label++) {
        unsettled[label] = random.nextInt(4) == 0;
      }
      CoreSegments.Result result = CoreSegments.of(grid, layout, block, offsets,
          new SettledPartition(segmentation, unsettled), GridGraph.of(ext, rule, subsampling),
          1, true);
      paste(result.provisionalLabels(), block.coreMin(), block.coreShape(), provisional, shape);
      long[] flags = new long[result.continuations().length];
      for (int i = 0; i < flags.length; i++) {
        flags[i] = result.continuations()[i];
      }
      paste(flags, block.coreMin(), block.coreShape(), continuations, shape);
      pieceLabels[block.index()] = segmentation.labels();
      summaries.add(result.summary());
    }
    List<EdgeStatistics> parts = new ArrayList<>();
    for (BlockSummary s : summaries) {
      parts.add(s.innerEdges());
    }
    for (Face face : grid.faces()) {
      SeamExtraction.Box slab = SeamExtraction.slab(grid, face, offsets);
      AffinityBlock slabAffinities = crop(affinities, shape, offsets, slab.min(), slab.max());
      long[] slabLabels = cut(provisional, shape, slab.min(), slab.max());
      long[] slabFlags = cut(continuations, shape, slab.min(), slab.max());
      byte[] flags = new byte[slabFlags.length];
      for (int i = 0; i < flags.length; i++) {
        flags[i] = (byte) slabFlags[i];
      }
      SeamEdges seam = SeamExtraction.extract(grid, face, slabLabels, flags, null,
          GridGraph.of(slabAffinities, rule, subsampling));
      parts.add(seam.edges());
      EdgeStatistics continued = continuedByDefinition(grid, face, pieceLabels, provisional,
          shape);
      assertEquals(continued, seam.continued(), face.toString());
      continuedPairs += continued.edgeCount();
    }
    EdgeStatistics assembled = EdgeStatistics.mergeAll(parts);

    AffinityBlock whole = AffinityBlock.ofFloats(affinities, shape, new long[3], offsets, null);
    EdgeStatistics all = RegionGraph.of(provisional, GridGraph.of(whole, rule, subsampling))
        .statistics();
    long[] boundary = boundaryIds(layout, summaries);
    EdgeStatistics.Accumulator expected = new EdgeStatistics.Accumulator(16);
    for (int e = 0; e < all.size(); e++) {
      boolean u = Arrays.binarySearch(boundary, all.u(e)) >= 0;
      boolean v = Arrays.binarySearch(boundary, all.v(e)) >= 0;
      boolean crossing = layout.blockOf(all.u(e)) != layout.blockOf(all.v(e));
      if (crossing) {
        assertTrue(u && v, "a pair across cores involves a segment not marked as boundary");
      }
      if (u && v) {
        expected.add(all.u(e), all.v(e), all.sum(e), all.count(e), all.min(e), all.max(e));
      }
    }
    EdgeStatistics want = expected.build();
    assertEquals(want.size(), assembled.size(), grid.toString());
    for (int e = 0; e < want.size(); e++) {
      assertEquals(want.u(e), assembled.u(e));
      assertEquals(want.v(e), assembled.v(e));
      assertEquals(want.count(e), assembled.count(e));
      // summed alike in blocks, seams and the whole volume: equal up to the last bits
      assertEquals(want.sum(e), assembled.sum(e), 1e-12 * want.count(e));
      assertEquals(want.min(e), assembled.min(e));
      assertEquals(want.max(e), assembled.max(e));
    }
    ReducedGraph graph = ReducedGraph.assemble(layout, summaries, List.of());
    assertEquals(boundary.length, graph.nodeCount());
    // each node's first voxel: the smallest volume index holding its provisional id
    java.util.Map<Long, Long> first = new java.util.HashMap<>();
    for (int i = n - 1; i >= 0; i--) {
      first.put(provisional[i], (long) i);
    }
    long[] firstVoxels = ReducedGraph.firstVoxels(summaries);
    for (int node = 0; node < graph.nodeCount(); node++) {
      assertEquals(first.get(graph.nodeIds()[node]), firstVoxels[node], grid.toString());
    }
  }

  @Test
  void joinedGraphNumbersGroupsByTheirSmallestRankAndKeepsEveryPairBetweenThem() {
    Random random = new Random(41);
    for (int trial = 0; trial < 50; trial++) {
      int n = 2 + random.nextInt(30);
      long[] ids = new long[n];
      for (int i = 0; i < n; i++) {
        ids[i] = 100 + 3L * i;
      }
      EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(16);
      for (int e = 0; e < 3 * n; e++) {
        int a = random.nextInt(n);
        int b = random.nextInt(n);
        if (a != b) {
          acc.add(a, b, random.nextGaussian(), 1 + random.nextInt(4), -1, 1);
        }
      }
      ReducedGraph graph = new ReducedGraph(ids, acc.build(), new int[] {0}, new int[] {1});
      int[] group = new int[n];
      for (int i = 0; i < n; i++) {
        int other = random.nextInt(i + 1);
        group[i] = random.nextInt(3) == 0 ? group[other] : i;
      }
      long[] rank = random.longs(n, 0, 1_000_000).distinct().toArray();
      if (rank.length < n) {
        continue;
      }
      ReducedGraph.Joined joined = graph.joined(group, rank);
      long[] smallest = new long[n];
      Arrays.fill(smallest, Long.MAX_VALUE);
      for (int i = 0; i < n; i++) {
        smallest[group[i]] = Math.min(smallest[group[i]], rank[i]);
      }
      long[] nodes = joined.graph().nodeIds();
      for (int i = 0; i < n; i++) {
        assertEquals(smallest[group[i]], nodes[joined.nodeOf()[i]]);
      }
      for (int k = 1; k < nodes.length; k++) {
        assertTrue(nodes[k - 1] < nodes[k], "ascending ranks");
      }
      EdgeStatistics.Accumulator want = new EdgeStatistics.Accumulator(16);
      EdgeStatistics edges = graph.edges();
      for (int e = 0; e < edges.size(); e++) {
        int a = joined.nodeOf()[(int) edges.u(e)];
        int b = joined.nodeOf()[(int) edges.v(e)];
        if (a != b) {
          want.add(a, b, edges.sum(e), edges.count(e), edges.min(e), edges.max(e));
        }
      }
      EdgeStatistics expected = want.build();
      EdgeStatistics actual = joined.graph().edges();
      assertEquals(expected.size(), actual.size());
      for (int e = 0; e < expected.size(); e++) {
        assertEquals(expected.u(e), actual.u(e));
        assertEquals(expected.v(e), actual.v(e));
        assertEquals(expected.count(e), actual.count(e));
        assertEquals(expected.sum(e), actual.sum(e), 1e-9);
      }
      assertEquals(0, joined.graph().separatedU().length);
    }
  }

  private static long[] boundaryIds(IdLayout layout, List<BlockSummary> summaries) {
    List<Long> ids = new ArrayList<>();
    for (BlockSummary s : summaries) {
      for (int local : s.boundaryLocalIds()) {
        ids.add(layout.provisional(s.block(), local));
      }
    }
    return ids.stream().mapToLong(Long::longValue).sorted().toArray();
  }

  /** Irregular segments: slabs of varying thickness, shifted per block so blocks disagree. */
  private static Segmentation blobs(AffinityBlock block, int blockIndex) {
    int[] shape = block.shape();
    long[] min = block.globalMin();
    int[] labels = new int[block.voxelCount()];
    int[] p = new int[3];
    int max = 0;
    for (int i = 0; i < labels.length; i++) {
      TissueScene.position(i, shape, p);
      long x = min[0] + p[0];
      long y = min[1] + p[1];
      long z = min[2] + p[2];
      labels[i] = 1 + (int) ((x / 3 + 5 * (y / 4) + 7 * ((z + blockIndex) / 3)) % 9);
      max = Math.max(max, labels[i]);
    }
    return new Segmentation(labels, max);
  }

  public static AffinityBlock crop(float[] affinities, int[] shape, Offsets offsets, long[] min,
      long[] max) {
    int[] sub = BoxIndex.shape(min, max);
    int[] index = Shapes.subBoxIndices(shape, BoxIndex.origin(new long[3], min), sub);
    int n = shape[0] * shape[1] * shape[2];
    float[] out = new float[index.length * offsets.count()];
    for (int k = 0; k < offsets.count(); k++) {
      for (int i = 0; i < index.length; i++) {
        out[i + k * index.length] = affinities[index[i] + k * n];
      }
    }
    return AffinityBlock.ofFloats(out, sub, min, offsets, null);
  }

  public static long[] cut(long[] labels, int[] shape, long[] min, long[] max) {
    int[] index = Shapes.subBoxIndices(shape, BoxIndex.origin(new long[3], min),
        BoxIndex.shape(min, max));
    long[] out = new long[index.length];
    for (int i = 0; i < index.length; i++) {
      out[i] = labels[index[i]];
    }
    return out;
  }

  private static void paste(long[] core, long[] coreMin, int[] coreShape, long[] volume,
      int[] shape) {
    int[] index = Shapes.subBoxIndices(shape, BoxIndex.origin(new long[3], coreMin), coreShape);
    for (int i = 0; i < index.length; i++) {
      volume[index[i]] = core[i];
    }
  }
}
