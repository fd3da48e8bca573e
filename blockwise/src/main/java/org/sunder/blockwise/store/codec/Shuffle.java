package org.sunder.blockwise.store.codec;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;

/**
 * Blosc's byte shuffle and bit shuffle of one block, and their inverses.
 *
 * <p>Byte shuffle (c-blosc {@code shuffle-generic}): byte {@code j} of element {@code i} goes to
 * {@code j * n + i} for the {@code n = blockSize / typeSize} whole elements; trailing bytes stay.
 *
 * <p>Bit shuffle (the bitshuffle algorithm as blosc 1 embeds it, {@code bshuf_trans_bit_elem}):
 * for {@code n} elements, a multiple of 8, bit {@code k} of byte {@code b} of element {@code e}
 * goes to bit {@code e % 8} of byte {@code (b * 8 + k) * n / 8 + e / 8}. Blosc 1 copies blocks
 * whose element count is not a multiple of 8 unchanged. Computed as a byte shuffle plus an 8x8
 * bit transpose of every 8 bytes of each byte plane; both passes read and write sequentially.
 */
final class Shuffle {
  private static final VarHandle LONGS =
      MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);

  private Shuffle() {}

  static void byteShuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize) {
    int n = blockSize / typeSize;
    switch (typeSize) {
      case 2 -> shuffle2(src, srcOff, dst, dstOff, n);
      case 4 -> shuffle4(src, srcOff, dst, dstOff, n);
      default -> {
        int from = srcOff;
        for (int i = 0; i < n; i++) {
          for (int j = 0; j < typeSize; j++) {
            dst[dstOff + j * n + i] = src[from++];
          }
        }
      }
    }
    int whole = n * typeSize;
    System.arraycopy(src, srcOff + whole, dst, dstOff + whole, blockSize - whole);
  }

  static void byteUnshuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize) {
    int n = blockSize / typeSize;
    switch (typeSize) {
      case 2 -> unshuffle2(src, srcOff, dst, dstOff, n);
      case 4 -> unshuffle4(src, srcOff, dst, dstOff, n);
      case 8 -> unshuffle8(src, srcOff, dst, dstOff, n);
      default -> {
        int to = dstOff;
        for (int i = 0; i < n; i++) {
          for (int j = 0; j < typeSize; j++) {
            dst[to++] = src[srcOff + j * n + i];
          }
        }
      }
    }
    int whole = n * typeSize;
    System.arraycopy(src, srcOff + whole, dst, dstOff + whole, blockSize - whole);
  }

  private static void shuffle2(byte[] src, int s, byte[] dst, int d, int n) {
    int d1 = d + n;
    for (int i = 0; i < n; i++) {
      dst[d + i] = src[s++];
      dst[d1 + i] = src[s++];
    }
  }

  private static void shuffle4(byte[] src, int s, byte[] dst, int d, int n) {
    int d1 = d + n;
    int d2 = d1 + n;
    int d3 = d2 + n;
    for (int i = 0; i < n; i++) {
      dst[d + i] = src[s++];
      dst[d1 + i] = src[s++];
      dst[d2 + i] = src[s++];
      dst[d3 + i] = src[s++];
    }
  }

  private static void unshuffle2(byte[] src, int s, byte[] dst, int d, int n) {
    for (int i = 0; i < n; i++) {
      dst[d++] = src[s + i];
      dst[d++] = src[s + n + i];
    }
  }

  private static void unshuffle4(byte[] src, int s, byte[] dst, int d, int n) {
    int s1 = s + n;
    int s2 = s1 + n;
    int s3 = s2 + n;
    for (int i = 0; i < n; i++) {
      dst[d++] = src[s + i];
      dst[d++] = src[s1 + i];
      dst[d++] = src[s2 + i];
      dst[d++] = src[s3 + i];
    }
  }

  private static void unshuffle8(byte[] src, int s, byte[] dst, int d, int n) {
    for (int i = 0; i < n; i++) {
      for (int j = 0; j < 8; j++) {
        dst[d++] = src[s + j * n + i];
      }
    }
  }

  /** Bit shuffle; {@code scratch} holds at least {@code blockSize} bytes. */
  static void bitShuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize, byte[] scratch) {
    int n = blockSize / typeSize;
    if (n % 8 != 0) {
      System.arraycopy(src, srcOff, dst, dstOff, blockSize);
      return;
    }
    byteShuffle(typeSize, src, srcOff, scratch, 0, n * typeSize);
    int row = n / 8;
    for (int b = 0; b < typeSize; b++) {
      int plane = b * n;
      int to = dstOff + b * 8 * row;
      for (int group = 0; group < row; group++) {
        long x = transpose8x8((long) LONGS.get(scratch, plane + 8 * group));
        for (int k = 0; k < 8; k++) {
          dst[to + k * row + group] = (byte) (x >>> (8 * k));
        }
      }
    }
  }

  /** Inverse of {@link #bitShuffle}; {@code scratch} holds at least {@code blockSize} bytes. */
  static void bitUnshuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize, byte[] scratch) {
    int n = blockSize / typeSize;
    if (n % 8 != 0) {
      System.arraycopy(src, srcOff, dst, dstOff, blockSize);
      return;
    }
    int row = n / 8;
    for (int b = 0; b < typeSize; b++) {
      int plane = b * n;
      int from = srcOff + b * 8 * row;
      for (int group = 0; group < row; group++) {
        long x = 0;
        for (int k = 0; k < 8; k++) {
          x |= (src[from + k * row + group] & 0xffL) << (8 * k);
        }
        LONGS.set(scratch, plane + 8 * group, transpose8x8(x));
      }
    }
    byteUnshuffle(typeSize, scratch, 0, dst, dstOff, n * typeSize);
  }

  /**
   * Transposes the 8x8 bit matrix whose row {@code j} is byte {@code j} of {@code x} (bit
   * {@code k} of the row = column {@code k}): afterwards bit {@code j} of byte {@code k} is the
   * old bit {@code k} of byte {@code j}. Three delta swaps; its own inverse.
   */
  static long transpose8x8(long x) {
    long t = (x ^ (x >>> 7)) & 0x00AA00AA00AA00AAL;
    x = x ^ t ^ (t << 7);
    t = (x ^ (x >>> 14)) & 0x0000CCCC0000CCCCL;
    x = x ^ t ^ (t << 14);
    t = (x ^ (x >>> 28)) & 0x00000000F0F0F0F0L;
    return x ^ t ^ (t << 28);
  }
}
