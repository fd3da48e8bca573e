package org.sunder.blockwise.synth;

import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * The affinities a perfect network would predict from a ground-truth label volume: channel
 * {@code k} at voxel {@code p} is 1 iff {@code p + offset_k} lies in the volume and both voxels
 * carry the same non-zero label, else 0. So background (label 0) has affinity 0 to everything,
 * itself included, and an edge leaving the volume is 0.
 *
 * <p>Layout: channel last, voxel index fastest: value of channel {@code k} at voxel {@code i}
 * (memory order, x fastest) sits at {@code i + k * voxelCount}, matching a dataset of memory
 * dims {@code [x, y, z, c]}. Offsets are in memory order. {@code O(n * channels)}.
 */
public final class ExactAffinities {
  private ExactAffinities() {}

  /** Float affinities in {0, 1}; allocates {@code 4 * n * channels} bytes. */
  public static float[] compute(long[] labels, long[] shape, int[][] offsets) {
    int n = voxelCount(labels, shape);
    validate(offsets, shape.length);
    if ((long) n * offsets.length > Integer.MAX_VALUE - 8) {
      throw new IllegalArgumentException(n + " voxels x " + offsets.length
          + " channels do not fit one Java array");
    }
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    float[] out = new float[n * offsets.length];
    for (int k = 0; k < offsets.length; k++) {
      int[] d = offsets[k];
      int shift = d[0] + nx * (d[1] + ny * d[2]);
      int base = k * n;
      for (int z = Math.max(0, -d[2]); z < Math.min(nz, nz - d[2]); z++) {
        for (int y = Math.max(0, -d[1]); y < Math.min(ny, ny - d[1]); y++) {
          int row = nx * (y + ny * z);
          for (int x = Math.max(0, -d[0]); x < Math.min(nx, nx - d[0]); x++) {
            int i = row + x;
            long l = labels[i];
            if (l != 0 && labels[i + shift] == l) {
              out[base + i] = 1f;
            }
          }
        }
      }
    }
    return out;
  }

  /**
   * Quantizes affinities in [0, 1] to unsigned bytes, {@code round(255 * a)}, the UINT8
   * encoding of the contracts ({@code a = value / 255}).
   */
  public static byte[] toUint8(float[] affinities) {
    byte[] out = new byte[affinities.length];
    for (int i = 0; i < out.length; i++) {
      float a = affinities[i];
      a = a < 0 ? 0 : (a > 1 ? 1 : a);
      out[i] = (byte) Math.round(a * 255f);
    }
    return out;
  }

  /**
   * Checks an offset list: at least one offset, each with one entry per axis, none zero.
   *
   * @throws SunderException {@link ErrorKind#INVALID_CONFIG} naming the bad offset
   */
  public static void validate(int[][] offsets, int dimensions) {
    if (offsets == null || offsets.length == 0) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "offsets: need at least one offset");
    }
    for (int k = 0; k < offsets.length; k++) {
      int[] d = offsets[k];
      boolean zero = d != null && Arrays.stream(d).allMatch(v -> v == 0);
      if (d == null || d.length != dimensions || zero) {
        throw new SunderException(ErrorKind.INVALID_CONFIG, "offsets[" + k + "] = "
            + Arrays.toString(d) + ": expected " + dimensions + " integers, not all zero");
      }
    }
  }

  private static int voxelCount(long[] labels, long[] shape) {
    if (shape.length != 3) {
      throw new IllegalArgumentException("shape must have 3 axes, got " + Arrays.toString(shape));
    }
    long n = shape[0] * shape[1] * shape[2];
    if (n != labels.length) {
      throw new IllegalArgumentException("labels hold " + labels.length + " voxels, shape "
          + Arrays.toString(shape) + " has " + n);
    }
    return (int) n;
  }
}
