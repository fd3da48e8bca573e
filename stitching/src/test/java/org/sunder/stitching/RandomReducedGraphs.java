package org.sunder.stitching;

import java.util.Arrays;
import java.util.Random;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.stitching.solve.ReducedGraph;

/**
 * Random reduced graphs over a block grid for the solve tests: each block holds a few boundary
 * segments with a position; a hidden ground truth gives each segment the object of its nearest
 * object seed; pairs join segments of one block or of face-adjacent blocks. Weights are exact
 * (every pair inside an object at +1, every pair across objects at -1, so ties are everywhere)
 * or noisy (the sign flips with some probability, magnitudes vary).
 */
public final class RandomReducedGraphs {
  private RandomReducedGraphs() {}

  public static BlockGrid grid(int gx, int gy, int gz) {
    return BlockGrid.of(new long[] {8L * gx, 6L * gy, 4L * gz}, new int[] {4, 3, 2},
        new int[] {8, 6, 4}, new int[] {1, 1, 1});
  }

  public static ReducedGraph graph(BlockGrid grid, IdLayout layout, Random random, boolean exact,
      int maxSegmentsPerBlock, double pairsPerSegment) {
    int blocks = grid.blockCount();
    int[] count = new int[blocks];
    int total = 0;
    for (int b = 0; b < blocks; b++) {
      count[b] = 1 + random.nextInt(maxSegmentsPerBlock);
      total += count[b];
    }
    long[] ids = new long[total];
    double[][] position = new double[total][3];
    int[] blockOf = new int[total];
    int at = 0;
    for (int b = 0; b < blocks; b++) {
      long[] gp = grid.gridPosition(b);
      for (int k = 1; k <= count[b]; k++) {
        ids[at] = layout.provisional(b, k);
        blockOf[at] = b;
        for (int d = 0; d < 3; d++) {
          position[at][d] = gp[d] + random.nextDouble();
        }
        at++;
      }
    }
    // ids are ascending by construction: block bits above local bits
    double[][] seeds = new double[Math.max(2, total / 6)][3];
    long[] shape = grid.gridShape();
    for (double[] s : seeds) {
      for (int d = 0; d < 3; d++) {
        s[d] = random.nextDouble() * shape[d];
      }
    }
    int[] object = new int[total];
    for (int i = 0; i < total; i++) {
      double best = Double.MAX_VALUE;
      for (int s = 0; s < seeds.length; s++) {
        double dist = 0;
        for (int d = 0; d < 3; d++) {
          dist += (position[i][d] - seeds[s][d]) * (position[i][d] - seeds[s][d]);
        }
        if (dist < best) {
          best = dist;
          object[i] = s;
        }
      }
    }
    EdgeStatistics.Accumulator acc = new EdgeStatistics.Accumulator(total * 4);
    int pairs = (int) (total * pairsPerSegment);
    for (int p = 0; p < pairs; p++) {
      int i = random.nextInt(total);
      long[] gp = grid.gridPosition(blockOf[i]).clone();
      int axis = random.nextInt(4);
      if (axis < 3) {
        gp[axis] += random.nextBoolean() ? 1 : -1;
        if (gp[axis] < 0 || gp[axis] >= shape[axis]) {
          continue;
        }
      }
      int b = grid.blockIndex(gp);
      int first = Arrays.binarySearch(ids, layout.provisional(b, 1));
      int j = first + random.nextInt(count[b]);
      if (i == j) {
        continue;
      }
      int edges = 1 + random.nextInt(5);
      for (int k = 0; k < edges; k++) {
        boolean same = object[i] == object[j];
        double w;
        if (exact) {
          w = same ? 1 : -1;
        } else {
          boolean flip = random.nextDouble() < 0.15;
          w = ((same ^ flip) ? 1 : -1) * (0.05 + random.nextDouble());
        }
        acc.add(i, j, w);
      }
    }
    EdgeStatistics edges = acc.build();
    int separated = random.nextInt(total / 4 + 1);
    long[] sepKeys = new long[separated];
    int sepCount = 0;
    for (int s = 0; s < separated; s++) {
      int i = random.nextInt(total);
      int b = blockOf[i];
      int first = Arrays.binarySearch(ids, layout.provisional(b, 1));
      int j = first + random.nextInt(count[b]);
      if (i != j && (exact ? object[i] != object[j] : true)) {
        sepKeys[sepCount++] = ((long) Math.min(i, j) << 32) | Math.max(i, j);
      }
    }
    long[] keys = Arrays.stream(Arrays.copyOf(sepKeys, sepCount)).sorted().distinct().toArray();
    int[] su = new int[keys.length];
    int[] sv = new int[keys.length];
    for (int s = 0; s < keys.length; s++) {
      su[s] = (int) (keys[s] >>> 32);
      sv[s] = (int) keys[s];
    }
    return new ReducedGraph(ids, edges, su, sv);
  }

  /** The clusters renumbered by first occurrence, so that equal partitions give equal arrays. */
  public static int[] canonical(int[] clusters) {
    int max = 0;
    for (int c : clusters) {
      max = Math.max(max, c);
    }
    int[] renumber = new int[max + 1];
    Arrays.fill(renumber, -1);
    int next = 0;
    int[] out = new int[clusters.length];
    for (int i = 0; i < clusters.length; i++) {
      if (renumber[clusters[i]] < 0) {
        renumber[clusters[i]] = next++;
      }
      out[i] = renumber[clusters[i]];
    }
    return out;
  }
}
