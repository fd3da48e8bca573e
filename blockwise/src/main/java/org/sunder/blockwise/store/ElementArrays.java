package org.sunder.blockwise.store;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Arrays;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.array.ArrayImgs;
import net.imglib2.img.basictypeaccess.array.ArrayDataAccess;
import net.imglib2.type.NativeType;
import net.imglib2.type.numeric.integer.ByteType;
import net.imglib2.type.numeric.integer.IntType;
import net.imglib2.type.numeric.integer.LongType;
import net.imglib2.type.numeric.integer.ShortType;
import net.imglib2.type.numeric.integer.UnsignedByteType;
import net.imglib2.type.numeric.integer.UnsignedIntType;
import net.imglib2.type.numeric.integer.UnsignedLongType;
import net.imglib2.type.numeric.integer.UnsignedShortType;
import net.imglib2.type.numeric.real.DoubleType;
import net.imglib2.type.numeric.real.FloatType;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;

/**
 * Type-generic operations on the primitive array behind a {@link DataType}: {@code byte[]},
 * {@code short[]}, {@code int[]}, {@code long[]}, {@code float[]} or {@code double[]}, held as
 * {@code Object} so that copies go through {@link System#arraycopy}. No boxing per element.
 */
final class ElementArrays {
  private ElementArrays() {}

  /** A new zeroed array of {@code n} elements. */
  static Object allocate(DataType type, int n) {
    return switch (type) {
      case UINT8, INT8 -> new byte[n];
      case UINT16, INT16 -> new short[n];
      case UINT32, INT32 -> new int[n];
      case UINT64, INT64 -> new long[n];
      case FLOAT32 -> new float[n];
      case FLOAT64 -> new double[n];
    };
  }

  /** A new array of {@code n} elements, each {@code fill}. */
  static Object allocate(DataType type, int n, FillValue fill) {
    Object array = allocate(type, n);
    if (!fill.isZero()) {
      fill(array, 0, n, fill);
    }
    return array;
  }

  /** Sets elements {@code from} (inclusive) to {@code to} (exclusive) to {@code fill}. */
  static void fill(Object array, int from, int to, FillValue fill) {
    if (array instanceof byte[] a) {
      Arrays.fill(a, from, to, (byte) fill.asLong());
    } else if (array instanceof short[] a) {
      Arrays.fill(a, from, to, (short) fill.asLong());
    } else if (array instanceof int[] a) {
      Arrays.fill(a, from, to, (int) fill.asLong());
    } else if (array instanceof long[] a) {
      Arrays.fill(a, from, to, fill.asLong());
    } else if (array instanceof float[] a) {
      Arrays.fill(a, from, to, (float) fill.asDouble());
    } else {
      Arrays.fill((double[]) array, from, to, fill.asDouble());
    }
  }

  /** The elements as bytes in {@code order}; a byte array is returned as it is, not copied. */
  static byte[] toBytes(Object array, ByteOrder order) {
    if (array instanceof byte[] a) {
      return a;
    }
    int n = java.lang.reflect.Array.getLength(array);
    int size = array instanceof short[] ? 2
        : array instanceof int[] || array instanceof float[] ? 4 : 8;
    byte[] bytes = new byte[n * size];
    ByteBuffer buffer = ByteBuffer.wrap(bytes).order(order);
    if (array instanceof short[] a) {
      buffer.asShortBuffer().put(a);
    } else if (array instanceof int[] a) {
      buffer.asIntBuffer().put(a);
    } else if (array instanceof long[] a) {
      buffer.asLongBuffer().put(a);
    } else if (array instanceof float[] a) {
      buffer.asFloatBuffer().put(a);
    } else {
      buffer.asDoubleBuffer().put((double[]) array);
    }
    return bytes;
  }

  /** {@code count} elements of {@code type} decoded from {@code bytes} at {@code offset}. */
  static Object fromBytes(byte[] bytes, int offset, int count, DataType type, ByteOrder order) {
    ByteBuffer buffer = ByteBuffer.wrap(bytes, offset, count * type.bytes()).order(order);
    switch (type) {
      case UINT8, INT8 -> {
        return offset == 0 && bytes.length == count ? bytes
            : Arrays.copyOfRange(bytes, offset, offset + count);
      }
      case UINT16, INT16 -> {
        short[] a = new short[count];
        buffer.asShortBuffer().get(a);
        return a;
      }
      case UINT32, INT32 -> {
        int[] a = new int[count];
        buffer.asIntBuffer().get(a);
        return a;
      }
      case UINT64, INT64 -> {
        long[] a = new long[count];
        buffer.asLongBuffer().get(a);
        return a;
      }
      case FLOAT32 -> {
        float[] a = new float[count];
        buffer.asFloatBuffer().get(a);
        return a;
      }
      default -> {
        double[] a = new double[count];
        buffer.asDoubleBuffer().get(a);
        return a;
      }
    }
  }

  /** Wraps {@code array} (not copied) as an {@link ArrayImg} of the type's imglib2 type. */
  static ArrayImg<?, ?> wrap(Object array, DataType type, long[] dims) {
    return switch (type) {
      case UINT8 -> ArrayImgs.unsignedBytes((byte[]) array, dims);
      case INT8 -> ArrayImgs.bytes((byte[]) array, dims);
      case UINT16 -> ArrayImgs.unsignedShorts((short[]) array, dims);
      case INT16 -> ArrayImgs.shorts((short[]) array, dims);
      case UINT32 -> ArrayImgs.unsignedInts((int[]) array, dims);
      case INT32 -> ArrayImgs.ints((int[]) array, dims);
      case UINT64 -> ArrayImgs.unsignedLongs((long[]) array, dims);
      case INT64 -> ArrayImgs.longs((long[]) array, dims);
      case FLOAT32 -> ArrayImgs.floats((float[]) array, dims);
      case FLOAT64 -> ArrayImgs.doubles((double[]) array, dims);
    };
  }

  /** The imglib2 type class that {@code type} reads as. */
  static Class<?> imglibType(DataType type) {
    return switch (type) {
      case UINT8 -> UnsignedByteType.class;
      case INT8 -> ByteType.class;
      case UINT16 -> UnsignedShortType.class;
      case INT16 -> ShortType.class;
      case UINT32 -> UnsignedIntType.class;
      case INT32 -> IntType.class;
      case UINT64 -> UnsignedLongType.class;
      case INT64 -> LongType.class;
      case FLOAT32 -> FloatType.class;
      case FLOAT64 -> DoubleType.class;
    };
  }

  /**
   * The primitive array behind {@code img} (not copied), after checking that its element type
   * is {@code type}'s and that it is backed by one primitive array of exactly its size.
   *
   * @param what names the dataset, for messages
   */
  static Object storage(ArrayImg<?, ?> img, DataType type, String what) {
    NativeType<?> element = (NativeType<?>) img.getType();
    Class<?> expected = imglibType(type);
    if (element.getClass() != expected) {
      throw new StoreException(ErrorKind.INVALID_INPUT, what + ": array has element type "
          + element.getClass().getSimpleName() + ", expected " + expected.getSimpleName()
          + " for " + type);
    }
    Object access = img.update(null);
    if (!(access instanceof ArrayDataAccess<?> arrayAccess)) {
      throw new StoreException(ErrorKind.INVALID_INPUT, what + ": array is backed by "
          + access.getClass().getSimpleName() + ", expected a primitive array access");
    }
    Object array = arrayAccess.getCurrentStorageArray();
    long size = img.size();
    if (java.lang.reflect.Array.getLength(array) != size) {
      throw new StoreException(ErrorKind.INVALID_INPUT, what + ": array storage has "
          + java.lang.reflect.Array.getLength(array) + " elements for " + size + " voxels");
    }
    return array;
  }
}
