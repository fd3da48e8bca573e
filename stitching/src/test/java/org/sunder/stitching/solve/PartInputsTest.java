package org.sunder.stitching.solve;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.RandomReducedGraphs;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.SeamEdges;

/**
 * A part's level-1 input built from its own blocks and nearby faces equals the whole reduced
 * graph's edges with an end in the part, bit for bit (weights and sums included), in each
 * solver's row format (the multicut's joined rows of continued pairs included), also when seam
 * pairs reach two blocks (offsets longer than a block).
 */
class PartInputsTest {

  private record Volume(List<BlockSummary> summaries, List<SeamEdges> seams) {}

  /**
   * Random blocks whose segments all touch a face; pairs inside blocks, separated pairs, and
   * seam pairs to the block above each face and to its diagonal neighbours (long-range
   * offsets), several voxel edges per pair so that sums have many terms.
   */
  private static Volume volume(BlockGrid grid, IdLayout layout, Random random, boolean far) {
    int blocks = grid.blockCount();
    int[] count = new int[blocks];
    List<BlockSummary> summaries = new ArrayList<>();
    for (int b = 0; b < blocks; b++) {
      count[b] = 1 + random.nextInt(6);
    }
    for (int b = 0; b < blocks; b++) {
      int n = count[b];
      int[] boundary = new int[n];
      for (int k = 0; k < n; k++) {
        boundary[k] = k + 1;
      }
      EdgeStatistics.Accumulator inner = new EdgeStatistics.Accumulator(16);
      for (int i = 0; i < 3 * n; i++) {
        long a = layout.provisional(b, 1 + random.nextInt(n));
        long c = layout.provisional(b, 1 + random.nextInt(n));
        if (a != c) {
          inner.add(a, c, random.nextGaussian() * 0.3 + 0.1);
        }
      }
      List<long[]> separated = new ArrayList<>();
      if (n >= 2 && random.nextBoolean()) {
        separated.add(new long[] {layout.provisional(b, 1), layout.provisional(b, 2)});
      }
      long[] su = separated.stream().mapToLong(p -> p[0]).toArray();
      long[] sv = separated.stream().mapToLong(p -> p[1]).toArray();
      long[] sizes = new long[n];
      Arrays.fill(sizes, 10);
      long[] firstVoxels = new long[n];
      for (int k = 0; k < n; k++) {
        firstVoxels[k] = layout.provisional(b, boundary[k]);
      }
      summaries.add(new BlockSummary(b, sizes, boundary, new int[n], firstVoxels, inner.build(),
          su, sv, EdgeStatistics.empty()));
    }
    List<SeamEdges> seams = new ArrayList<>();
    EdgeStatistics.Accumulator[] faces = new EdgeStatistics.Accumulator[grid.faceCount()];
    EdgeStatistics.Accumulator[] continued =
        new EdgeStatistics.Accumulator[grid.faceCount()];
    long[] shape = grid.gridShape();
    for (int b = 0; b < blocks; b++) {
      for (int axis = 0; axis < shape.length; axis++) {
        int f = grid.faceIndex(b, axis);
        if (f < 0) {
          continue;
        }
        faces[f] = new EdgeStatistics.Accumulator(16);
        continued[f] = new EdgeStatistics.Accumulator(4);
        for (int i = 0; i < 6; i++) {
          long[] g = grid.gridPosition(b);
          // with offsets longer than a block, the upper end can lie two blocks up
          g[axis] += far && random.nextBoolean() && g[axis] + 2 < shape[axis] ? 2 : 1;
          for (int d = 0; d < shape.length; d++) {
            if (d != axis && random.nextInt(4) == 0) {
              g[d] = Math.max(0, Math.min(shape[d] - 1, g[d] + random.nextInt(3) - 1));
            }
          }
          int other = grid.blockIndex(g);
          long a = layout.provisional(b, 1 + random.nextInt(count[b]));
          long c = layout.provisional(other, 1 + random.nextInt(count[other]));
          faces[f].add(a, c, random.nextGaussian());
          if (random.nextInt(3) == 0) {
            // continued voxel pairs, some pairs above the joining threshold and some below
            long pairs = 1 + random.nextInt(2 * (int) GlobalSolve.MIN_CONTINUED_PAIRS);
            continued[f].add(a, c, pairs, pairs, 1, 1);
          }
        }
      }
    }
    for (int f = 0; f < faces.length; f++) {
      seams.add(new SeamEdges(f, faces[f].build(), continued[f].build()));
    }
    return new Volume(summaries, seams);
  }

  @Test
  void eachPartsInputEqualsTheWholeGraphsEdgesAtThePart() {
    Random random = new Random(13);
    int checkedParts = 0;
    int joinedRows = 0;
    for (int trial = 0; trial < 30; trial++) {
      BlockGrid grid = RandomReducedGraphs.grid(2 + random.nextInt(4), 2 + random.nextInt(3),
          1 + random.nextInt(3));
      IdLayout layout = IdLayout.forGrid(grid);
      SuperBlocks superBlocks = new SuperBlocks(grid, layout, 2);
      boolean far = trial % 2 == 1;
      int[] steps = {far ? 2 : 1, far ? 2 : 1, far ? 2 : 1};
      Volume v = volume(grid, layout, random, far);
      ReducedGraph whole = ReducedGraph.assemble(layout, v.summaries(), v.seams());
      for (PartInputs.Rows rows : PartInputs.Rows.values()) {
        SolveEdges all = switch (rows) {
          case MUTEX -> HierarchicalSolver.mutexEdges(whole);
          case LINKAGE -> HierarchicalSolver.linkageEdges(whole);
          case MULTICUT -> HierarchicalSolver.multicutEdges(whole);
        };
        for (int p = 0; p < superBlocks.partCount(1); p++) {
          int part = p;
          List<Integer> read = new ArrayList<>();
          SolveEdges built = PartInputs.levelOne(grid, superBlocks, p, rows, steps,
              b -> {
                read.add(b);
                return v.summaries().get(b);
              }, f -> v.seams().get(f));
          assertEquals(atPart(all, superBlocks, part), built,
              "trial " + trial + " part " + p + " " + rows);
          for (int e = 0; e < built.size(); e++) {
            joinedRows += built.kind(e) == MulticutPartSolver.JOINED ? 1 : 0;
          }
          for (int b : read) {
            assertEquals(part, superBlocks.partOfBlock(b, 1), "reads only its own summaries");
          }
          checkedParts++;
        }
      }
    }
    assertTrue(checkedParts > 150, "parts checked: " + checkedParts);
    assertTrue(joinedRows > 20, "joined rows checked: " + joinedRows);
  }

  @Test
  void stepsAreTheLongestOffsetInBlocksRoundedUp() {
    BlockGrid grid = BlockGrid.of(new long[] {40, 40, 40}, new int[] {4, 4, 4},
        new int[] {4, 8, 8}, new int[] {1, 1, 1});
    Offsets offsets = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -9, 0}, new int[] {0, 0, -8});
    assertArrayEquals(new int[] {1, 2, 1}, PartInputs.steps(grid, offsets));
  }

  /** What the level driver gives part {@code part}: every edge with an end in it, in order. */
  private static SolveEdges atPart(SolveEdges all, SuperBlocks superBlocks, int part) {
    SolveEdges out = new SolveEdges(16);
    for (int e = 0; e < all.size(); e++) {
      if (superBlocks.partOfNode(all.u(e), 1) == part
          || superBlocks.partOfNode(all.v(e), 1) == part) {
        out.add(all, e, all.u(e), all.v(e));
      }
    }
    return out;
  }
}
