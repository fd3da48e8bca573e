package org.sunder.blockwise.grid;

/**
 * A warning, not an error: along {@code axis} the halo is shorter than the longest offset, so
 * a block's partition near its core border sees fewer long-range edges than a whole-volume
 * partition would. Allowed (a smaller halo is cheaper); the caller decides whether to print it.
 *
 * @param axis the dimension, memory order (0 = x)
 * @param halo the halo along that axis, in voxels
 * @param longestOffset the largest |component| of any offset along that axis
 */
public record HaloShortfall(int axis, int halo, int longestOffset) {

  /** A sentence for the user. */
  public String message() {
    return "halo along axis " + "xyzct".charAt(Math.min(axis, 4)) + " (memory dimension " + axis
        + ") is " + halo + " voxels, shorter than the longest offset along it (" + longestOffset
        + "); blocks will see fewer long-range edges near their borders";
  }
}
