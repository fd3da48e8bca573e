package org.sunder.blockwise.store;

/**
 * Copies and fills boxes inside dense arrays in memory order (dimension 0 fastest), one row
 * along dimension 0 at a time with {@link System#arraycopy}. O(elements) with O(rows) calls.
 */
final class BoxCopy {
  private BoxCopy() {}

  /**
   * Copies the box of {@code size} at {@code srcPos} in {@code src} (dims {@code srcDims}) to
   * {@code dstPos} in {@code dst} (dims {@code dstDims}). Arrays are of the same primitive type.
   */
  static void copy(Object src, int[] srcDims, int[] srcPos, Object dst, int[] dstDims,
      int[] dstPos, int[] size) {
    int n = size.length;
    for (int d = 0; d < n; d++) {
      if (size[d] == 0) {
        return;
      }
    }
    int[] srcStride = strides(srcDims);
    int[] dstStride = strides(dstDims);
    int srcOffset = offset(srcPos, srcStride);
    int dstOffset = offset(dstPos, dstStride);
    int[] counter = new int[n];
    int row = size[0];
    while (true) {
      System.arraycopy(src, srcOffset, dst, dstOffset, row);
      int d = 1;
      while (d < n) {
        counter[d]++;
        srcOffset += srcStride[d];
        dstOffset += dstStride[d];
        if (counter[d] < size[d]) {
          break;
        }
        srcOffset -= srcStride[d] * size[d];
        dstOffset -= dstStride[d] * size[d];
        counter[d] = 0;
        d++;
      }
      if (d >= n) {
        return;
      }
    }
  }

  /** Sets the box of {@code size} at {@code pos} in {@code dst} (dims {@code dims}) to fill. */
  static void fill(Object dst, int[] dims, int[] pos, int[] size, FillValue fill) {
    int n = size.length;
    for (int d = 0; d < n; d++) {
      if (size[d] == 0) {
        return;
      }
    }
    int[] stride = strides(dims);
    int offset = offset(pos, stride);
    int[] counter = new int[n];
    while (true) {
      ElementArrays.fill(dst, offset, offset + size[0], fill);
      int d = 1;
      while (d < n) {
        counter[d]++;
        offset += stride[d];
        if (counter[d] < size[d]) {
          break;
        }
        offset -= stride[d] * size[d];
        counter[d] = 0;
        d++;
      }
      if (d >= n) {
        return;
      }
    }
  }

  /**
   * Reorders the bytes of a chunk of {@code dims} (memory order) between memory order and
   * Fortran order (the last memory dimension fastest); {@code toMemory} picks the direction.
   */
  static byte[] transpose(byte[] bytes, int[] dims, int elementSize, boolean toMemory) {
    int n = dims.length;
    byte[] out = new byte[bytes.length];
    int[] fStride = new int[n];
    int s = 1;
    for (int d = n - 1; d >= 0; d--) {
      fStride[d] = s;
      s *= dims[d];
    }
    int[] counter = new int[n];
    int fIndex = 0;
    int total = s;
    for (int mIndex = 0; mIndex < total; mIndex++) {
      int from = (toMemory ? fIndex : mIndex) * elementSize;
      int to = (toMemory ? mIndex : fIndex) * elementSize;
      System.arraycopy(bytes, from, out, to, elementSize);
      for (int d = 0; d < n; d++) {
        counter[d]++;
        fIndex += fStride[d];
        if (counter[d] < dims[d]) {
          break;
        }
        fIndex -= fStride[d] * dims[d];
        counter[d] = 0;
      }
    }
    return out;
  }

  static int[] strides(int[] dims) {
    int[] stride = new int[dims.length];
    int s = 1;
    for (int d = 0; d < dims.length; d++) {
      stride[d] = s;
      s *= dims[d];
    }
    return stride;
  }

  private static int offset(int[] pos, int[] stride) {
    int offset = 0;
    for (int d = 0; d < pos.length; d++) {
      offset += pos[d] * stride[d];
    }
    return offset;
  }
}
