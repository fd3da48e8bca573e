package org.sunder.spark.kryo;

import com.esotericsoftware.kryo.Kryo;
import com.esotericsoftware.kryo.KryoException;
import com.esotericsoftware.kryo.Serializer;
import com.esotericsoftware.kryo.io.Input;
import com.esotericsoftware.kryo.io.Output;
import java.lang.reflect.Constructor;
import java.lang.reflect.InvocationTargetException;
import java.lang.reflect.Method;
import java.lang.reflect.RecordComponent;

/**
 * Kryo serializer for a Java record: writes each component in declaration order (with its class,
 * so components of interface type and {@code null} work) and reads them back through the
 * canonical constructor, so the record's own validation runs on the receiving side too.
 * Kryo 4's field serializer cannot set a record's final fields on Java 17; this one needs no
 * reflective writes. Per object: O(components) reflective calls.
 */
public final class RecordSerializer<T extends Record> extends Serializer<T> {
  private final Method[] accessors;
  private final Constructor<T> constructor;

  public RecordSerializer(Class<T> type) {
    if (!type.isRecord()) {
      throw new IllegalArgumentException(type.getName() + " is not a record");
    }
    RecordComponent[] components = type.getRecordComponents();
    accessors = new Method[components.length];
    Class<?>[] types = new Class<?>[components.length];
    for (int i = 0; i < components.length; i++) {
      accessors[i] = components[i].getAccessor();
      accessors[i].setAccessible(true);
      types[i] = components[i].getType();
    }
    try {
      constructor = type.getDeclaredConstructor(types);
      constructor.setAccessible(true);
    } catch (NoSuchMethodException e) {
      throw new IllegalArgumentException("record " + type.getName() + " has no canonical constructor", e);
    }
    setImmutable(true);
  }

  @Override
  public void write(Kryo kryo, Output output, T record) {
    for (Method accessor : accessors) {
      try {
        kryo.writeClassAndObject(output, accessor.invoke(record));
      } catch (IllegalAccessException | InvocationTargetException e) {
        throw new KryoException("cannot read component " + accessor.getName() + " of "
            + record.getClass().getName(), e);
      }
    }
  }

  @Override
  public T read(Kryo kryo, Input input, Class<T> type) {
    Object[] values = new Object[accessors.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = kryo.readClassAndObject(input);
    }
    try {
      return constructor.newInstance(values);
    } catch (InstantiationException | IllegalAccessException e) {
      throw new KryoException("cannot construct " + type.getName(), e);
    } catch (InvocationTargetException e) {
      throw new KryoException("cannot construct " + type.getName() + ": " + e.getCause(), e.getCause());
    }
  }
}
