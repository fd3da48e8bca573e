package org.sunder.blockwise.partition.config;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.PartitionFixtures;
import org.sunder.blockwise.partition.Partitioner;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.agglomeration.Linkage;
import org.sunder.blockwise.partition.fragments.FragmentsMulticutPartitioner;
import org.sunder.blockwise.partition.sizefilter.SizeFilter;
import org.sunder.blockwise.partition.sizefilter.SizeFilteredPartitioner;

class PartitionConfigTest {

  private static SunderException configError(String json) {
    SunderException e = assertThrows(SunderException.class, () -> PartitionConfig.fromJson(json));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    return e;
  }

  @Test
  void readsBothMethodsAndRoundTrips() throws Exception {
    PartitionConfig agg = PartitionConfig.fromJson("""
        {"method": "agglomeration", "linkage": "abs-max", "constraints": true,
         "weights": {"kind": "value", "transform": "centered"},
         "subsampling": {"kind": "stride", "stride": [2, 2, 1]}}""");
    assertEquals(PartitionConfig.agglomeration(Linkage.ABS_MAX, true,
        WeightRule.byValue(WeightRule.Transform.CENTERED, null), Subsampling.stride(2, 2, 1)), agg);
    PartitionConfig mws = PartitionConfig.fromJson("{\"method\": \"mutex-watershed\"}");
    assertEquals(WeightRule.byChannelRole(), mws.weights());
    ObjectMapper json = new ObjectMapper();
    for (PartitionConfig c : new PartitionConfig[] {agg, mws}) {
      assertEquals(c, PartitionConfig.fromJson(json.writeValueAsString(c)));
    }
  }

  @Test
  void theMulticutClampsItsLogitsAndTheOtherValueMethodsDoNot() throws Exception {
    assertEquals(WeightRule.logit(FragmentsMulticutMethod.LOGIT_CLAMP),
        PartitionConfig.robustDefault(new double[] {8, 8, 32}).weights());
    PartitionConfig named = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}");
    assertEquals(WeightRule.logit(FragmentsMulticutMethod.LOGIT_CLAMP), named.weights());
    assertEquals(named, PartitionConfig.fromJson(new ObjectMapper().writeValueAsString(named)));
    assertEquals(WeightRule.byValue(WeightRule.Transform.LOGIT, null), PartitionConfig.fromJson(
        "{\"method\": \"fragments-agglomeration\"}").weights());
    PartitionConfig own = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\","
        + " \"weights\": {\"kind\": \"value\", \"transform\": \"logit\"}}");
    assertEquals(WeightRule.byValue(WeightRule.Transform.LOGIT, null), own.weights(),
        "a configuration's own rule is kept");
  }

  @Test
  void sizeFilterRuleIsReadValidatedAndRoundTrips() throws Exception {
    PartitionConfig strict = PartitionConfig.fromJson("{\"method\": \"mutex-watershed\","
        + " \"minSegmentSize\": 30, \"sizeFilter\": \"within-constraints\"}");
    assertEquals(SizeFilter.Rule.WITHIN_CONSTRAINTS, strict.sizeFilter());
    assertEquals(SizeFilter.Rule.WITHIN_CONSTRAINTS,
        ((SizeFilteredPartitioner) strict.create()).filter().rule());
    PartitionConfig complete = PartitionConfig.fromJson("{\"method\": \"agglomeration\","
        + " \"linkage\": \"max\", \"minSegmentSize\": 30}");
    assertEquals(SizeFilter.Rule.COMPLETE, complete.sizeFilter(), "the default");
    SizeFilteredPartitioner created = (SizeFilteredPartitioner) complete.create();
    assertEquals(new SizeFilter(30, Linkage.MEAN, SizeFilter.Rule.COMPLETE), created.filter(),
        "the filter ranks neighbours by mean weight whatever the method's linkage");
    assertEquals(Linkage.MAX, created.methodLinkage());
    assertEquals(null, PartitionConfig.fromJson("{\"method\": \"mutex-watershed\"}")
        .sizeFilter(), "no rule without a filter");
    ObjectMapper json = new ObjectMapper();
    for (PartitionConfig c : new PartitionConfig[] {strict, complete}) {
      assertEquals(c, PartitionConfig.fromJson(json.writeValueAsString(c)));
    }
    assertTrue(configError("{\"method\": \"mutex-watershed\", \"minSegmentSize\": 30,"
        + " \"sizeFilter\": \"strict\"}").getMessage()
        .startsWith("sizeFilter: unknown value \"strict\""));
    assertTrue(configError("{\"method\": \"mutex-watershed\","
        + " \"sizeFilter\": \"complete\"}").getMessage().startsWith("sizeFilter:"));
  }

  @Test
  void theMutexWatershedReadsAShareOfTheLongRangeEdgesUnlessToldOtherwise() throws Exception {
    PartitionConfig plain = PartitionConfig.fromJson("{\"method\": \"mutex-watershed\"}");
    assertEquals(Subsampling.hash(MutexWatershedMethod.LONG_RANGE_KEPT,
        MutexWatershedMethod.LONG_RANGE_SEED), plain.subsampling());
    PartitionConfig every = PartitionConfig.fromJson("{\"method\": \"mutex-watershed\","
        + " \"subsampling\": {\"kind\": \"none\"}}");
    assertTrue(every.subsampling().keepsAll());
    assertNotEquals(plain, every);
    ObjectMapper json = new ObjectMapper();
    for (PartitionConfig c : new PartitionConfig[] {plain, every}) {
      assertEquals(c, PartitionConfig.fromJson(json.writeValueAsString(c)), "written explicitly");
    }
    for (String other : new String[] {"agglomeration", "fragments-multicut",
        "fragments-agglomeration"}) {
      assertTrue(PartitionConfig.fromJson("{\"method\": \"" + other + "\"}").subsampling()
          .keepsAll(), other + " reads every edge");
    }
    // the share is kept consistently across blocks: a hash of the global edge, about the share
    long kept = 0;
    long[] voxel = new long[3];
    for (int i = 0; i < 20_000; i++) {
      voxel[0] = i % 40;
      voxel[1] = i / 40 % 25;
      voxel[2] = i / 1000;
      kept += plain.subsampling().keepsLongRange(voxel, 5) ? 1 : 0;
    }
    assertEquals(MutexWatershedMethod.LONG_RANGE_KEPT, kept / 20_000.0, 0.02);
  }

  @Test
  void kernighanLinIsOffByDefaultReadAndRefusedOutsideTheMulticut() throws Exception {
    PartitionConfig plain = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\"}");
    assertFalse(plain.kernighanLin());
    assertFalse(((FragmentsMulticutPartitioner) plain.create()).kernighanLin());
    PartitionConfig refined = PartitionConfig.fromJson("{\"method\": \"fragments-multicut\","
        + " \"kernighanLin\": true}");
    assertTrue(((FragmentsMulticutPartitioner) refined.create()).kernighanLin());
    assertTrue(refined.createSolver().name().contains("Kernighan-Lin"));
    assertFalse(plain.createSolver().name().contains("Kernighan-Lin"));
    assertNotEquals(plain, refined);
    ObjectMapper json = new ObjectMapper();
    for (PartitionConfig c : new PartitionConfig[] {plain, refined}) {
      assertEquals(c, PartitionConfig.fromJson(json.writeValueAsString(c)));
    }
    PartitionConfig agglomeration = PartitionConfig.fromJson("{\"method\": \"agglomeration\"}");
    assertFalse(json.writeValueAsString(agglomeration).contains("kernighanLin"),
        "written only for the method that uses it");
    assertTrue(configError("{\"method\": \"fragments-agglomeration\","
        + " \"kernighanLin\": true}").getMessage()
        .startsWith("kernighanLin: not used by method \"fragments-agglomeration\""));
  }

  @Test
  void mistakesNameTheirKey() {
    assertTrue(configError("{\"method\": \"agglomeration\", \"linkage\": \"median\"}")
        .getMessage().contains("linkage: unknown value \"median\""));
    assertTrue(configError("{\"method\": \"watershed\"}").getMessage()
        .contains("method: unknown value \"watershed\""));
    assertTrue(configError("{\"linkage\": \"mean\"}").getMessage().contains("method: missing"));
    assertTrue(configError("{\"method\": \"agglomeration\", \"treshold\": 1}").getMessage()
        .contains("treshold"));
    assertTrue(configError("{\"method\": \"agglomeration\", \"constraints\": true,"
        + " \"threshold\": 0.2}").getMessage().contains("threshold"));
    assertTrue(configError("{\"method\": \"mutex-watershed\", \"subsampling\":"
        + " {\"kind\": \"hash\", \"keepFraction\": 0}}").getMessage()
        .contains("subsampling.keepFraction"));
    PartitionConfig biased = PartitionConfig.fromJson("{\"method\": \"agglomeration\","
        + " \"weights\": {\"kind\": \"value\", \"transform\": \"logit\", \"bias\": [0, 1]}}");
    SunderException lengths = assertThrows(SunderException.class,
        () -> biased.validate(PartitionFixtures.OFFSETS));
    assertTrue(lengths.getMessage().contains("weights.bias"), lengths.getMessage());
  }

  @Test
  void affinityMistakesAreNamed() {
    float[] a = new float[4 * 3 * 2 * 6];
    a[17] = Float.NaN;
    SunderException nan = assertThrows(SunderException.class, () -> AffinityBlock.ofFloats(a,
        new int[] {4, 3, 2}, new long[3], PartitionFixtures.OFFSETS, null));
    assertTrue(nan.getMessage().contains("NaN"), nan.getMessage());
    a[17] = -0.1f;
    assertTrue(assertThrows(SunderException.class, () -> AffinityBlock.ofFloats(a,
        new int[] {4, 3, 2}, new long[3], PartitionFixtures.OFFSETS, null)).getMessage()
        .contains("expected a number in [0, 1]"));
    SunderException channels = assertThrows(SunderException.class, () -> AffinityBlock.of(
        net.imglib2.img.array.ArrayImgs.floats(4, 3, 2, 5), new long[3], PartitionFixtures.OFFSETS,
        null));
    assertTrue(channels.getMessage().contains("but 6 offset(s)"), channels.getMessage());
    SunderException dims = assertThrows(SunderException.class, () -> AffinityBlock.ofFloats(
        new float[12], new int[] {4, 3}, new long[2], Offsets.of(new int[] {1, 0, 0}), null));
    assertTrue(dims.getMessage().startsWith("offsets:"), dims.getMessage());
  }

  @Test
  void createdPartitionersLabelConsecutivelyInFirstVoxelOrder() {
    Random random = new Random(13);
    AffinityBlock block = PartitionFixtures.randomBlock(random, new int[] {10, 6, 3}, true);
    for (String json : new String[] {"{\"method\": \"mutex-watershed\"}",
        "{\"method\": \"agglomeration\", \"linkage\": \"mean\"}",
        "{\"method\": \"agglomeration\", \"linkage\": \"max\", \"constraints\": true}"}) {
      PartitionConfig config = PartitionConfig.fromJson(json);
      config.validate(block.offsets());
      Partitioner partitioner = config.create();
      Segmentation s = partitioner.partition(block);
      assertTrue(PartitionFixtures.isValid(s, block.maskOrNull()), json);
      assertTrue(s.segmentCount() > 1, json);
      assertEquals(s, partitioner.partition(block), "deterministic");
    }
  }

  @Test
  void theRobustDefaultFitsFragmentsAndSizeFloorToTheVoxelSize() {
    // memory order x, y, z: sections 4 times thicker than the pixels
    PartitionConfig sections = PartitionConfig.robustDefault(new double[] {8, 8, 32});
    assertEquals(new FragmentsMulticutMethod(), sections.method());
    assertTrue(sections.fragments().perSlice());
    assertEquals(32.0, sections.fragments().voxelSize()[2]);
    // 4/3 pi (50 nm)^3 = 523 599 nm^3 over 2 048 nm^3 per voxel = 255.7
    assertEquals(256, sections.minSegmentSize());
    assertTrue(!PartitionConfig.robustDefault(new double[] {10, 10, 19}).fragments().perSlice());
    assertTrue(PartitionConfig.robustDefault(new double[] {10, 10, 20}).fragments().perSlice());
    // 2D data is never sliced; the floor is a disc: pi 50^2 / 16 = 490.9
    PartitionConfig plane = PartitionConfig.robustDefault(new double[] {4, 4});
    assertTrue(!plane.fragments().perSlice());
    assertEquals(491, plane.minSegmentSize());
    // unknown voxel size: a ball of 3 voxels, 4/3 pi 27 = 113.1
    PartitionConfig unknown = PartitionConfig.robustDefault(null);
    assertEquals(113, unknown.minSegmentSize());
    assertTrue(!unknown.fragments().perSlice());
    assertEquals(unknown, PartitionConfig.fromJson(new ObjectMapper().valueToTree(unknown)
        .toString()), "the default round-trips through its JSON form");
  }
}
