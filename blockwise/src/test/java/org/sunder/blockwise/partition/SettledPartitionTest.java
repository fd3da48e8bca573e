package org.sunder.blockwise.partition;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.agglomeration.Agglomeration;
import org.sunder.blockwise.partition.agglomeration.AgglomerationPartitioner;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.FragmentsMulticutMethod;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BlockFragments;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.partition.mutex.MutexWatershedPartitioner;

class SettledPartitionTest {
  private static final int[] SHAPE = {10, 8, 6};

  private static Partitioner[] methods() {
    return new Partitioner[] {
        new MutexWatershedPartitioner(WeightRule.byChannelRole(), Subsampling.none()),
        new MutexWatershedPartitioner(WeightRule.byValue(WeightRule.Transform.CENTERED, null),
            Subsampling.hash(0.5, 3))};
  }

  @Test
  void withoutOpenVoxelsThePiecesAreThePartition() {
    Random random = new Random(5);
    for (Partitioner method : methods()) {
      AffinityBlock block = PartitionFixtures.randomBlock(random, SHAPE, random.nextBoolean());
      SettledPartition settled = method.partitionSettled(block, new byte[block.voxelCount()]);
      assertEquals(method.partition(block), settled.pieces());
      for (boolean flag : settled.unsettled()) {
        assertFalse(flag);
      }
    }
  }

  @Test
  void methodsWithoutHoldingBackGiveTheirPartitionSettled() {
    Random random = new Random(9);
    Partitioner mean = new AgglomerationPartitioner(new Agglomeration(Linkage.MEAN, false),
        WeightRule.byValue(WeightRule.Transform.CENTERED, null), Subsampling.none());
    AffinityBlock block = PartitionFixtures.randomBlock(random, SHAPE, false);
    byte[] open = new byte[block.voxelCount()];
    java.util.Arrays.fill(open, 0, 80, (byte) 1);
    SettledPartition settled = mean.partitionSettled(block, open);
    assertEquals(mean.partition(block), settled.pieces());
    for (boolean flag : settled.unsettled()) {
      assertFalse(flag);
    }
  }

  @Test
  void piecesRefineThePartitionAndHoldBackEveryMergeWithAnOpenCluster() {
    Random random = new Random(7);
    for (int trial = 0; trial < 12; trial++) {
      for (Partitioner method : methods()) {
        AffinityBlock block = PartitionFixtures.randomBlock(random, SHAPE, trial % 3 == 0);
        byte[] open = new byte[block.voxelCount()];
        int slab = 1 + random.nextInt(3);
        for (int i = 0; i < open.length; i++) {
          int x = i % SHAPE[0];
          open[i] = (byte) (x < slab || random.nextInt(40) == 0 ? 1 : 0);
        }
        Segmentation full = method.partition(block);
        SettledPartition settled = method.partitionSettled(block, open);
        check(full, settled, open, block.maskOrNull());
      }
    }
  }

  /**
   * The fragment methods give back every cluster that holds an open voxel as its fragments
   * (each unsettled piece is exactly one fragment) and every other cluster whole; without open
   * voxels the pieces are the partition.
   */
  @Test
  void fragmentMethodsGiveBackTheFragmentsOfClustersWithOpenVoxels() {
    Random random = new Random(21);
    FragmentOptions options = FragmentOptions.defaults();
    PartitionConfig[] configs = {
        PartitionConfig.fromJson("{\"method\": \"fragments-agglomeration\"}"),
        PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}")};
    int unsettledSeen = 0;
    for (int trial = 0; trial < 6; trial++) {
      for (PartitionConfig config : configs) {
        Partitioner method = config.create();
        AffinityBlock block = PartitionFixtures.randomBlock(random, SHAPE, trial % 2 == 0);
        assertEquals(method.partition(block),
            method.partitionSettled(block, new byte[block.voxelCount()]).pieces());
        byte[] open = new byte[block.voxelCount()];
        for (int i = 0; i < open.length; i++) {
          open[i] = (byte) (i % SHAPE[0] < 2 ? 1 : 0);
        }
        Segmentation full = method.partition(block);
        SettledPartition settled = method.partitionSettled(block, open);
        int[] fragments =
            BlockFragments.of(block, options, config.weights(), config.subsampling(),
                config.method() instanceof FragmentsMulticutMethod).labels();
        int[] f = full.labels();
        int[] p = settled.pieces().labels();
        assertTrue(PartitionFixtures.isValid(settled.pieces(), block.maskOrNull()));
        Map<Integer, Integer> clusterOfPiece = new HashMap<>();
        Map<Integer, Integer> fragmentOfPiece = new HashMap<>();
        Map<Integer, Integer> pieceOfFragment = new HashMap<>();
        Map<Integer, Integer> pieceOfSettledCluster = new HashMap<>();
        boolean[] clusterOpen = new boolean[full.segmentCount() + 1];
        for (int i = 0; i < f.length; i++) {
          clusterOpen[f[i]] |= open[i] != 0 && f[i] != 0;
        }
        for (int i = 0; i < f.length; i++) {
          if (p[i] == 0) {
            assertEquals(0, f[i]);
            continue;
          }
          int segment = f[i];
          int piece = p[i];
          int fragment = fragments[i];
          assertEquals(segment, clusterOfPiece.computeIfAbsent(piece, k -> segment),
              "a piece spans two segments");
          assertEquals(clusterOpen[f[i]], settled.unsettled()[p[i]]);
          if (clusterOpen[f[i]]) {
            unsettledSeen++;
            assertEquals(fragment, fragmentOfPiece.computeIfAbsent(piece, k -> fragment),
                "an unsettled piece spans two fragments");
            assertEquals(piece, pieceOfFragment.computeIfAbsent(fragment, k -> piece),
                "a fragment of an unsettled cluster spans two pieces");
          } else {
            assertEquals(piece, pieceOfSettledCluster.computeIfAbsent(segment, k -> piece),
                "a settled segment was split");
          }
        }
      }
    }
    assertTrue(unsettledSeen > 0);
  }

  private static void check(Segmentation full, SettledPartition settled, byte[] open,
      byte[] mask) {
    int[] f = full.labels();
    int[] p = settled.pieces().labels();
    assertTrue(PartitionFixtures.isValid(settled.pieces(), mask));
    Map<Integer, Integer> clusterOfPiece = new HashMap<>();
    Map<Integer, Integer> piecesOfCluster = new HashMap<>();
    Map<Integer, Integer> pieceSize = new HashMap<>();
    boolean[] clusterOpen = new boolean[full.segmentCount() + 1];
    for (int i = 0; i < f.length; i++) {
      if (p[i] == 0) {
        assertEquals(0, f[i]);
        continue;
      }
      Integer before = clusterOfPiece.putIfAbsent(p[i], f[i]);
      assertTrue(before == null || before == f[i], "a piece spans two segments");
      if (before == null) {
        piecesOfCluster.merge(f[i], 1, Integer::sum);
      }
      pieceSize.merge(p[i], 1, Integer::sum);
      clusterOpen[f[i]] |= open[i] != 0;
    }
    for (int i = 0; i < f.length; i++) {
      if (p[i] == 0) {
        continue;
      }
      if (open[i] != 0) {
        assertEquals(1, pieceSize.get(p[i]), "an open voxel joined a piece");
      }
      assertEquals(clusterOpen[f[i]], settled.unsettled()[p[i]]);
      if (!clusterOpen[f[i]]) {
        assertEquals(1, piecesOfCluster.get(f[i]), "a segment without open voxels was split");
      }
    }
  }
}
