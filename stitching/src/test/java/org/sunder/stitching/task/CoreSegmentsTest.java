package org.sunder.stitching.task;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.blockwise.partition.SettledPartition;
import org.sunder.blockwise.partition.config.PartitionConfig;

/**
 * A block's summary from the statistics the fragment methods measure while partitioning equals
 * the summary from a second pass over the box's edges (the way every other method gets it), on
 * random cells with noisy affinities, every block of random grids, with and without the size
 * filter's interior edges.
 */
class CoreSegmentsTest {
  private static final int[][] OFFSETS = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {-4, 0, 0},
      {0, -4, 0}, {0, 0, -2}, {-3, 3, 0}};

  @Test
  void summaryFromMeasuredPieceEdgesEqualsTheOneFromASecondPass() {
    Random random = new Random(29);
    int compared = 0;
    int separated = 0;
    for (int trial = 0; trial < 6; trial++) {
      int[] shape = {18 + random.nextInt(10), 14 + random.nextInt(8), 8 + random.nextInt(6)};
      Offsets offsets = Offsets.of(OFFSETS);
      float[] affinities = noisyCells(shape, 6 + random.nextInt(10), random);
      int[] chunk = {3, 3, 2};
      int[] blockShape = {chunk[0] * (2 + random.nextInt(2)), chunk[1] * (2 + random.nextInt(2)),
          chunk[2] * (2 + random.nextInt(2))};
      int[] halo = offsets.reach().clone();  // wider than the reach: settled boundary pieces
      for (int d = 0; d < 3; d++) {
        halo[d] *= 2;
      }
      BlockGrid grid = BlockGrid.of(new long[] {shape[0], shape[1], shape[2]}, chunk, blockShape,
          halo);
      IdLayout layout = IdLayout.forGrid(grid);
      String method = trial % 2 == 0 ? "fragments-multicut" : "fragments-agglomeration";
      PartitionConfig config = PartitionConfig.fromJson("{\"method\": \"" + method + "\"}");
      for (int b = 0; b < grid.blockCount(); b++) {
        Block block = grid.block(b);
        AffinityBlock box = box(affinities, shape, offsets, block);
        byte[] open = CoreSegments.openVoxels(grid, block, offsets);
        SettledPartition measured =
            config.create().partitionSettled(box, open, CoreSegments.coreVoxels(block));
        assertNotNull(measured.edgesOrNull(), method + " measures its pieces' statistics");
        SettledPartition bare = new SettledPartition(measured.pieces(), measured.unsettled());
        GridGraph graph = GridGraph.of(box, config.weights(), config.subsampling());
        for (int filterBelow : new int[] {0, 1, 25}) {
          BlockSummary want = CoreSegments.of(grid, layout, block, offsets, bare, graph,
              filterBelow, true).summary();
          BlockSummary got = CoreSegments.of(grid, layout, block, offsets, measured, null,
              filterBelow, true).summary();
          String where = method + ", trial " + trial + ", block " + b + ", filter " + filterBelow;
          assertArrayEquals(want.segmentSizes(), got.segmentSizes(), where);
          assertArrayEquals(want.boundaryLocalIds(), got.boundaryLocalIds(), where);
          assertArrayEquals(want.separatedU(), got.separatedU(), where);
          assertArrayEquals(want.separatedV(), got.separatedV(), where);
          assertSameRows(want.innerEdges(), got.innerEdges(), where + ", inner");
          assertSameRows(want.interiorEdges(), got.interiorEdges(), where + ", interior");
          compared += want.innerEdges().size() + want.interiorEdges().size();
          separated += want.separatedU().length;
        }
      }
    }
    assertTrue(compared > 500, "too few rows compared: " + compared);
    assertTrue(separated > 20, "too few separated pairs compared: " + separated);
  }

  private static void assertSameRows(EdgeStatistics want, EdgeStatistics got, String where) {
    assertEquals(want.size(), got.size(), where);
    for (int e = 0; e < want.size(); e++) {
      assertEquals(want.u(e), got.u(e), where);
      assertEquals(want.v(e), got.v(e), where);
      assertEquals(want.count(e), got.count(e), where);
      assertEquals(want.min(e), got.min(e), where);
      assertEquals(want.max(e), got.max(e), where);
      // the second pass adds weights rounded to floats (2^-24 relative each); the fragments'
      // logit runs take the logarithm of the unrounded odds' product
      double rounding = want.count(e) * Math.ulp(1f) / 2
          * Math.max(Math.abs(want.min(e)), Math.abs(want.max(e)));
      assertEquals(want.sum(e), got.sum(e), 1e-9 * (1 + Math.abs(want.sum(e))) + rounding,
          where);
    }
  }

  /** Voronoi cells of random seeds: affinity 0.85 inside a cell, 0.15 across, plus noise. */
  private static float[] noisyCells(int[] shape, int cells, Random random) {
    int n = shape[0] * shape[1] * shape[2];
    int[][] seeds = new int[cells][3];
    for (int[] s : seeds) {
      for (int d = 0; d < 3; d++) {
        s[d] = random.nextInt(shape[d]);
      }
    }
    int[] cell = new int[n];
    for (int i = 0; i < n; i++) {
      int[] p = position(i, shape);
      int best = Integer.MAX_VALUE;
      for (int c = 0; c < cells; c++) {
        int dx = p[0] - seeds[c][0];
        int dy = p[1] - seeds[c][1];
        int dz = 2 * (p[2] - seeds[c][2]);
        int dist = dx * dx + dy * dy + dz * dz;
        if (dist < best) {
          best = dist;
          cell[i] = c;
        }
      }
    }
    float[] values = new float[n * OFFSETS.length];
    for (int k = 0; k < OFFSETS.length; k++) {
      for (int i = 0; i < n; i++) {
        int[] p = position(i, shape);
        int[] q = {p[0] + OFFSETS[k][0], p[1] + OFFSETS[k][1], p[2] + OFFSETS[k][2]};
        boolean inside = q[0] >= 0 && q[1] >= 0 && q[2] >= 0 && q[0] < shape[0]
            && q[1] < shape[1] && q[2] < shape[2];
        float base = !inside ? 0.5f
            : cell[i] == cell[q[0] + shape[0] * (q[1] + shape[1] * q[2])] ? 0.85f : 0.15f;
        values[k * n + i] = Math.min(1, Math.max(0, base + 0.3f * (random.nextFloat() - 0.5f)));
      }
    }
    return values;
  }

  /** The affinities of {@code block}'s extended box, cut from the volume's. */
  private static AffinityBlock box(float[] volume, int[] shape, Offsets offsets, Block block) {
    long[] min = block.extendedMin();
    int[] ext = block.extendedShape();
    int n = shape[0] * shape[1] * shape[2];
    int m = ext[0] * ext[1] * ext[2];
    float[] values = new float[m * offsets.count()];
    for (int k = 0; k < offsets.count(); k++) {
      for (int i = 0; i < m; i++) {
        int[] p = position(i, ext);
        int at = (int) (p[0] + min[0] + shape[0] * (p[1] + min[1] + shape[1] * (p[2] + min[2])));
        values[k * m + i] = volume[k * n + at];
      }
    }
    return AffinityBlock.ofFloats(values, ext, min, offsets, null);
  }

  private static int[] position(int i, int[] shape) {
    return new int[] {i % shape[0], i / shape[0] % shape[1], i / (shape[0] * shape[1])};
  }
}
