package org.sunder.spark.kryo;

import com.esotericsoftware.kryo.Kryo;
import com.esotericsoftware.kryo.serializers.JavaSerializer;
import org.apache.spark.serializer.KryoRegistrator;

/**
 * Registers every class that Sunder's stages send through Spark (task descriptors, task results,
 * the broadcast settings) with Kryo. Spark runs with {@code spark.kryo.registrationRequired=true},
 * so a payload class missing here fails the first job that sends it, loudly, instead of being
 * written with its full class name each time. Records get a {@link RecordSerializer}.
 */
public final class SunderKryoRegistrator implements KryoRegistrator {
  @Override
  @SuppressWarnings({"unchecked", "rawtypes"})
  public void registerClasses(Kryo kryo) {
    for (Class<?> type : PayloadClasses.ALL) {
      if (PayloadClasses.JAVA_SERIALIZED.contains(type)) {
        kryo.register(type, new JavaSerializer());
      } else if (type.isRecord()) {
        kryo.register(type, new RecordSerializer(type));
      } else {
        kryo.register(type);
      }
    }
  }
}
