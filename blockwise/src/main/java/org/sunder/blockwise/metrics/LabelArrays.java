package org.sunder.blockwise.metrics;

import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.ArrayDataAccess;
import org.sunder.blockwise.store.DataType;

/** Widens the primitive storage of an integer {@link ArrayImg} to labels or a mask. */
public final class LabelArrays {
  private LabelArrays() {}

  /** The values as {@code long}s; unsigned types are read as unsigned. */
  public static long[] labels(ArrayImg<?, ?> img, DataType type) {
    Object storage = storage(img);
    boolean unsigned = type.isUnsigned();
    if (storage instanceof long[] l) {
      return l;
    }
    if (storage instanceof int[] v) {
      long[] out = new long[v.length];
      for (int i = 0; i < v.length; i++) {
        out[i] = unsigned ? Integer.toUnsignedLong(v[i]) : v[i];
      }
      return out;
    }
    if (storage instanceof short[] v) {
      long[] out = new long[v.length];
      for (int i = 0; i < v.length; i++) {
        out[i] = unsigned ? Short.toUnsignedLong(v[i]) : v[i];
      }
      return out;
    }
    if (storage instanceof byte[] v) {
      long[] out = new long[v.length];
      for (int i = 0; i < v.length; i++) {
        out[i] = unsigned ? Byte.toUnsignedLong(v[i]) : v[i];
      }
      return out;
    }
    throw new IllegalArgumentException("not an integer array: " + storage.getClass());
  }

  /** 1 where the value is non-zero, else 0. */
  public static byte[] mask(ArrayImg<?, ?> img) {
    Object storage = storage(img);
    if (storage instanceof byte[] v) {
      return v;
    }
    long[] values = labels(img, DataType.INT64);
    byte[] out = new byte[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[i] != 0 ? (byte) 1 : 0;
    }
    return out;
  }

  private static Object storage(ArrayImg<?, ?> img) {
    return ((ArrayDataAccess<?>) img.update(null)).getCurrentStorageArray();
  }
}
