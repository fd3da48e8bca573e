package org.sunder.blockwise.store.codec;

/**
 * Blosc's byte shuffle and bit shuffle of one block, and their inverses.
 *
 * <p>Byte shuffle (c-blosc {@code shuffle-generic}): byte {@code j} of element {@code i} goes to
 * {@code j * n + i} for the {@code n = blockSize / typeSize} whole elements; trailing bytes stay.
 *
 * <p>Bit shuffle (the bitshuffle algorithm as blosc 1 embeds it, {@code bshuf_trans_bit_elem}):
 * for {@code n} elements, a multiple of 8, bit {@code k} of byte {@code b} of element {@code e}
 * goes to bit {@code e % 8} of byte {@code (b * 8 + k) * n / 8 + e / 8}. Blosc 1 copies blocks
 * whose element count is not a multiple of 8 unchanged.
 */
final class Shuffle {
  private Shuffle() {}

  static void byteShuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize) {
    int n = blockSize / typeSize;
    for (int j = 0; j < typeSize; j++) {
      int to = dstOff + j * n;
      int from = srcOff + j;
      for (int i = 0; i < n; i++) {
        dst[to + i] = src[from + i * typeSize];
      }
    }
    int whole = n * typeSize;
    System.arraycopy(src, srcOff + whole, dst, dstOff + whole, blockSize - whole);
  }

  static void byteUnshuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize) {
    int n = blockSize / typeSize;
    for (int j = 0; j < typeSize; j++) {
      int from = srcOff + j * n;
      int to = dstOff + j;
      for (int i = 0; i < n; i++) {
        dst[to + i * typeSize] = src[from + i];
      }
    }
    int whole = n * typeSize;
    System.arraycopy(src, srcOff + whole, dst, dstOff + whole, blockSize - whole);
  }

  static void bitShuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize) {
    int n = blockSize / typeSize;
    if (n % 8 != 0) {
      System.arraycopy(src, srcOff, dst, dstOff, blockSize);
      return;
    }
    int row = n / 8;
    for (int b = 0; b < typeSize; b++) {
      for (int group = 0; group < row; group++) {
        long x = 0;
        int from = srcOff + group * 8 * typeSize + b;
        for (int j = 0; j < 8; j++) {
          x |= (src[from + j * typeSize] & 0xffL) << (8 * j);
        }
        x = transpose8x8(x);
        int to = dstOff + b * 8 * row + group;
        for (int k = 0; k < 8; k++) {
          dst[to + k * row] = (byte) (x >>> (8 * k));
        }
      }
    }
  }

  static void bitUnshuffle(int typeSize, byte[] src, int srcOff, byte[] dst, int dstOff,
      int blockSize) {
    int n = blockSize / typeSize;
    if (n % 8 != 0) {
      System.arraycopy(src, srcOff, dst, dstOff, blockSize);
      return;
    }
    int row = n / 8;
    for (int b = 0; b < typeSize; b++) {
      for (int group = 0; group < row; group++) {
        long x = 0;
        int from = srcOff + b * 8 * row + group;
        for (int k = 0; k < 8; k++) {
          x |= (src[from + k * row] & 0xffL) << (8 * k);
        }
        x = transpose8x8(x);
        int to = dstOff + group * 8 * typeSize + b;
        for (int j = 0; j < 8; j++) {
          dst[to + j * typeSize] = (byte) (x >>> (8 * j));
        }
      }
    }
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
