package org.sunder.stitching;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.stitching.solve.ReducedGraphTest;
import org.sunder.stitching.task.SeamExtraction;

/**
 * The seam statistics of all faces together are exactly the whole volume's edges between
 * voxels of different block cores, each once: a direct count on the whole volume, against the
 * sum over every face of what {@link SeamExtraction} gives from that face's slab alone. Offsets
 * include diagonals, so that an edge between blocks that differ along two or three axes (which
 * more than one face's slab holds) must still land on exactly one face. In half the trials the
 * edges with an end in one plane are left out on both sides (as a defective section's are).
 */
class SeamSumTest {

  @Test
  void seamsOfAllFacesSumToTheWholeVolumeCountOfEdgesBetweenCores() {
    Random random = new Random(13);
    long multiAxis = 0;
    for (int trial = 0; trial < 10; trial++) {
      int[] shape = {12 + random.nextInt(9), 9 + random.nextInt(7), 6 + random.nextInt(6)};
      Offsets offsets = Offsets.of(trial % 2 == 0 ? SceneStore.offsets()
          : new int[][] {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {3, -2, 0}, {-2, 3, 2}, {1, 1, 1}});
      Subsampling subsampling = trial % 3 == 0 ? Subsampling.hash(0.5, trial) : Subsampling.none();
      WeightRule rule = WeightRule.byValue(WeightRule.Transform.LOGIT, null);
      int[] chunk = {2 + random.nextInt(2), 2 + random.nextInt(2), 1 + random.nextInt(2)};
      int[] blockShape = {chunk[0] * (1 + random.nextInt(3)), chunk[1] * (1 + random.nextInt(3)),
          chunk[2] * (1 + random.nextInt(3))};
      BlockGrid grid = BlockGrid.of(new long[] {shape[0], shape[1], shape[2]}, chunk,
          blockShape, new int[3]);
      int n = shape[0] * shape[1] * shape[2];
      float[] affinities = new float[n * offsets.count()];
      for (int i = 0; i < affinities.length; i++) {
        affinities[i] = random.nextFloat();
      }
      long[] labels = new long[n];
      for (int i = 0; i < n; i++) {
        labels[i] = random.nextInt(10) == 0 ? 0 : 1 + random.nextInt(6);  // 0: ignored voxels
      }

      // odd trials leave out the edges of one plane's voxels, as a defective section's
      long[] ignored = new long[n];
      int ignoredPlane = trial % 2 == 1 ? random.nextInt(shape[2]) : -1;
      for (int i = 0; i < n; i++) {
        ignored[i] = i / (shape[0] * shape[1]) == ignoredPlane ? 1 : 0;
      }
      int[] blockOf = new int[n];
      for (int i = 0; i < n; i++) {
        long[] p = {i % shape[0], (i / shape[0]) % shape[1], i / (shape[0] * shape[1])};
        blockOf[i] = grid.blockIndexOfVoxel(p);
      }
      AffinityBlock whole = AffinityBlock.ofFloats(affinities, shape, new long[3], offsets, null);
      EdgeStatistics.Accumulator direct = new EdgeStatistics.Accumulator(64);
      long[] crossingAxes = new long[1];
      GridGraph.of(whole, rule, subsampling).forEachEdge((s, t, k, w) -> {
        if (blockOf[s] != blockOf[t] && labels[s] != 0 && labels[t] != 0
            && labels[s] != labels[t] && ignored[s] == 0 && ignored[t] == 0) {
          direct.add(labels[s], labels[t], w);
          long[] ps = grid.gridPosition(blockOf[s]);
          long[] pt = grid.gridPosition(blockOf[t]);
          int axes = 0;
          for (int d = 0; d < 3; d++) {
            axes += ps[d] != pt[d] ? 1 : 0;
          }
          crossingAxes[0] += axes > 1 ? 1 : 0;
        }
      });
      multiAxis += crossingAxes[0];

      List<EdgeStatistics> seams = new ArrayList<>();
      for (Face face : grid.faces()) {
        SeamExtraction.Box slab = SeamExtraction.slab(grid, face, offsets);
        AffinityBlock slabAffinities = ReducedGraphTest.crop(affinities, shape, offsets,
            slab.min(), slab.max());
        long[] slabLabels = ReducedGraphTest.cut(labels, shape, slab.min(), slab.max());
        long[] slabIgnored = ReducedGraphTest.cut(ignored, shape, slab.min(), slab.max());
        byte[] flags = new byte[slabIgnored.length];
        for (int i = 0; i < flags.length; i++) {
          flags[i] = (byte) slabIgnored[i];
        }
        seams.add(SeamExtraction.extract(grid, face, slabLabels, null,
            ignoredPlane >= 0 ? flags : null, GridGraph.of(slabAffinities, rule, subsampling))
            .edges());
      }
      EdgeStatistics summed = EdgeStatistics.mergeAll(seams);
      EdgeStatistics want = direct.build();
      assertEquals(want.size(), summed.size(), grid.toString());
      for (int e = 0; e < want.size(); e++) {
        String where = grid + ", pair (" + want.u(e) + ", " + want.v(e) + ")";
        assertEquals(want.u(e), summed.u(e), where);
        assertEquals(want.v(e), summed.v(e), where);
        assertEquals(want.count(e), summed.count(e), where);
        // the seams add unrounded logits (PairSums), the reference the rule's float weights
        assertEquals(want.sum(e), summed.sum(e), 1e-6 * want.count(e), where);
        assertEquals(want.min(e), summed.min(e), where);
        assertEquals(want.max(e), summed.max(e), where);
      }
    }
    assertTrue(multiAxis > 100, "edges between blocks differing along two or more axes: "
        + multiAxis);
  }
}
