package org.sunder.blockwise.graph;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import net.imglib2.img.array.ArrayImgs;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;

class GraphValidationTest {
  private static final Offsets OFFSETS = Offsets.of(new int[] {1, 0}, new int[] {0, 1},
      new int[] {4, -4});

  @Test
  void offsetsRejectZeroRepeatedAndMixedDimensions() {
    GraphInputException zero = assertThrows(GraphInputException.class,
        () -> Offsets.of(new int[] {1, 0}, new int[] {0, 0}));
    assertTrue(zero.getMessage().contains("offsets[1]"), zero.getMessage());
    assertEquals(ErrorKind.INVALID_CONFIG, zero.kind());
    assertThrows(GraphInputException.class, () -> Offsets.of(new int[] {1, 0}, new int[] {1, 0}));
    GraphInputException mixed = assertThrows(GraphInputException.class,
        () -> Offsets.of(new int[] {1, 0}, new int[] {0, 1, 0}));
    assertTrue(mixed.getMessage().contains("offsets[1]"), mixed.getMessage());
  }

  @Test
  void zyxIsReversedMemoryOrder() {
    Offsets o = Offsets.fromZyx(new int[][] {{-1, 0, 0}, {0, 0, -9}});
    assertEquals(-1, o.component(0, 2));
    assertEquals(-9, o.component(1, 0));
    assertEquals(-1, o.toZyx()[0][0]);
    assertTrue(o.isLongRange(1));
    assertTrue(!o.isLongRange(0));
    assertArrayEquals(new int[] {9, 0, 1}, o.reach());
  }

  @Test
  void affinitiesOutsideUnitIntervalOrNaNAreRejected() {
    float[] a = new float[4 * 3 * 3];
    a[5 + 12 * 2] = Float.NaN;
    GraphInputException nan = assertThrows(GraphInputException.class,
        () -> AffinityBlock.ofFloats(a, new int[] {4, 3}, new long[2], OFFSETS, null));
    assertTrue(nan.getMessage().contains("NaN") && nan.getMessage().contains("channel 2")
        && nan.getMessage().contains("[1, 1]"), nan.getMessage());
    assertEquals(ErrorKind.INVALID_INPUT, nan.kind());
    a[5 + 12 * 2] = 1.5f;
    assertThrows(GraphInputException.class,
        () -> AffinityBlock.ofFloats(a, new int[] {4, 3}, new long[2], OFFSETS, null));
  }

  @Test
  void channelCountMustEqualOffsetCount() {
    GraphInputException e = assertThrows(GraphInputException.class, () -> AffinityBlock.of(
        ArrayImgs.floats(4, 3, 2), new long[2], OFFSETS, null));
    assertTrue(e.getMessage().contains("2 channel(s) but 3 offset(s)"), e.getMessage());
    GraphInputException dim = assertThrows(GraphInputException.class, () -> AffinityBlock.of(
        ArrayImgs.floats(4, 3, 2, 3), new long[3], OFFSETS, null));
    assertTrue(dim.getMessage().contains("offsets"), dim.getMessage());
    assertEquals(ErrorKind.INVALID_CONFIG, dim.kind());
  }

  @Test
  void weightRuleAndSubsamplingReadFromJsonAndCheckLengths() throws Exception {
    ObjectMapper json = new ObjectMapper();
    WeightRule rule = json.readValue(
        "{\"kind\":\"value\",\"transform\":\"logit\",\"bias\":[0.0,0.5]}", WeightRule.class);
    assertEquals(WeightRule.byValue(WeightRule.Transform.LOGIT, new double[] {0, 0.5}), rule);
    GraphInputException e = assertThrows(GraphInputException.class, () -> rule.validate(OFFSETS));
    assertTrue(e.getMessage().contains("weights.bias"), e.getMessage());
    assertEquals(rule, json.readValue(json.writeValueAsString(rule), WeightRule.class));
    Subsampling hash = json.readValue("{\"kind\":\"hash\",\"keepFraction\":0.25,\"seed\":7}",
        Subsampling.class);
    assertEquals(Subsampling.hash(0.25, 7), hash);
    assertEquals(hash, json.readValue(json.writeValueAsString(hash), Subsampling.class));
    Exception bad = assertThrows(Exception.class, () -> json.readValue(
        "{\"kind\":\"hash\",\"keepFraction\":1.5}", Subsampling.class));
    assertTrue(String.valueOf(bad.getMessage()).contains("subsampling.keepFraction"),
        bad.getMessage());
    GraphInputException stride = assertThrows(GraphInputException.class,
        () -> Subsampling.stride(2, 2, 2).validate(OFFSETS));
    assertTrue(stride.getMessage().contains("subsampling.stride"), stride.getMessage());
  }
}
