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
    WeightRule clamped = json.readValue(
        "{\"kind\":\"value\",\"transform\":\"logit\",\"clamp\":0.01}", WeightRule.class);
    assertEquals(WeightRule.logit(0.01), clamped);
    assertEquals(clamped, json.readValue(json.writeValueAsString(clamped), WeightRule.class));
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

  @Test
  void logitClampBoundsEveryWeight() {
    // logit(0.01) = ln(0.01 / 0.99) = -4.59512 and logit(1e-6) = -13.81551: arithmetic facts
    WeightRule clamped = WeightRule.logit(0.01);
    WeightRule open = WeightRule.byValue(WeightRule.Transform.LOGIT, null);
    assertEquals(-4.59512, clamped.weight(0f, 0f), 1e-5);
    assertEquals(4.59512, clamped.weight(1f, 0f), 1e-5);
    assertEquals(-13.81551, open.weight(0f, 0f), 1e-4);
    java.util.Random random = new java.util.Random(5);
    for (int i = 0; i < 1000; i++) {
      float a = random.nextFloat();
      float bias = (float) random.nextGaussian();
      double expected = Math.log(Math.min(Math.max(a, 0.01), 0.99)
          / (1 - Math.min(Math.max(a, 0.01), 0.99))) + bias;
      assertEquals(expected, clamped.weight(a, bias), 1e-5, "a = " + a);
      if (a >= 0.01 && a <= 0.99) {
        assertEquals(open.weight(a, bias), clamped.weight(a, bias), 0f, "inside the clamp");
      }
    }
  }

  @Test
  void logitClampIsRefusedOutsideItsRangeAndForOtherRules() {
    ObjectMapper json = new ObjectMapper();
    for (String clamp : new String[] {"0", "0.5", "-0.1", "2"}) {
      Exception e = assertThrows(Exception.class, () -> json.readValue(
          "{\"kind\":\"value\",\"transform\":\"logit\",\"clamp\":" + clamp + "}",
          WeightRule.class));
      assertTrue(String.valueOf(e.getMessage()).contains("weights.clamp: " + Double.valueOf(clamp)),
          e.getMessage());
    }
    for (String rule : new String[] {"{\"kind\":\"value\",\"transform\":\"centered\"",
        "{\"kind\":\"channel-role\""}) {
      Exception e = assertThrows(Exception.class,
          () -> json.readValue(rule + ",\"clamp\":0.01}", WeightRule.class));
      assertTrue(String.valueOf(e.getMessage()).contains("weights.clamp: only for"),
          e.getMessage());
    }
  }
}
