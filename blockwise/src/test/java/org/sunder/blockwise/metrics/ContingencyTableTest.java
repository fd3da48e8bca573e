package org.sunder.blockwise.metrics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

class ContingencyTableTest {

  private static final int[] SHAPE = {23, 17, 11};

  @Test
  void blockwiseAccumulationEqualsTheWholeArray() {
    Random random = new Random(13);
    long[] gt = smoothLabels(random, 40);
    long[] seg = smoothLabels(random, 25);
    ContingencyTable whole = new ContingencyTable();
    whole.add(gt, seg);
    for (int[] block : List.of(new int[] {8, 8, 4}, new int[] {5, 17, 3}, new int[] {23, 1, 11})) {
      ContingencyTable merged = new ContingencyTable();
      forEachBlock(block, (min, size) -> {
        ContingencyTable part = new ContingencyTable();
        part.add(crop(gt, min, size), crop(seg, min, size));
        merged.merge(part);
      });
      assertEquals(whole, merged, "blocks " + java.util.Arrays.toString(block));
      assertEquals(whole.sortedPairs(), merged.sortedPairs());
      for (ScoreOptions options : List.of(ScoreOptions.DEFAULT, ScoreOptions.DEFAULT
          .withIgnoreGroundTruthZero(false))) {
        assertEquals(new Scorer(options).score(whole), new Scorer(options).score(merged));
      }
    }
  }

  @Test
  void countsMatchAPlainMapForArbitraryLabelsAndGrowth() {
    Random random = new Random(13);
    int n = 20_000;
    long[] gt = new long[n];
    long[] seg = new long[n];
    long[] special = {0, -1, Long.MIN_VALUE, Long.MAX_VALUE, 1L << 40};
    Map<List<Long>, Long> expected = new HashMap<>();
    for (int i = 0; i < n; i++) {
      gt[i] = random.nextInt(10) == 0 ? special[random.nextInt(5)] : random.nextInt(300);
      seg[i] = random.nextInt(10) == 0 ? special[random.nextInt(5)] : random.nextLong();
      if (random.nextInt(3) == 0) {
        seg[i] = gt[i] * 7;
      }
      expected.merge(List.of(gt[i], seg[i]), 1L, Long::sum);
    }
    ContingencyTable table = new ContingencyTable();
    table.add(gt, seg);
    assertEquals(expected.size(), table.pairCount());
    assertEquals(n, table.voxelCount());
    expected.forEach((pair, count) -> assertEquals(count, table.count(pair.get(0), pair.get(1))));
    assertEquals(0, table.count(3, 12345));
    ContingencyTable.Pairs pairs = table.sortedPairs();
    for (int i = 1; i < pairs.size(); i++) {
      int byGt = Long.compareUnsigned(pairs.groundTruth()[i - 1], pairs.groundTruth()[i]);
      assertEquals(true, byGt < 0 || (byGt == 0
          && Long.compareUnsigned(pairs.segment()[i - 1], pairs.segment()[i]) < 0));
    }
  }

  @Test
  void maskedAddCountsOnlyMaskedVoxelsAndMergeIsOrderFree() {
    Random random = new Random(13);
    long[] gt = smoothLabels(random, 12);
    long[] seg = smoothLabels(random, 9);
    byte[] mask = new byte[gt.length];
    int inside = 0;
    for (int i = 0; i < mask.length; i++) {
      mask[i] = (byte) (random.nextInt(3) == 0 ? 0 : 1 + random.nextInt(200));
      inside += mask[i] != 0 ? 1 : 0;
    }
    ContingencyTable masked = new ContingencyTable();
    masked.add(gt, seg, mask);
    ContingencyTable byVoxel = new ContingencyTable();
    for (int i = 0; i < gt.length; i++) {
      if (mask[i] != 0) {
        byVoxel.add(gt[i], seg[i], 1);
      }
    }
    assertEquals(inside, masked.voxelCount());
    assertEquals(byVoxel, masked);

    ContingencyTable a = new ContingencyTable();
    a.add(gt, seg);
    ContingencyTable ab = copy(a);
    ab.merge(masked);
    ContingencyTable ba = copy(masked);
    ba.merge(a);
    assertEquals(ab, ba);
    assertEquals(ab.hashCode(), ba.hashCode());
    ContingencyTable.Pairs pairs = a.sortedPairs();
    for (int i = 0; i < pairs.size(); i++) {
      long g = pairs.groundTruth()[i];
      long s = pairs.segment()[i];
      assertEquals(pairs.count()[i] + masked.count(g, s), ab.count(g, s));
    }
    assertEquals(a.voxelCount() + masked.voxelCount(), ab.voxelCount());
    assertNotEquals(a, ab);
  }

  @Test
  void sortedPairsListsEveryPairOnce() {
    ContingencyTable table = new ContingencyTable();
    table.add(new long[] {5, 5, 2, 2, 2, 5}, new long[] {1, 1, 9, 3, 9, 1});
    ContingencyTable.Pairs pairs = table.sortedPairs();
    assertArrayEquals(new long[] {2, 2, 5}, pairs.groundTruth());
    assertArrayEquals(new long[] {3, 9, 1}, pairs.segment());
    assertArrayEquals(new long[] {1, 2, 3}, pairs.count());
  }

  private static ContingencyTable copy(ContingencyTable t) {
    ContingencyTable out = new ContingencyTable();
    out.merge(t);
    return out;
  }

  /** Labels constant over random axis-aligned slabs, so runs and blocks both matter. */
  static long[] smoothLabels(Random random, int labels) {
    int n = SHAPE[0] * SHAPE[1] * SHAPE[2];
    long[] out = new long[n];
    for (int k = 0; k < labels; k++) {
      long label = random.nextInt(4) == 0 ? 0 : 1 + random.nextInt(labels);
      int[] lo = new int[3];
      int[] hi = new int[3];
      for (int d = 0; d < 3; d++) {
        lo[d] = random.nextInt(SHAPE[d]);
        hi[d] = Math.min(SHAPE[d], lo[d] + 1 + random.nextInt(SHAPE[d] / 2 + 1));
      }
      for (int z = lo[2]; z < hi[2]; z++) {
        for (int y = lo[1]; y < hi[1]; y++) {
          for (int x = lo[0]; x < hi[0]; x++) {
            out[x + SHAPE[0] * (y + SHAPE[1] * z)] = label;
          }
        }
      }
    }
    return out;
  }

  interface BlockVisitor {
    void visit(int[] min, int[] size);
  }

  static void forEachBlock(int[] block, BlockVisitor visitor) {
    for (int z = 0; z < SHAPE[2]; z += block[2]) {
      for (int y = 0; y < SHAPE[1]; y += block[1]) {
        for (int x = 0; x < SHAPE[0]; x += block[0]) {
          int[] min = {x, y, z};
          int[] size = new int[3];
          for (int d = 0; d < 3; d++) {
            size[d] = Math.min(block[d], SHAPE[d] - min[d]);
          }
          visitor.visit(min, size);
        }
      }
    }
  }

  static long[] crop(long[] whole, int[] min, int[] size) {
    long[] out = new long[size[0] * size[1] * size[2]];
    int k = 0;
    for (int z = 0; z < size[2]; z++) {
      for (int y = 0; y < size[1]; y++) {
        for (int x = 0; x < size[0]; x++) {
          out[k++] = whole[min[0] + x + SHAPE[0] * (min[1] + y + SHAPE[1] * (min[2] + z))];
        }
      }
    }
    return out;
  }
}
