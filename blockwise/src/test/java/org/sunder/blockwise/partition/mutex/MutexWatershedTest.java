package org.sunder.blockwise.partition.mutex;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashSet;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.graph.SignedGraph;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.PartitionFixtures;
import org.sunder.blockwise.partition.ReferenceMutexWatershed;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.testing.PythonReference;

class MutexWatershedTest {

  @Test
  void sparseMatchesPlainTranscriptionOnRandomGraphs() {
    Random random = new Random(13);
    for (int trial = 0; trial < 60; trial++) {
      int nodes = 5 + random.nextInt(60);
      SignedGraph g = PartitionFixtures.randomGraph(random, nodes, random.nextInt(3 * nodes),
          random.nextDouble());
      Clustering expected = ReferenceMutexWatershed.partition(g);
      assertEquals(expected, MutexWatershed.partition(g), "trial " + trial);
      assertEquals(expected, MutexWatershed.partition(PartitionFixtures.shuffled(g, random)),
          "edge order must not matter (distinct weights), trial " + trial);
    }
  }

  @Test
  void tiesFollowTheDocumentedOrder() {
    // equal magnitudes: the attractive path 0-1-2 is taken before the repulsive edge (0,2)
    SignedGraph g = SignedGraph.of(3, new int[] {0, 1, 0}, new int[] {1, 2, 2},
        new double[] {0.5, 0.5, -0.5});
    Clustering c = MutexWatershed.partition(g);
    assertTrue(c.together(0, 1));
    assertTrue(c.together(1, 2));
    // equal magnitudes between attractive edges: the smaller edge index first
    SignedGraph h = SignedGraph.of(3, new int[] {0, 1, 0}, new int[] {2, 2, 1},
        new double[] {0.5, -0.7, 0.5});
    Clustering d = MutexWatershed.partition(h);
    assertTrue(d.together(0, 2) && !d.together(0, 1));
    assertEquals(ReferenceMutexWatershed.partition(g), c);
  }

  @Test
  void gridMatchesSparseCopyAndIsValid() {
    Random random = new Random(13);
    for (int trial = 0; trial < 8; trial++) {
      AffinityBlock block = PartitionFixtures.randomBlock(random, new int[] {9, 7, 5},
          trial % 2 == 0);
      WeightRule rule = trial < 4 ? WeightRule.byChannelRole()
          : WeightRule.byValue(WeightRule.Transform.CENTERED, new double[] {0.3, 0.3, 0.3, 0, 0, 0});
      Subsampling sub = trial % 3 == 0 ? Subsampling.hash(0.5, trial) : Subsampling.none();
      GridGraph graph = GridGraph.of(block, rule, sub);
      Segmentation grid = MutexWatershed.partition(graph);
      assertTrue(PartitionFixtures.isValid(grid, block.maskOrNull()));
      Clustering sparse = ReferenceMutexWatershed.partition(graph.toSignedGraph());
      assertEquals(Segmentation.fromClusters(sparse.clusterOf(), block.maskOrNull()), grid);
      assertEquals(grid, new MutexWatershedPartitioner(rule, sub).partition(block));
    }
  }

  @Test
  void floatSortKeepsExactOrderOverWideMagnitudesTiesAndLargeBuckets() {
    // mixture of exact ties, continuous values and magnitudes down to 1e-30 (top-level buckets
    // of every size, in order and out of order); the plain transcription sorts with a comparator
    Random random = new Random(17);
    int[] shape = {20, 15, 12};
    int n = 20 * 15 * 12;
    float[] a = new float[n * PartitionFixtures.OFFSETS.count()];
    for (int i = 0; i < a.length; i++) {
      switch (random.nextInt(5)) {
        case 0 -> a[i] = random.nextBoolean() ? 1f : 0f;
        case 1 -> a[i] = 0.5f + (random.nextBoolean() ? 1 : -1) * (float) Math.pow(10,
            -1 - random.nextInt(30));
        case 2 -> a[i] = random.nextInt(4) / 4f;
        default -> a[i] = random.nextFloat();
      }
    }
    AffinityBlock block = AffinityBlock.ofFloats(a, shape, new long[3], PartitionFixtures.OFFSETS,
        null);
    for (WeightRule rule : new WeightRule[] {WeightRule.byChannelRole(),
        WeightRule.byValue(WeightRule.Transform.CENTERED, null)}) {
      GridGraph graph = GridGraph.of(block, rule, Subsampling.none());
      Clustering expected = ReferenceMutexWatershed.partition(graph.toSignedGraph());
      assertEquals(Segmentation.fromClusters(expected.clusterOf(), null),
          MutexWatershed.partition(graph));
    }
  }

  @Test
  void eightBitAffinitiesGiveTheSamePartitionAsTheirFloatValues() {
    Random random = new Random(13);
    int[] shape = {11, 6, 4};
    int n = 11 * 6 * 4;
    byte[] bytes = new byte[n * 6];
    for (int i = 0; i < bytes.length; i++) {
      int b = 11 * random.nextInt(24);  // few distinct values: many ties
      // channels 3..5 are the long-range (repulsive) ones: drawing 255 - b there half the time
      // gives attractive weight b / 255 and repulsive weight -(1 - (255 - b) / 255) of equal
      // magnitude, the tie between an attractive and a repulsive edge
      bytes[i] = (byte) (i >= 3 * n && random.nextBoolean() ? 255 - b : b);
    }
    float[] floats = new float[bytes.length];
    for (int i = 0; i < bytes.length; i++) {
      floats[i] = (bytes[i] & 0xff) / 255f;
    }
    for (WeightRule rule : new WeightRule[] {WeightRule.byChannelRole(),
        WeightRule.byValue(WeightRule.Transform.LOGIT, new double[] {3, 3, 3, 0, 0, 0})}) {
      Segmentation q = MutexWatershed.partition(GridGraph.of(AffinityBlock.ofBytes(bytes, shape,
          new long[3], PartitionFixtures.OFFSETS, null), rule, Subsampling.none()));
      Segmentation f = MutexWatershed.partition(GridGraph.of(AffinityBlock.ofFloats(floats,
          shape, new long[3], PartitionFixtures.OFFSETS, null), rule, Subsampling.none()));
      assertEquals(f, q);
      assertTrue(q.segmentCount() > 1 && q.segmentCount() < n);
    }
    GridGraph byRole = GridGraph.of(AffinityBlock.ofBytes(bytes, shape, new long[3],
        PartitionFixtures.OFFSETS, null), WeightRule.byChannelRole(), Subsampling.none());
    Set<Float> attractive = new HashSet<>();
    Set<Float> repulsive = new HashSet<>();
    byRole.forEachEdge(
        (source, target, k, w) -> (w > 0 ? attractive : repulsive).add(Math.abs(w)));
    attractive.retainAll(repulsive);
    attractive.remove(0f);
    assertTrue(attractive.size() > 3, "equal attractive and repulsive magnitudes drawn: "
        + attractive);
  }

  @Test
  void attractiveOnlyBinaryAffinitiesGiveConnectedComponentsOfScipyNdimageLabel() {
    PythonReference.requireModules("scipy", "numpy");
    Random random = new Random(13);
    int[] shape = {13, 8, 6};
    int n = 13 * 8 * 6;
    boolean[] fg = new boolean[n];
    for (int i = 0; i < n; i++) {
      fg[i] = random.nextInt(100) < 45;
    }
    float[] a = new float[n * 6];
    GridGraph probe = GridGraph.of(AffinityBlock.ofFloats(a.clone(), shape, new long[3],
        PartitionFixtures.OFFSETS, null), WeightRule.byChannelRole(), Subsampling.none());
    probe.forEachEdge((s, t, k, w) -> {
      if (k < 3) {
        a[s + k * n] = fg[s] && fg[t] ? 1f : 0f;  // attractive only between foreground voxels
      } else {
        a[s + k * n] = 1f;  // repulsive channels at affinity 1: weight 0, no constraint
      }
    });
    Segmentation ours = MutexWatershed.partition(GridGraph.of(AffinityBlock.ofFloats(a, shape,
        new long[3], PartitionFixtures.OFFSETS, null), WeightRule.byChannelRole(),
        Subsampling.none()));
    StringBuilder bits = new StringBuilder();
    for (boolean b : fg) {
      bits.append(b ? '1' : '0');
    }
    // Reference: scipy.ndimage.label, default structuring element = face neighbours
    // (6-connectivity in 3D). Checked first on a case with a known answer.
    String script = """
        import sys, numpy as np
        from scipy import ndimage
        known, count = ndimage.label(np.array([[1, 0, 1], [1, 0, 0], [0, 0, 1]]))
        assert count == 3 and known[0, 0] == known[1, 0] and known[0, 2] != known[2, 2], known
        z, y, x = (int(v) for v in sys.argv[1].split(','))
        fg = np.array([c == '1' for c in sys.argv[2]]).reshape(z, y, x)
        labels, count = ndimage.label(fg)
        print(count)
        print(','.join(str(v) for v in labels.ravel()))
        """;
    String[] out = PythonReference.runChecked(script, shape[2] + "," + shape[1] + "," + shape[0],
        bits.toString()).strip().split("\n");
    String[] ref = out[1].split(",");
    int components = Integer.parseInt(out[0].strip());
    int[] ourOfRef = new int[components + 1];
    int[] refOfOurs = new int[ours.segmentCount() + 1];
    int background = 0;
    for (int i = 0; i < n; i++) {
      int r = Integer.parseInt(ref[i]);
      int l = ours.labels()[i];
      if (r == 0) {
        background++;
        assertEquals(0, refOfOurs[l], "a background voxel is a singleton");
        refOfOurs[l] = -1;
        continue;
      }
      if (ourOfRef[r] == 0) {
        ourOfRef[r] = l;
      }
      assertEquals(ourOfRef[r], l, "one reference component, one segment");
      assertTrue(refOfOurs[l] == 0 || refOfOurs[l] == r, "one segment, one component");
      refOfOurs[l] = r;
    }
    assertEquals(components + background, ours.segmentCount());
    assertTrue(components > 5, "the test volume has several components: " + components);
  }
}
