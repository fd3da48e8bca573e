package org.sunder.blockwise.graph;

import java.util.Arrays;
import java.util.List;
import net.imglib2.Cursor;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.ByteArray;
import net.imglib2.img.basictypeaccess.array.FloatArray;
import net.imglib2.type.BooleanType;
import net.imglib2.type.numeric.RealType;
import net.imglib2.type.numeric.integer.UnsignedByteType;
import net.imglib2.type.numeric.real.FloatType;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.grid.Shapes;

/**
 * A box of affinities: its global position, its shape, one channel per offset, and an optional
 * mask. Values are either {@code float} in [0, 1] or quantized bytes ({@code a = value / 255}).
 *
 * <p>Layout is channel last, dimension 0 fastest: the value of channel {@code k} at voxel index
 * {@code i} (memory order inside the box) is at {@code i + k * voxelCount()}. That flat index is
 * also the id of the implicit edge (voxel {@code i}, offset {@code k}) of {@link GridGraph}.
 *
 * <p>The factories validate the data (channel count equals offset count, dimensions agree,
 * float values are neither NaN nor outside [0, 1], mask shape equals box shape) and throw
 * {@link GraphInputException} naming the voxel, channel or value. The value arrays are wrapped,
 * not copied: callers must not change them afterwards. Immutable and thread-safe after that.
 *
 * <p>A block may carry a <em>context</em> ({@link #withContext}): affinities of a wider box
 * around it, at least its nearest-neighbour channels, for voxel-level work whose result at a
 * voxel depends on more of the volume than the offsets reach (the fragment methods' watershed;
 * with every channel, the moves of their border voxels).
 */
public final class AffinityBlock {
  private final long[] globalMin;
  private final int[] shape;
  private final int voxelCount;
  private final Offsets offsets;
  private final float[] floats;
  private final byte[] bytes;
  private final byte[] mask;
  private final AffinityBlock context;

  private AffinityBlock(long[] globalMin, int[] shape, Offsets offsets, float[] floats,
      byte[] bytes, byte[] mask) {
    this(globalMin, shape, offsets, floats, bytes, mask, null);
  }

  private AffinityBlock(long[] globalMin, int[] shape, Offsets offsets, float[] floats,
      byte[] bytes, byte[] mask, AffinityBlock context) {
    this.globalMin = globalMin.clone();
    this.shape = shape.clone();
    this.offsets = offsets;
    this.floats = floats;
    this.bytes = bytes;
    this.mask = mask;
    this.context = context;
    this.voxelCount = Shapes.intElementCount(shape);
  }

  /**
   * This block with {@code context} as its context: a block (itself without a context) whose
   * box holds this one's, with a channel for every nearest-neighbour offset of this block's.
   * Shares this block's arrays.
   */
  public AffinityBlock withContext(AffinityBlock context) {
    if (context.context != null) {
      throw input("context: a context block must not carry a context of its own");
    }
    if (context.dimension() != dimension()) {
      throw input("context: " + context.dimension() + " axes; the block has " + dimension());
    }
    for (int d = 0; d < shape.length; d++) {
      if (context.globalMin[d] > globalMin[d]
          || context.globalMin[d] + context.shape[d] < globalMin[d] + shape[d]) {
        throw input("context: box at " + Arrays.toString(context.globalMin) + " of shape "
            + Arrays.toString(context.shape) + " does not hold the block's box at "
            + Arrays.toString(globalMin) + " of shape " + Arrays.toString(shape));
      }
    }
    List<int[]> contextVectors = Arrays.asList(context.offsets.vectors());
    for (int k = 0; k < offsets.count(); k++) {
      int[] v = offsets.vector(k);
      if (!offsets.isLongRange(k) && contextVectors.stream().noneMatch(c -> Arrays.equals(c, v))) {
        throw input("context: no channel for the nearest-neighbour offset " + Arrays.toString(v));
      }
    }
    return new AffinityBlock(globalMin, shape, offsets, floats, bytes, mask, context);
  }

  /** The context set by {@link #withContext}, or null. */
  public AffinityBlock contextOrNull() {
    return context;
  }

  /**
   * Where this block's box starts inside its context's box, per axis (memory order); only for a
   * block with a context.
   */
  public int[] originInContext() {
    int[] origin = new int[shape.length];
    for (int d = 0; d < shape.length; d++) {
      origin[d] = (int) (globalMin[d] - context.globalMin[d]);
    }
    return origin;
  }

  /**
   * Wraps an affinity image with dims {@code (box..., channels)} of {@link FloatType} or
   * {@link UnsignedByteType}. The mask, if not null, has dims {@code box...} and any integer or
   * boolean type; non-zero means inside. The mask is copied into bytes; affinities are wrapped.
   */
  public static AffinityBlock of(ArrayImg<?, ?> affinities, long[] globalMin, Offsets offsets,
      ArrayImg<?, ?> maskOrNull) {
    int n = affinities.numDimensions() - 1;
    if (n < 1) {
      throw input("affinities: expected dims (box axes..., channels), got "
          + affinities.numDimensions() + " dimension(s)");
    }
    int[] shape = new int[n];
    for (int d = 0; d < n; d++) {
      shape[d] = Math.toIntExact(affinities.dimension(d));
    }
    int channels = Math.toIntExact(affinities.dimension(n));
    checkShape(shape, channels, globalMin, offsets);
    byte[] mask = maskOrNull == null ? null : maskBytes(maskOrNull, shape);
    Object type = affinities.firstElement();
    Object storage = affinities.update(null);
    if (type instanceof FloatType && storage instanceof FloatArray array) {
      return ofFloats(array.getCurrentStorageArray(), shape, globalMin, offsets, mask);
    }
    if (type instanceof UnsignedByteType && storage instanceof ByteArray array) {
      return ofBytes(array.getCurrentStorageArray(), shape, globalMin, offsets, mask);
    }
    throw input("affinities: element type " + type.getClass().getSimpleName()
        + " is not supported; expected FloatType (FLOAT32) or UnsignedByteType (UINT8)");
  }

  /** Wraps float affinities, channel last; validates every value. Mask: 1 = inside, or null. */
  public static AffinityBlock ofFloats(float[] values, int[] shape, long[] globalMin,
      Offsets offsets, byte[] maskOrNull) {
    checkShape(shape, offsets.count(), globalMin, offsets);
    int voxels = Shapes.intElementCount(shape);
    checkLength(values.length, voxels, offsets.count());
    checkMask(maskOrNull, voxels);
    for (int i = 0; i < values.length; i++) {
      float a = values[i];
      if (!(a >= 0f && a <= 1f)) {
        throw input("affinities: value " + a + " at voxel "
            + Arrays.toString(coordinates(i % voxels, shape)) + " (memory order, block min "
            + Arrays.toString(globalMin) + "), channel " + (i / voxels)
            + "; expected a number in [0, 1]");
      }
    }
    return new AffinityBlock(globalMin, shape, offsets, values, null, maskOrNull);
  }

  /** Wraps 8-bit affinities ({@code a = (value & 0xff) / 255}), channel last. */
  public static AffinityBlock ofBytes(byte[] values, int[] shape, long[] globalMin,
      Offsets offsets, byte[] maskOrNull) {
    checkShape(shape, offsets.count(), globalMin, offsets);
    int voxels = Shapes.intElementCount(shape);
    checkLength(values.length, voxels, offsets.count());
    checkMask(maskOrNull, voxels);
    return new AffinityBlock(globalMin, shape, offsets, null, values, maskOrNull);
  }

  public int dimension() {
    return shape.length;
  }

  /** A copy of the box shape, memory order. */
  public int[] shape() {
    return shape.clone();
  }

  public int shape(int d) {
    return shape[d];
  }

  /** A copy of the global coordinate of the box's first voxel, memory order. */
  public long[] globalMin() {
    return globalMin.clone();
  }

  public long globalMin(int d) {
    return globalMin[d];
  }

  public int voxelCount() {
    return voxelCount;
  }

  public int channelCount() {
    return offsets.count();
  }

  public Offsets offsets() {
    return offsets;
  }

  /** True for 8-bit affinities. */
  public boolean isQuantized() {
    return bytes != null;
  }

  /** Affinity of channel {@code k} at voxel {@code voxel}, in [0, 1]. */
  public float affinity(int voxel, int k) {
    int i = voxel + k * voxelCount;
    return bytes != null ? (bytes[i] & 0xff) / 255f : floats[i];
  }

  /** The byte value 0..255 of channel {@code k} at {@code voxel}; only for quantized blocks. */
  public int quantized(int voxel, int k) {
    return bytes[voxel + k * voxelCount] & 0xff;
  }

  /** True when there is no mask or the mask marks {@code voxel} inside. */
  public boolean inside(int voxel) {
    return mask == null || mask[voxel] != 0;
  }

  public boolean hasMask() {
    return mask != null;
  }

  /** The wrapped mask (1 = inside), or null without a mask. Do not modify. */
  public byte[] maskOrNull() {
    return mask;
  }

  /** The wrapped float values, or null for a quantized block. Do not modify. */
  public float[] floatValuesOrNull() {
    return floats;
  }

  /** The wrapped byte values, or null for a float block. Do not modify. */
  public byte[] byteValuesOrNull() {
    return bytes;
  }

  /** Coordinates inside the box of a voxel index; allocates. */
  public int[] position(int voxel) {
    return coordinates(voxel, shape);
  }

  /** Voxel index inside the box of coordinates (memory order). */
  public int index(int[] position) {
    int index = 0;
    for (int d = shape.length - 1; d >= 0; d--) {
      index = index * shape[d] + position[d];
    }
    return index;
  }

  private static int[] coordinates(int voxel, int[] shape) {
    int[] p = new int[shape.length];
    int rest = voxel;
    for (int d = 0; d < shape.length; d++) {
      p[d] = rest % shape[d];
      rest /= shape[d];
    }
    return p;
  }

  private static void checkShape(int[] shape, int channels, long[] globalMin, Offsets offsets) {
    offsets.requireDimension(shape.length, "offsets");
    if (globalMin.length != shape.length) {
      throw input("block min " + Arrays.toString(globalMin) + " has " + globalMin.length
          + " axes but the affinities have " + shape.length);
    }
    for (int s : shape) {
      if (s < 1) {
        throw input("affinities: box shape " + Arrays.toString(shape) + " has an empty axis");
      }
    }
    if (channels != offsets.count()) {
      throw input("affinities: " + channels + " channel(s) but " + offsets.count()
          + " offset(s); expected one channel per offset");
    }
    if (Shapes.elementCount(shape) * channels > Integer.MAX_VALUE - 8) {
      throw input("affinities: box " + Arrays.toString(shape) + " x " + channels
          + " channels exceeds 2^31 values; use smaller blocks");
    }
  }

  private static void checkLength(int length, int voxels, int channels) {
    if (length != (long) voxels * channels) {
      throw input("affinities: array holds " + length + " values; expected " + voxels
          + " voxels x " + channels + " channels");
    }
  }

  private static void checkMask(byte[] mask, int voxels) {
    if (mask != null && mask.length != voxels) {
      throw input("mask: array holds " + mask.length + " values; expected " + voxels);
    }
  }

  private static byte[] maskBytes(ArrayImg<?, ?> maskImg, int[] shape) {
    if (maskImg.numDimensions() != shape.length) {
      throw input("mask: " + maskImg.numDimensions() + " dimension(s); expected "
          + shape.length);
    }
    for (int d = 0; d < shape.length; d++) {
      if (maskImg.dimension(d) != shape[d]) {
        throw input("mask: shape differs from the affinity box " + Arrays.toString(shape)
            + " at axis " + d);
      }
    }
    byte[] mask = new byte[Shapes.intElementCount(shape)];
    Cursor<?> cursor = maskImg.cursor();
    int i = 0;
    while (cursor.hasNext()) {
      Object value = cursor.next();
      boolean on;
      if (value instanceof BooleanType<?> b) {
        on = b.get();
      } else if (value instanceof RealType<?> r) {
        on = r.getRealDouble() != 0;
      } else {
        throw input("mask: element type " + value.getClass().getSimpleName()
            + " is not supported; expected an integer or boolean type");
      }
      mask[i++] = (byte) (on ? 1 : 0);
    }
    return mask;
  }

  private static GraphInputException input(String message) {
    return new GraphInputException(ErrorKind.INVALID_INPUT, message);
  }
}
