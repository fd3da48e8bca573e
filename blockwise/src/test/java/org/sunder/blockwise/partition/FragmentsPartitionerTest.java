package org.sunder.blockwise.partition;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.sunder.blockwise.partition.PartitionerContract.assertValidSegmentation;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.HashMap;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BlockFragments;
import org.sunder.blockwise.partition.fragments.VoxelBox;
import org.sunder.blockwise.partition.sizefilter.SizeFilterTest;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

class FragmentsPartitionerTest {
  private static final int[] SHAPE = {36, 28, 10};
  private static final Offsets OFFSETS = Offsets.of(new int[] {-1, 0, 0}, new int[] {0, -1, 0},
      new int[] {0, 0, -1}, new int[] {-4, 0, 0}, new int[] {0, -4, 0}, new int[] {0, 0, -2});

  @Test
  void bothMethodsRecoverNoisyCellsAndKeepTheMaskAtZero() {
    Random random = new Random(13);
    int[] truth = SizeFilterTest.randomSegments(random, SHAPE, 14);
    byte[] mask = sphereMask();
    AffinityBlock block = block(truth, mask, random, 0.2f, false);
    for (String method : new String[] {"fragments-multicut", "fragments-agglomeration"}) {
      Partitioner p = PartitionConfig.fromJson("{\"method\": \"" + method + "\"}").create();
      Segmentation s = p.partition(block);
      assertValidSegmentation(s, mask, VoxelBox.size(SHAPE), method);
      assertEquals(s, p.partition(block), method + " is deterministic");
      double agreement = majorityAgreement(truth, s.labels(), mask);
      assertTrue(agreement > 0.95, method + ": " + agreement);
      assertTrue(s.segmentCount() <= 14 * 4, method + ": " + s.segmentCount() + " segments");
    }
  }

  @Test
  void quantizedAffinitiesConstraintsAndPerSliceFragmentsWork() {
    Random random = new Random(13);
    int[] truth = SizeFilterTest.randomSegments(random, SHAPE, 10);
    AffinityBlock bytes = block(truth, null, random, 0.15f, true);
    PartitionConfig constrained = PartitionConfig.fromJson("{\"method\": "
        + "\"fragments-agglomeration\", \"linkage\": \"mean\", \"constraints\": true}");
    Segmentation s = constrained.create().partition(bytes);
    assertValidSegmentation(s, null, VoxelBox.size(SHAPE), "constrained, 8-bit");
    assertTrue(majorityAgreement(truth, s.labels(), null) > 0.95);
    PartitionConfig perSlice = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\","
        + " \"fragments\": {\"perSlice\": true, \"voxelSize\": [3.0, 1.0, 1.0],"
        + " \"seedSmoothing\": 0.5}}");
    perSlice.validate(OFFSETS);
    BlockFragments fragments = BlockFragments.of(bytes, perSlice.fragments(), perSlice.weights(),
        perSlice.subsampling(), true);
    int plane = SHAPE[0] * SHAPE[1];
    Map<Integer, Integer> sliceOf = new HashMap<>();
    for (int i = 0; i < truth.length; i++) {
      Integer z = sliceOf.putIfAbsent(fragments.labels()[i], i / plane);
      assertTrue(z == null || z == i / plane, "a per-slice fragment spans slices");
    }
    s = perSlice.create().partition(bytes);
    assertValidSegmentation(s, null, VoxelBox.size(SHAPE), "per-slice fragments");
    assertTrue(majorityAgreement(truth, s.labels(), null) > 0.95);
  }

  @Test
  void minimumSegmentSizeRemovesSmallSegments() {
    Random random = new Random(13);
    int[] truth = SizeFilterTest.randomSegments(random, SHAPE, 12);
    AffinityBlock block = block(truth, null, random, 0.45f, false);
    PartitionConfig config = PartitionConfig.fromJson(
        "{\"method\": \"fragments-multicut\", \"minSegmentSize\": 40}");
    Partitioner p = config.create();
    assertInstanceOf(SizeFilteredPartitioner.class, p);
    Segmentation s = p.partition(block);
    assertValidSegmentation(s, null, VoxelBox.size(SHAPE), "minimum segment size");
    int[] size = new int[s.segmentCount() + 1];
    for (int l : s.labels()) {
      size[l]++;
    }
    for (int l = 1; l <= s.segmentCount(); l++) {
      assertTrue(size[l] >= 40 || s.segmentCount() == 1, "segment " + l + " has " + size[l]);
    }
  }

  @Test
  void configurationRoundTripsAndNamesBadKeys() throws Exception {
    String json = "{\"method\": \"fragments-multicut\", \"minSegmentSize\": 25, \"fragments\": "
        + "{\"boundaryThreshold\": 0.4, \"voxelSize\": [4.0, 1.0, 1.0], \"perSlice\": true}}";
    PartitionConfig config = PartitionConfig.fromJson(json);
    assertEquals(Linkage.SUM, config.linkage());
    assertEquals(4.0, config.fragments().voxelSize()[2], "zyx in JSON, memory order inside");
    String written = new ObjectMapper().writeValueAsString(config);
    assertEquals(config, PartitionConfig.fromJson(written), written);
    assertKey("fragments.boundaryThreshold", "{\"method\": \"fragments-multicut\", "
        + "\"fragments\": {\"boundaryThreshold\": 1.5}}");
    assertKey("fragments", "{\"method\": \"mutex-watershed\", \"fragments\": {}}");
    assertKey("minSegmentSize", "{\"method\": \"agglomeration\", \"minSegmentSize\": -3}");
    assertKey("constraints", "{\"method\": \"fragments-multicut\", \"constraints\": true}");
    assertKey("method", "{\"method\": \"fragments-magic\"}");
    SunderException e = assertThrows(SunderException.class, () -> PartitionConfig.fromJson(
        "{\"method\": \"fragments-multicut\", \"fragments\": {\"voxelSize\": [1.0, 1.0]}}")
        .validate(OFFSETS));
    assertTrue(e.getMessage().startsWith("fragments.voxelSize"), e.getMessage());
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
  }

  private static void assertKey(String key, String json) {
    SunderException e = assertThrows(SunderException.class, () -> PartitionConfig.fromJson(json));
    assertTrue(e.getMessage().startsWith(key), e.getMessage());
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
  }

  static AffinityBlock block(int[] truth, byte[] mask, Random random, float noise,
      boolean quantized) {
    int n = truth.length;
    int[] strides = VoxelBox.strides(SHAPE);
    int channels = OFFSETS.count();
    float[] values = new float[n * channels];
    int[] c = new int[3];
    for (int i = 0; i < n; i++) {
      for (int k = 0; k < channels; k++) {
        boolean inside = true;
        int j = i;
        for (int d = 0; d < 3; d++) {
          int t = c[d] + OFFSETS.component(k, d);
          inside &= t >= 0 && t < SHAPE[d];
          j += OFFSETS.component(k, d) * strides[d];
        }
        float a = inside && truth[j] == truth[i] ? 1f : 0f;
        a += (float) (random.nextGaussian() * noise);
        values[k * n + i] = Math.min(1f, Math.max(0f, a));
      }
      VoxelBox.advance(c, SHAPE);
    }
    long[] min = {100, 200, 300};
    if (!quantized) {
      return AffinityBlock.ofFloats(values, SHAPE, min, OFFSETS, mask);
    }
    byte[] bytes = new byte[values.length];
    for (int i = 0; i < values.length; i++) {
      bytes[i] = (byte) Math.round(values[i] * 255);
    }
    return AffinityBlock.ofBytes(bytes, SHAPE, min, OFFSETS, mask);
  }

  private static byte[] sphereMask() {
    byte[] mask = new byte[VoxelBox.size(SHAPE)];
    int[] c = new int[3];
    for (int i = 0; i < mask.length; i++) {
      double x = (c[0] - 18) / 20.0;
      double y = (c[1] - 14) / 16.0;
      double z = (c[2] - 5) / 7.0;
      mask[i] = (byte) (x * x + y * y + z * z < 1 ? 1 : 0);
      VoxelBox.advance(c, SHAPE);
    }
    return mask;
  }

  /** Fraction of voxels whose segment's majority object is their own object. */
  static double majorityAgreement(int[] truth, int[] labels, byte[] mask) {
    Map<Long, Integer> overlap = new HashMap<>();
    Map<Integer, Integer> majority = new HashMap<>();
    int counted = 0;
    for (int i = 0; i < labels.length; i++) {
      if (labels[i] > 0) {
        overlap.merge((long) labels[i] << 32 | truth[i], 1, Integer::sum);
        counted++;
      }
    }
    overlap.forEach((key, count) -> majority.merge((int) (key >>> 32), count, Math::max));
    long agree = 0;
    for (int count : majority.values()) {
      agree += count;
    }
    Map<Integer, Integer> reverse = new HashMap<>();
    Map<Long, Integer> byObject = new HashMap<>();
    overlap.forEach((key, count) -> byObject.merge(key, count, Integer::sum));
    byObject.forEach((key, count) -> reverse.merge((int) (long) key, count, Math::max));
    long covered = 0;
    for (int count : reverse.values()) {
      covered += count;
    }
    return Math.min(agree, covered) / (double) counted;
  }
}
