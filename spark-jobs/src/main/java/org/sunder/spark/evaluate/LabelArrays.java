package org.sunder.spark.evaluate;

import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.ByteArray;
import net.imglib2.img.basictypeaccess.array.IntArray;
import net.imglib2.img.basictypeaccess.array.LongArray;
import net.imglib2.img.basictypeaccess.array.ShortArray;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.DataType;

/** Label arrays of any integer data type as {@code long[]} (unsigned types zero-extended). */
public final class LabelArrays {
  private LabelArrays() {}

  /** The labels of {@code img} (wrapped, not copied, for uint64/int64). */
  public static long[] toLongs(ArrayImg<?, ?> img, DataType type, String what) {
    Object storage = img.update(null);
    return switch (type) {
      case UINT64, INT64 -> ((LongArray) storage).getCurrentStorageArray();
      case UINT32 -> widen(((IntArray) storage).getCurrentStorageArray(), 0xFFFFFFFFL);
      case INT32 -> widen(((IntArray) storage).getCurrentStorageArray(), -1L);
      case UINT16 -> widen(((ShortArray) storage).getCurrentStorageArray(), 0xFFFFL);
      case INT16 -> widen(((ShortArray) storage).getCurrentStorageArray(), -1L);
      case UINT8 -> widen(((ByteArray) storage).getCurrentStorageArray(), 0xFFL);
      case INT8 -> widen(((ByteArray) storage).getCurrentStorageArray(), -1L);
      default -> throw new SunderException(ErrorKind.INVALID_INPUT, what + " has data type "
          + type.name().toLowerCase() + "; expected integer labels");
    };
  }

  /** The bytes of a uint8 mask. */
  static byte[] toBytes(ArrayImg<?, ?> img) {
    return ((ByteArray) img.update(null)).getCurrentStorageArray();
  }

  private static long[] widen(int[] values, long mask) {
    long[] out = new long[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[i] & mask;
    }
    return out;
  }

  private static long[] widen(short[] values, long mask) {
    long[] out = new long[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[i] & mask;
    }
    return out;
  }

  private static long[] widen(byte[] values, long mask) {
    long[] out = new long[values.length];
    for (int i = 0; i < values.length; i++) {
      out[i] = values[i] & mask;
    }
    return out;
  }
}
