package org.sunder.blockwise.store;

import java.util.Random;

/**
 * Seeded, compressible test content: a sum of sines along each axis scaled to the element
 * type's range, plus a little noise, in memory order (dimension 0 fastest).
 */
public final class SmoothVolumes {
  private SmoothVolumes() {}

  /** A new primitive array of {@code type} holding the volume of {@code dims}. */
  public static Object smooth(DataType type, int[] dims, Random random) {
    int n = 1;
    for (int size : dims) {
      n *= size;
    }
    Object array = ElementArrays.allocate(type, n);
    int[] position = new int[dims.length];
    double span = switch (type) {
      case UINT8, INT8 -> 250;
      case UINT16, INT16 -> 60000;
      case UINT32, INT32 -> 4.0e9;
      default -> 1.0e15;
    };
    double low = type.isUnsigned() ? 0 : -span / 2;
    for (int i = 0; i < n; i++) {
      double wave = 0;
      for (int d = 0; d < dims.length; d++) {
        wave += Math.sin(position[d] / (3.0 + 2 * d));
      }
      double unit = (wave / dims.length + 1) / 2 * 0.98;
      store(array, i, type, unit, low, span, random);
      for (int d = 0; d < dims.length; d++) {
        if (++position[d] < dims[d]) {
          break;
        }
        position[d] = 0;
      }
    }
    return array;
  }

  private static void store(Object array, int i, DataType type, double unit, double low,
      double span, Random random) {
    if (array instanceof float[] a) {
      a[i] = (float) (unit + random.nextGaussian() * 0.002);
    } else if (array instanceof double[] a) {
      a[i] = unit + random.nextGaussian() * 0.002;
    } else {
      long value = (long) (low + unit * span) + random.nextInt(3);
      if (array instanceof byte[] a) {
        a[i] = (byte) value;
      } else if (array instanceof short[] a) {
        a[i] = (short) value;
      } else if (array instanceof int[] a) {
        a[i] = (int) value;
      } else {
        ((long[]) array)[i] = value;
      }
    }
  }
}
