package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

class SynthSpecTest {

  private static final ObjectMapper JSON = new ObjectMapper();

  private static Map<String, Object> throughJson(Map<String, Object> m) throws Exception {
    return JSON.readValue(JSON.writeValueAsString(m), new TypeReference<Map<String, Object>>() {});
  }

  @Test
  void specRoundTripsThroughJsonAttributesInZyxOrder() throws Exception {
    SynthSpec spec = new SynthSpec(-7, new long[] {30, 20, 10}, new double[] {4, 5.5, 30}, 12,
        10, 20, 0.3, 0.05, 2, 40, 60, 1, 90, 100, true, 25.5, 17);
    Map<String, Object> attributes = throughJson(spec.toAttributes());
    assertEquals("zyx", attributes.get("axes"));
    assertEquals(List.of(10, 20, 30), attributes.get("shape"));
    assertEquals(List.of(30.0, 5.5, 4.0), attributes.get("voxelSize"));
    SynthSpec back = SynthSpec.fromAttributes(attributes);
    assertEquals(spec, back);
    assertArrayEquals(spec.shape(), back.shape());
  }

  @Test
  void degradationRoundTripsThroughJsonAttributes() throws Exception {
    Degradation d = new Degradation(99, 0.5, 0.1, 0.02, 0.001, 0.25);
    assertEquals(d, Degradation.fromAttributes(throughJson(d.toAttributes())));
    assertEquals(Degradation.none(), Degradation.fromAttributes(
        throughJson(Degradation.none().toAttributes())));
  }

  @Test
  void badValuesAreConfigErrorsNamingTheKey() {
    SunderException e = assertThrows(SunderException.class, () -> new SynthSpec(1,
        new long[] {8, 8, 8}, new double[] {1, 1, 1}, 3, 30, 20, 0.2, 0.01, 0, 1, 1, 0, 1, 1,
        false, 1, 1));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("fibreRadiusMin/fibreRadiusMax"), e.getMessage());
    SunderException shape = assertThrows(SunderException.class,
        () -> SynthSpec.small(1).withShape(8, 0, 8));
    assertTrue(shape.getMessage().contains("shape"), shape.getMessage());
    SunderException none = assertThrows(SunderException.class,
        () -> SynthSpec.small(1).withCounts(0, 0, 0));
    assertTrue(none.getMessage().contains("at least one object"));
  }

  @Test
  void malformedAttributesAreInputErrorsNamingTheKey() throws Exception {
    Map<String, Object> attributes = throughJson(SynthSpec.small(3).toAttributes());
    attributes.put("fibreCount", "many");
    SunderException e = assertThrows(SunderException.class,
        () -> SynthSpec.fromAttributes(attributes));
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().contains("\"fibreCount\""), e.getMessage());
    attributes.put("fibreCount", 3);
    attributes.put("shape", List.of(1, 2));
    assertTrue(assertThrows(SunderException.class, () -> SynthSpec.fromAttributes(attributes))
        .getMessage().contains("\"shape\""));
  }
}
