package org.sunder.blockwise.metrics;

import java.io.Serializable;
import java.util.Arrays;
import net.imglib2.FinalInterval;
import net.imglib2.Interval;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.Face;

/**
 * The planes a {@link SeamAudit} looks at: every block face of a grid of core shape
 * {@code blockShape}, and for each face a control plane half a block below it. A pure immutable
 * value; thread-safe.
 *
 * <p>Geometry. Along axis {@code d} with core size {@code B} and {@code G = ceil(S / B)} blocks
 * over a volume of {@code S} voxels, face {@code k} ({@code 1 <= k < G}) lies between voxel layers
 * {@code k B - 1} and {@code k B}; its control plane lies between layers {@code k B - h - 1} and
 * {@code k B - h}, {@code h = floor(B / 2)}: the middle of the (always whole) block below the
 * face. This is the face grid shifted by half a block, keeping one control plane per face so
 * that both sets have the same number of planes and the same areas, and a cut count on one is
 * comparable with the other. Axes with {@code B < 2} have no plane between faces and are left
 * out of both sets.
 *
 * <p>A plane is named by its position: the coordinate of its upper voxel layer. Planes are
 * numbered axis by axis, face {@code k} as {@code 2 (k - 1)} and its control plane as
 * {@code 2 (k - 1) + 1} after the planes of lower axes; {@link #isControl} is the parity.
 */
public final class SeamPlanes implements Serializable {
  private static final long serialVersionUID = 1L;

  private final long[] volumeShape;
  private final int[] blockShape;
  private final int[] planeBase;

  /**
   * @param volumeShape voxels per dimension, memory order
   * @param blockShape block core shape, memory order, every entry {@code > 0}
   * @throws SunderException {@link ErrorKind#INVALID_CONFIG} naming the bad shape
   */
  public SeamPlanes(long[] volumeShape, int[] blockShape) {
    int n = volumeShape.length;
    if (n == 0 || blockShape.length != n) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "seam audit: block shape "
          + Arrays.toString(blockShape) + " and volume shape " + Arrays.toString(volumeShape)
          + " (memory order) must have the same, non-zero number of dimensions");
    }
    for (int d = 0; d < n; d++) {
      if (blockShape[d] <= 0 || volumeShape[d] <= 0) {
        throw new SunderException(ErrorKind.INVALID_CONFIG, "seam audit: block shape "
            + Arrays.toString(blockShape) + " and volume shape " + Arrays.toString(volumeShape)
            + " (memory order) must be positive along every axis");
      }
    }
    this.volumeShape = volumeShape.clone();
    this.blockShape = blockShape.clone();
    planeBase = new int[n + 1];
    for (int d = 0; d < n; d++) {
      long count = 2 * facesAlong(d);
      if (planeBase[d] + count > Integer.MAX_VALUE) {
        throw new SunderException(ErrorKind.INVALID_CONFIG, "seam audit: block shape "
            + Arrays.toString(blockShape) + " gives more than " + Integer.MAX_VALUE + " planes");
      }
      planeBase[d + 1] = planeBase[d] + (int) count;
    }
  }

  private long facesAlong(int d) {
    if (blockShape[d] < 2) {
      return 0;
    }
    return (volumeShape[d] + blockShape[d] - 1) / blockShape[d] - 1;
  }

  public long[] volumeShape() {
    return volumeShape.clone();
  }

  public int[] blockShape() {
    return blockShape.clone();
  }

  public int numDimensions() {
    return volumeShape.length;
  }

  /** Face planes plus control planes. */
  public int planeCount() {
    return planeBase[planeBase.length - 1];
  }

  /** The number of face planes (equal to the number of control planes). */
  public int facePlaneCount() {
    return planeCount() / 2;
  }

  /** How far below its face a control plane lies along {@code axis}: {@code floor(B / 2)}. */
  public int controlShift(int axis) {
    return blockShape[axis] / 2;
  }

  /**
   * The plane on {@code axis} whose upper voxel layer is {@code position}, or -1 if no audited
   * plane lies there. O(1).
   */
  public int planeIndex(int axis, long position) {
    long b = blockShape[axis];
    long faces = facesAlong(axis);
    if (position % b == 0) {
      long k = position / b;
      return k >= 1 && k <= faces ? planeBase[axis] + (int) (2 * (k - 1)) : -1;
    }
    long shifted = position + controlShift(axis);
    if (shifted % b == 0) {
      long k = shifted / b;
      return k >= 1 && k <= faces ? planeBase[axis] + (int) (2 * (k - 1)) + 1 : -1;
    }
    return -1;
  }

  /** Whether {@code plane} is a control plane (else a block face). */
  public boolean isControl(int plane) {
    return ((plane - planeBase[axis(plane)]) & 1) == 1;
  }

  /** The axis {@code plane} is normal to. */
  public int axis(int plane) {
    if (plane < 0 || plane >= planeCount()) {
      throw new IndexOutOfBoundsException("plane " + plane + " outside 0.." + (planeCount() - 1));
    }
    int d = 0;
    while (plane >= planeBase[d + 1]) {
      d++;
    }
    return d;
  }

  /** The coordinate of the upper voxel layer of {@code plane} along its axis. */
  public long position(int plane) {
    int d = axis(plane);
    int offset = plane - planeBase[d];
    long face = (long) (offset / 2 + 1) * blockShape[d];
    return (offset & 1) == 0 ? face : face - controlShift(d);
  }

  /**
   * The two slabs that cover one face of a {@link org.sunder.blockwise.grid.BlockGrid} with this
   * core shape: the face's two voxel layers over its lateral extent, and the same extent around
   * its control plane (inclusive boxes, global coordinates, memory order). Over all faces of the
   * grid these slabs hold every pair a seam audit counts exactly once. Empty when the face's axis
   * is left out ({@code B < 2}). Allocates.
   */
  public Interval[] slabsOf(Face face) {
    int a = face.axis();
    if (blockShape[a] < 2) {
      return new Interval[0];
    }
    long[] min = face.lateralMin();
    long[] max = face.lateralMax();
    min[a] = face.position() - 1;
    max[a] = face.position();
    Interval atFace = new FinalInterval(min, max);
    min[a] -= controlShift(a);
    max[a] -= controlShift(a);
    return new Interval[] {atFace, new FinalInterval(min, max)};
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof SeamPlanes p && Arrays.equals(volumeShape, p.volumeShape)
        && Arrays.equals(blockShape, p.blockShape);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(volumeShape) * 31 + Arrays.hashCode(blockShape);
  }

  @Override
  public String toString() {
    return "SeamPlanes[volume " + Arrays.toString(volumeShape) + ", block "
        + Arrays.toString(blockShape) + ", " + facePlaneCount() + " faces + as many controls]";
  }
}
