package org.sunder.stitching.bench;

import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.partition.Partitioner;

/**
 * The naive alternative to the reduced graph, measured beside it: every block is partitioned on
 * its extended box as in the real run, and across each face a segment of one block's core is
 * joined to the segment of the neighbour's extended partition that covers most of its voxels in
 * the overlap (the part of its core inside the neighbour's halo), both ways. No edges, no
 * solve. Works in memory on the whole volume's arrays; for the benchmark only.
 */
final class HaloOverlapJoin {
  private HaloOverlapJoin() {}

  /** Final labels (1..n, 0 = none) of the whole volume. */
  static long[] run(BlockGrid grid, float[] affinities, int[] shape, Offsets offsets,
      Partitioner partitioner) {
    int n = shape[0] * shape[1] * shape[2];
    int blocks = grid.blockCount();
    int[][] extLabels = new int[blocks][];
    long[] base = new long[blocks + 1];
    for (int b = 0; b < blocks; b++) {
      Block block = grid.block(b);
      AffinityBlock ext = crop(affinities, shape, offsets, block.extendedMin(),
          block.extendedMax());
      extLabels[b] = partitioner.partition(ext).labels();
      int max = 0;
      for (int label : extLabels[b]) {
        max = Math.max(max, label);
      }
      base[b + 1] = base[b] + max;
    }
    int[] parent = new int[(int) base[blocks] + 1];
    for (int i = 0; i < parent.length; i++) {
      parent[i] = i;
    }
    for (Face face : grid.faces()) {
      join(grid, face.lowerBlock(), face.upperBlock(), extLabels, base, parent);
      join(grid, face.upperBlock(), face.lowerBlock(), extLabels, base, parent);
    }
    long[] out = new long[n];
    long[] finalOf = new long[parent.length];
    long next = 1;
    int[] p = new int[3];
    for (int i = 0; i < n; i++) {
      position(i, shape, p);
      int b = grid.blockIndexOfVoxel(new long[] {p[0], p[1], p[2]});
      Block block = grid.block(b);
      int label = extLabels[b][indexIn(block.extendedMin(), block.extendedShape(), p)];
      if (label == 0) {
        continue;
      }
      int root = find(parent, (int) (base[b] + label));
      if (finalOf[root] == 0) {
        finalOf[root] = next++;
      }
      out[i] = finalOf[root];
    }
    return out;
  }

  /**
   * Joins each segment of {@code own}'s core that reaches into {@code other}'s halo with the
   * segment of {@code other}'s extended partition holding most of those voxels.
   */
  private static void join(BlockGrid grid, int own, int other, int[][] extLabels, long[] base,
      int[] parent) {
    Block a = grid.block(own);
    Block b = grid.block(other);
    long[] min = new long[3];
    long[] max = new long[3];
    for (int d = 0; d < 3; d++) {
      min[d] = Math.max(a.coreMin()[d], b.extendedMin()[d]);
      max[d] = Math.min(a.coreMax()[d], b.extendedMax()[d]);
      if (min[d] > max[d]) {
        return;
      }
    }
    int ownCount = (int) (base[own + 1] - base[own]) + 1;
    int volume = (int) ((max[0] - min[0] + 1) * (max[1] - min[1] + 1) * (max[2] - min[2] + 1));
    long[] ownLabels = new long[volume];
    long[] otherLabels = new long[volume];
    int next = 0;
    int[] p = new int[3];
    for (long z = min[2]; z <= max[2]; z++) {
      for (long y = min[1]; y <= max[1]; y++) {
        for (long x = min[0]; x <= max[0]; x++) {
          p[0] = (int) x;
          p[1] = (int) y;
          p[2] = (int) z;
          ownLabels[next] = extLabels[own][indexIn(a.extendedMin(), a.extendedShape(), p)];
          otherLabels[next++] = extLabels[other][indexIn(b.extendedMin(), b.extendedShape(), p)];
        }
      }
    }
    ContingencyTable table = new ContingencyTable();
    table.add(ownLabels, otherLabels);
    ContingencyTable.Pairs pairs = table.sortedPairs();
    long[] best = new long[ownCount];
    int[] choice = new int[ownCount];
    long[] ownOf = pairs.groundTruth();
    long[] otherOf = pairs.segment();
    long[] countOf = pairs.count();
    for (int i = 0; i < ownOf.length; i++) {
      int la = (int) ownOf[i];
      int lb = (int) otherOf[i];
      long c = countOf[i];
      if (la != 0 && lb != 0 && c > best[la]) {
        best[la] = c;
        choice[la] = lb;
      }
    }
    for (int la = 1; la < ownCount; la++) {
      if (best[la] > 0) {
        union(parent, (int) (base[own] + la), (int) (base[other] + choice[la]));
      }
    }
  }

  private static int indexIn(long[] min, int[] shape, int[] p) {
    return (int) ((p[0] - min[0]) + shape[0] * ((p[1] - min[1]) + shape[1] * (p[2] - min[2])));
  }

  private static int find(int[] parent, int x) {
    while (parent[x] != x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }

  private static void union(int[] parent, int x, int y) {
    int rx = find(parent, x);
    int ry = find(parent, y);
    if (rx != ry) {
      parent[Math.max(rx, ry)] = Math.min(rx, ry);
    }
  }

  static void position(int index, int[] shape, int[] out) {
    out[0] = index % shape[0];
    out[1] = index / shape[0] % shape[1];
    out[2] = index / (shape[0] * shape[1]);
  }

  static AffinityBlock crop(float[] affinities, int[] shape, Offsets offsets, long[] min,
      long[] max) {
    int[] sub = new int[3];
    for (int d = 0; d < 3; d++) {
      sub[d] = (int) (max[d] - min[d] + 1);
    }
    int voxels = sub[0] * sub[1] * sub[2];
    int n = shape[0] * shape[1] * shape[2];
    float[] out = new float[voxels * offsets.count()];
    for (int k = 0; k < offsets.count(); k++) {
      int i = 0;
      for (int z = 0; z < sub[2]; z++) {
        for (int y = 0; y < sub[1]; y++) {
          int start = (int) (min[0] + shape[0] * ((min[1] + y) + shape[1] * (min[2] + z)));
          System.arraycopy(affinities, start + k * n, out, i + k * voxels, sub[0]);
          i += sub[0];
        }
      }
    }
    return AffinityBlock.ofFloats(out, sub, min, offsets, null);
  }
}
