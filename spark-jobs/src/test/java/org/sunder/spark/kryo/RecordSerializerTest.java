package org.sunder.spark.kryo;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import com.esotericsoftware.kryo.Kryo;
import com.esotericsoftware.kryo.io.Input;
import com.esotericsoftware.kryo.io.Output;
import java.io.ByteArrayOutputStream;
import java.util.Random;
import org.junit.jupiter.api.Test;

class RecordSerializerTest {
  record Inner(long id, double[] values) {}

  record Outer(int index, String name, Inner inner, long[] ids, Inner missing) {}

  record Unregistered(int x) {}

  private static Kryo kryo() {
    Kryo kryo = new Kryo();
    kryo.setRegistrationRequired(true);
    kryo.register(double[].class);
    kryo.register(long[].class);
    kryo.register(Inner.class, new RecordSerializer<>(Inner.class));
    kryo.register(Outer.class, new RecordSerializer<>(Outer.class));
    return kryo;
  }

  @Test
  void recordsRoundTripWithArraysNestingAndNulls() {
    Random random = new Random(13);
    long[] ids = random.longs(17).toArray();
    double[] values = random.doubles(5).toArray();
    Outer outer = new Outer(7, "block", new Inner(-3, values), ids, null);
    ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    try (Output output = new Output(bytes)) {
      kryo().writeClassAndObject(output, outer);
    }
    Outer back = (Outer) kryo().readClassAndObject(new Input(bytes.toByteArray()));
    assertEquals(7, back.index());
    assertEquals("block", back.name());
    assertEquals(-3, back.inner().id());
    assertArrayEquals(values, back.inner().values());
    assertArrayEquals(ids, back.ids());
    assertNull(back.missing());
  }

  @Test
  void unregisteredPayloadFailsLoudly() {
    try (Output output = new Output(new ByteArrayOutputStream())) {
      assertThrows(IllegalArgumentException.class,
          () -> kryo().writeClassAndObject(output, new Unregistered(1)));
    }
  }
}
