package org.sunder.spark.kryo;

import java.nio.ByteBuffer;
import org.apache.spark.SparkConf;
import org.apache.spark.serializer.KryoSerializer;
import org.apache.spark.serializer.SerializerInstance;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import scala.reflect.ClassTag;
import scala.reflect.ClassTag$;

/**
 * Turns task results into bytes for the work dir's records and back, with the same Kryo setup
 * Spark uses. Thread-safe (a serializer instance per call); works on the driver and executors.
 */
public final class PayloadCodec implements java.io.Serializable {
  private static final long serialVersionUID = 1L;
  private static final ClassTag<Object> ANY = ClassTag$.MODULE$.apply(Object.class);

  private transient KryoSerializer serializer;

  private KryoSerializer serializer() {
    if (serializer == null) {
      serializer = new KryoSerializer(SunderKryoRegistrator.configure(new SparkConf(false)));
    }
    return serializer;
  }

  public byte[] encode(Object value) {
    SerializerInstance instance = serializer().newInstance();
    ByteBuffer buffer = instance.serialize(value, ANY);
    byte[] bytes = new byte[buffer.remaining()];
    buffer.get(bytes);
    return bytes;
  }

  public <T> T decode(byte[] bytes, Class<T> type, String what) {
    Object value;
    try {
      value = serializer().newInstance().deserialize(ByteBuffer.wrap(bytes), ANY);
    } catch (RuntimeException e) {
      throw new SunderException(ErrorKind.CONFLICT, what + " cannot be read by this version of"
          + " Sunder (" + e.getMessage() + "); use --fresh to start over", e);
    }
    if (!type.isInstance(value)) {
      throw new SunderException(ErrorKind.CONFLICT, what + " holds a "
          + (value == null ? "null" : value.getClass().getName()) + ", expected " + type.getName());
    }
    return type.cast(value);
  }
}
