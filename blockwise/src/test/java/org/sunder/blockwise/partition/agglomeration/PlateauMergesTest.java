package org.sunder.blockwise.partition.agglomeration;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.collections.PairSet;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.PartitionFixtures;

/**
 * {@link PlateauMerges} against the general state it shortens ({@link AgglomerationState} on the
 * whole grid) and against the definition of mean linkage with its tie order, on grids where
 * many affinities are exactly 1, as on realistic predictions.
 */
class PlateauMergesTest {
  private static final Offsets NEAREST = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0},
      new int[] {0, 0, -1});
  private static final WeightRule LOGIT = WeightRule.byValue(WeightRule.Transform.LOGIT, null);
  private static final WeightRule CENTERED =
      WeightRule.byValue(WeightRule.Transform.CENTERED, null);

  @Test
  void equalsTheGeneralStateOnGridsWithSaturatedAffinities() {
    Random random = new Random(41);
    int merges = 0;
    for (int trial = 0; trial < 40; trial++) {
      int[] shape = {4 + random.nextInt(12), 4 + random.nextInt(10), 2 + random.nextInt(6)};
      Offsets offsets = trial % 2 == 0 ? PartitionFixtures.OFFSETS : NEAREST;
      float[] affinities = new float[shape[0] * shape[1] * shape[2] * offsets.count()];
      for (int i = 0; i < affinities.length; i++) {
        double p = random.nextDouble();
        affinities[i] = p < 0.4 ? 1f : p < 0.55 ? 0f
            : p < 0.65 ? 1f - (1 + random.nextInt(40)) * 0x1p-24f : random.nextFloat();
      }
      byte[] mask = trial % 4 == 3 ? randomMask(random, affinities.length / offsets.count())
          : null;
      GridGraph grid = GridGraph.of(
          AffinityBlock.ofFloats(affinities, shape, new long[3], offsets, mask),
          trial % 3 == 0 ? CENTERED : LOGIT,
          trial % 5 == 4 ? Subsampling.stride(2, 2, 1) : Subsampling.none());
      double threshold = trial % 4 == 1 ? -0.2 : trial % 8 == 5 ? Double.NEGATIVE_INFINITY : 0;
      Agglomeration options = new Agglomeration(Linkage.MEAN, false).withThreshold(threshold);
      PlateauMerges plateau = PlateauMerges.of(options, grid);
      assertNotNull(plateau, "trial " + trial);
      plateau.sweep();
      merges += plateau.merges();
      assertEquals(AgglomerationState.ofGrid(options, grid).run().clustering(),
          plateau.finish(options).clustering(), "trial " + trial);
    }
    assertTrue(merges > 1000, "the sweep merged " + merges);
  }

  /**
   * Centered weights with lighter edges 1 to 30 grid steps below {@code top}: a pair of large
   * clusters with one lighter edge may average to {@code top} on the grid, so the sweep hands
   * over to the general state; the result must not change.
   */
  @Test
  void handsOverBeforeALighterEdgeCouldAverageToTheTop() {
    Random random = new Random(43);
    int handovers = 0;
    for (int trial = 0; trial < 30; trial++) {
      int[] shape = {6 + random.nextInt(10), 6 + random.nextInt(10), 2 + random.nextInt(4)};
      Offsets offsets = trial % 2 == 0 ? PartitionFixtures.OFFSETS : NEAREST;
      int steps = trial % 3 == 0 ? 1 : 30;
      float[] affinities = new float[shape[0] * shape[1] * shape[2] * offsets.count()];
      for (int i = 0; i < affinities.length; i++) {
        double p = random.nextDouble();
        affinities[i] = p < 0.8 ? 1f : p < 0.9 ? 1f - steps * 0x1p-24f : random.nextFloat();
      }
      GridGraph grid = GridGraph.of(
          AffinityBlock.ofFloats(affinities, shape, new long[3], offsets, null), CENTERED,
          Subsampling.none());
      Agglomeration options = new Agglomeration(Linkage.MEAN, false);
      PlateauMerges plateau = PlateauMerges.of(options, grid);
      plateau.sweep();
      handovers += plateau.handedOver() ? 1 : 0;
      assertEquals(AgglomerationState.ofGrid(options, grid).run().clustering(),
          plateau.finish(options).clustering(), "trial " + trial);
    }
    assertTrue(handovers >= 20, handovers + " handovers in 30 trials");
  }

  @Test
  void equalsTheDefinitionWithItsTieOrder() {
    Random random = new Random(47);
    float[] levels = {1f, 1f, 1f, 0.9f, 0.75f, 0.3f, 0f};
    for (int trial = 0; trial < 40; trial++) {
      int[] shape = {2 + random.nextInt(4), 2 + random.nextInt(3), 1 + random.nextInt(3)};
      Offsets offsets = trial % 2 == 0 ? PartitionFixtures.OFFSETS : NEAREST;
      float[] affinities = new float[shape[0] * shape[1] * shape[2] * offsets.count()];
      for (int i = 0; i < affinities.length; i++) {
        affinities[i] = levels[random.nextInt(levels.length)];
      }
      GridGraph grid = GridGraph.of(
          AffinityBlock.ofFloats(affinities, shape, new long[3], offsets, null), LOGIT,
          Subsampling.none());
      Agglomeration options = new Agglomeration(Linkage.MEAN, false);
      PlateauMerges plateau = PlateauMerges.of(options, grid);
      if (plateau == null) {
        continue;  // no edge or no positive weight
      }
      plateau.sweep();
      assertEquals(definition(grid), plateau.finish(options).clustering(), "trial " + trial);
    }
  }

  @Test
  void refusesWhatItCannotShorten() {
    GridGraph grid = GridGraph.of(AffinityBlock.ofFloats(new float[] {1f, 1f, 0.2f, 0f},
        new int[] {4, 1, 1}, new long[3], Offsets.of(new int[] {-1, 0, 0}), null), LOGIT,
        Subsampling.none());
    assertNotNull(PlateauMerges.of(new Agglomeration(Linkage.MEAN, false), grid));
    assertNull(PlateauMerges.of(new Agglomeration(Linkage.MEAN, true), grid));
    assertNull(PlateauMerges.of(new Agglomeration(Linkage.MAX, false), grid));
    assertNull(PlateauMerges.of(new Agglomeration(Linkage.MEAN, false).withMergeTree(), grid));
    assertNull(PlateauMerges.of(new Agglomeration(Linkage.MEAN, false).withThreshold(20), grid));
    GridGraph offGrid = GridGraph.of(AffinityBlock.ofFloats(new float[] {1f, 0.6f},
        new int[] {2, 1, 1}, new long[3], Offsets.of(new int[] {-1, 0, 0}), null), LOGIT,
        Subsampling.none());
    float top = offGrid.weight(1, 0);
    assertNotEquals(Linkage.onGrid(top), top, "the precondition: logit(0.6) off the grid");
    assertNull(PlateauMerges.of(new Agglomeration(Linkage.MEAN, false), offGrid));
  }

  /**
   * Mean linkage by its definition: aggregate the grid's edges between every pair of current
   * clusters, merge the pair of largest positive value, ties to the pair whose smallest edge id
   * is smallest ({@link Agglomeration}'s documented order), until no value is positive.
   */
  private static Clustering definition(GridGraph grid) {
    int n = grid.nodeCount();
    List<int[]> ends = new ArrayList<>();
    List<Float> weights = new ArrayList<>();
    grid.forEachEdge((s, t, k, w) -> {
      ends.add(new int[] {s, t});
      weights.add(w);
    });
    int[] cluster = new int[n];
    for (int i = 0; i < n; i++) {
      cluster[i] = i;
    }
    while (true) {
      Map<Long, double[]> pairs = new HashMap<>();  // sum, count, smallest edge index
      for (int e = 0; e < ends.size(); e++) {
        int a = cluster[ends.get(e)[0]];
        int b = cluster[ends.get(e)[1]];
        if (a != b) {
          double[] s = pairs.computeIfAbsent(PairSet.pair(a, b),
              key -> new double[] {0, 0, Double.MAX_VALUE});
          s[0] += weights.get(e);
          s[1]++;
          s[2] = Math.min(s[2], e);
        }
      }
      long best = -1;
      double bestValue = 0;
      double bestRank = 0;
      for (Map.Entry<Long, double[]> p : pairs.entrySet()) {
        double[] s = p.getValue();
        double value = Linkage.MEAN.value(s[0], (long) s[1], 0, 0);
        if (value > 0 && (best < 0 || value > bestValue
            || (value == bestValue && s[2] < bestRank))) {
          best = p.getKey();
          bestValue = value;
          bestRank = s[2];
        }
      }
      if (best < 0) {
        return Clustering.fromRepresentatives(cluster);
      }
      int keep = (int) (best >>> 32);
      int gone = (int) best;
      for (int i = 0; i < n; i++) {
        if (cluster[i] == gone) {
          cluster[i] = keep;
        }
      }
    }
  }

  private static byte[] randomMask(Random random, int voxels) {
    byte[] mask = new byte[voxels];
    for (int i = 0; i < voxels; i++) {
      mask[i] = (byte) (random.nextInt(5) == 0 ? 0 : 1);
    }
    return mask;
  }
}
