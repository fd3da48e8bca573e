package org.sunder.blockwise.store.codec;

import java.io.IOException;

/**
 * Decompression of BloscLZ, blosc's own LZ77 variant (c-blosc {@code blosclz.c}). Every control
 * byte below 32 starts a run of {@code ctrl + 1} literal bytes; above, a match of length
 * {@code (ctrl >> 5) + 2} (7 in the top bits extends the length with bytes until one is not 255)
 * at distance {@code ((ctrl & 31) << 8) + next + 1}, or, when that next byte is 255 and the high
 * bits are 31, at a 16-bit distance plus 8192. The first control byte carries a format marker in
 * bit 5, which is ignored. Bounds are checked; corrupt input raises {@link IOException}.
 */
final class BloscLz {
  private static final int MAX_DISTANCE = 8191;

  private BloscLz() {}

  /** Decodes {@code length} bytes at {@code offset} into {@code out}; returns the size written. */
  static int decompress(byte[] in, int offset, int length, byte[] out, int outOffset,
      int maxOut) throws IOException {
    if (length == 0) {
      throw new IOException("blosclz stream is empty");
    }
    int ip = offset;
    int ipLimit = offset + length;
    int op = outOffset;
    int opLimit = outOffset + maxOut;
    int ctrl = in[ip++] & 31;
    while (true) {
      if (ctrl >= 32) {
        int len = (ctrl >>> 5) - 1;
        int ofs = (ctrl & 31) << 8;
        if (len == 6) {
          int code;
          do {
            if (ip >= ipLimit) {
              throw truncated(ip - offset);
            }
            code = in[ip++] & 0xff;
            len += code;
          } while (code == 255);
        }
        if (ip >= ipLimit) {
          throw truncated(ip - offset);
        }
        int code = in[ip++] & 0xff;
        len += 3;
        int distance = ofs + code + 1;
        if (code == 255 && ofs == (31 << 8)) {
          if (ip + 1 >= ipLimit) {
            throw truncated(ip - offset);
          }
          int far = ((in[ip] & 0xff) << 8) | (in[ip + 1] & 0xff);
          ip += 2;
          distance = far + MAX_DISTANCE + 1;
        }
        int ref = op - distance;
        if (ref < outOffset || op + len > opLimit) {
          throw new IOException("blosclz match at input byte " + (ip - offset)
              + " reaches outside the output (distance " + distance + ", length " + len + ")");
        }
        if (distance >= len) {
          System.arraycopy(out, ref, out, op, len);
          op += len;
        } else {
          for (int i = 0; i < len; i++) {
            out[op++] = out[ref++];
          }
        }
        if (ip >= ipLimit) {
          break;
        }
        ctrl = in[ip++] & 0xff;
      } else {
        int run = ctrl + 1;
        if (op + run > opLimit || ip + run > ipLimit) {
          throw new IOException("blosclz literal run of " + run + " bytes at input byte "
              + (ip - offset) + " reaches past the " + (op + run > opLimit ? "output" : "input"));
        }
        System.arraycopy(in, ip, out, op, run);
        ip += run;
        op += run;
        if (ip >= ipLimit) {
          break;
        }
        ctrl = in[ip++] & 0xff;
      }
    }
    return op - outOffset;
  }

  private static IOException truncated(int at) {
    return new IOException("blosclz stream ends inside a match at byte " + at);
  }
}
