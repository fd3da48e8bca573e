package org.sunder.spark.kryo;

import com.esotericsoftware.kryo.Kryo;
import com.esotericsoftware.kryo.serializers.JavaSerializer;
import org.apache.spark.SparkConf;
import org.apache.spark.serializer.KryoRegistrator;

/**
 * Registers every class that Sunder's stages send through Spark (task descriptors, task results,
 * the broadcast settings) with Kryo. Spark runs with {@code spark.kryo.registrationRequired=true},
 * so a payload class missing here fails the first job that sends it, loudly, instead of being
 * written with its full class name each time. Records get a {@link RecordSerializer}.
 */
public final class SunderKryoRegistrator implements KryoRegistrator {
  /** Sets Kryo with this registrator, registration required, as {@code conf}'s serializer. */
  public static SparkConf configure(SparkConf conf) {
    return conf.set("spark.serializer", "org.apache.spark.serializer.KryoSerializer")
        .set("spark.kryo.registrator", SunderKryoRegistrator.class.getName())
        .set("spark.kryo.registrationRequired", "true");
  }

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
