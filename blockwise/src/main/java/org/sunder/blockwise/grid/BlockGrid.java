package org.sunder.blockwise.grid;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * The division of a volume into blocks: cores of whole chunks, a halo per axis around each
 * core, faces between adjacent cores. A pure immutable value: no I/O, every query computed from
 * the four shapes, thread-safe.
 *
 * <p>Geometry. The block at grid position {@code g} has core {@code [g * block, min((g + 1) *
 * block, volume) - 1]} along each axis, so the last block along an axis is cut off at the volume
 * border (as imglib2's {@code CellGrid} cuts off its border cell). Its extended box is the core
 * grown by the halo on both sides and clipped to the volume. Because the block shape is a
 * multiple of the chunk shape, every chunk belongs to exactly one core, so no two blocks write
 * one chunk.
 *
 * <p>Order. Block indices run over the grid with dimension 0 fastest. Faces are numbered axis by
 * axis (all faces normal to dimension 0 first), and within one axis in the order of their lower
 * block's index. Both orders depend only on the shapes.
 *
 * <p>All arrays are in memory order (dimension 0 fastest); accessors return copies.
 */
public final class BlockGrid implements Serializable {
  private static final long serialVersionUID = 1L;

  private final long[] volumeShape;
  private final int[] chunkShape;
  private final int[] blockShape;
  private final int[] halo;
  private final long[] gridShape;
  private final int blockCount;
  private final int[] faceBase;

  private BlockGrid(long[] volumeShape, int[] chunkShape, int[] blockShape, int[] halo) {
    this.volumeShape = volumeShape;
    this.chunkShape = chunkShape;
    this.blockShape = blockShape;
    this.halo = halo;
    int n = volumeShape.length;
    gridShape = new long[n];
    long count = 1;
    for (int d = 0; d < n; d++) {
      gridShape[d] = ceilDiv(volumeShape[d], blockShape[d]);
      count *= gridShape[d];
    }
    if (count > Integer.MAX_VALUE) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "block shape " + Arrays.toString(blockShape)
          + " (memory order) divides volume " + Arrays.toString(volumeShape) + " into " + count
          + " blocks; at most " + Integer.MAX_VALUE + " are supported, choose larger blocks");
    }
    blockCount = (int) count;
    faceBase = new int[n + 1];
    for (int d = 0; d < n; d++) {
      faceBase[d + 1] = faceBase[d] + (int) (count / gridShape[d] * (gridShape[d] - 1));
    }
  }

  /**
   * Validates the shapes and builds the grid.
   *
   * @param volumeShape voxels per dimension, memory order
   * @param chunkShape the storage chunk shape of the datasets involved
   * @param blockShape the core shape of a block; a multiple of {@code chunkShape} per dimension
   *     (it may exceed the volume, then one block covers that axis)
   * @param halo context voxels on each side of a core, per dimension, {@code >= 0}
   * @throws SunderException {@link ErrorKind#INVALID_CONFIG} naming the bad value; for a block
   *     shape that is not a multiple of the chunk shape the message suggests the nearest valid
   *     shapes
   */
  public static BlockGrid of(long[] volumeShape, int[] chunkShape, int[] blockShape, int[] halo) {
    int n = volumeShape.length;
    if (n == 0 || chunkShape.length != n || blockShape.length != n || halo.length != n) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "volume shape "
          + Arrays.toString(volumeShape) + ", chunk shape " + Arrays.toString(chunkShape)
          + ", block shape " + Arrays.toString(blockShape) + " and halo " + Arrays.toString(halo)
          + " must have the same, non-zero number of dimensions");
    }
    for (int d = 0; d < n; d++) {
      requirePositive("volume shape", volumeShape[d], volumeShape);
      requirePositive("chunk shape", chunkShape[d], chunkShape);
      requirePositive("block shape", blockShape[d], blockShape);
      if (halo[d] < 0) {
        throw new SunderException(ErrorKind.INVALID_CONFIG, "halo " + Arrays.toString(halo)
            + " (memory order) has a negative entry; expected >= 0 voxels per axis");
      }
    }
    requireChunkMultiple(chunkShape, blockShape);
    return new BlockGrid(volumeShape.clone(), chunkShape.clone(), blockShape.clone(), halo.clone());
  }

  private static void requirePositive(String what, long value, Object shape) {
    if (value <= 0) {
      String text = shape instanceof long[] l ? Arrays.toString(l) : Arrays.toString((int[]) shape);
      throw new SunderException(ErrorKind.INVALID_CONFIG,
          what + " " + text + " (memory order) has an entry " + value + "; expected > 0");
    }
  }

  private static void requireChunkMultiple(int[] chunkShape, int[] blockShape) {
    int n = chunkShape.length;
    int[] below = new int[n];
    int[] above = new int[n];
    boolean valid = true;
    for (int d = 0; d < n; d++) {
      int c = chunkShape[d];
      valid &= blockShape[d] % c == 0;
      below[d] = Math.max(c, blockShape[d] / c * c);
      above[d] = (int) Math.min(Integer.MAX_VALUE / c * (long) c, ceilDiv(blockShape[d], c) * c);
    }
    if (!valid) {
      String nearest = Arrays.equals(below, above) ? Arrays.toString(below)
          : Arrays.toString(below) + " or " + Arrays.toString(above);
      throw new SunderException(ErrorKind.INVALID_CONFIG, "block shape "
          + Arrays.toString(blockShape) + " (memory order) is not a multiple of the chunk shape "
          + Arrays.toString(chunkShape) + " along every axis, so two blocks would write one chunk;"
          + " nearest valid block shapes: " + nearest);
    }
  }

  private static long ceilDiv(long a, long b) {
    return (a + b - 1) / b;
  }

  public int numDimensions() {
    return volumeShape.length;
  }

  public long[] volumeShape() {
    return volumeShape.clone();
  }

  public int[] chunkShape() {
    return chunkShape.clone();
  }

  public int[] blockShape() {
    return blockShape.clone();
  }

  public int[] halo() {
    return halo.clone();
  }

  /** Blocks per dimension. */
  public long[] gridShape() {
    return gridShape.clone();
  }

  public int blockCount() {
    return blockCount;
  }

  /** The grid coordinate along {@code d} of the block whose core holds global voxel coordinate {@code x}. */
  public long blockCoordinate(int d, long x) {
    return x / blockShape[d];
  }

  /** The index of the block at {@code gridPosition} (dimension 0 fastest). */
  public int blockIndex(long[] gridPosition) {
    long index = 0;
    for (int d = gridPosition.length - 1; d >= 0; d--) {
      if (gridPosition[d] < 0 || gridPosition[d] >= gridShape[d]) {
        throw new IndexOutOfBoundsException("grid position " + Arrays.toString(gridPosition)
            + " outside grid " + Arrays.toString(gridShape));
      }
      index = index * gridShape[d] + gridPosition[d];
    }
    return (int) index;
  }

  /** The index of the block whose core holds the global voxel {@code position}. */
  public int blockIndexOfVoxel(long[] position) {
    long index = 0;
    for (int d = position.length - 1; d >= 0; d--) {
      index = index * gridShape[d] + position[d] / blockShape[d];
    }
    return (int) index;
  }

  /** The grid position of block {@code index} (allocates). */
  public long[] gridPosition(int index) {
    checkBlock(index);
    long[] position = new long[gridShape.length];
    long rest = index;
    for (int d = 0; d < position.length; d++) {
      position[d] = rest % gridShape[d];
      rest /= gridShape[d];
    }
    return position;
  }

  /** The block with the given index, {@code 0 <= index < blockCount()} (allocates). */
  public Block block(int index) {
    long[] g = gridPosition(index);
    int n = g.length;
    long[] coreMin = new long[n];
    long[] coreMax = new long[n];
    long[] extMin = new long[n];
    long[] extMax = new long[n];
    for (int d = 0; d < n; d++) {
      coreMin[d] = g[d] * blockShape[d];
      coreMax[d] = Math.min(coreMin[d] + blockShape[d], volumeShape[d]) - 1;
      extMin[d] = Math.max(0, coreMin[d] - halo[d]);
      extMax[d] = Math.min(volumeShape[d] - 1, coreMax[d] + halo[d]);
    }
    return new Block(index, g, coreMin, coreMax, extMin, extMax);
  }

  /** Every block, in index order (allocates). */
  public List<Block> blocks() {
    List<Block> blocks = new ArrayList<>(blockCount);
    for (int i = 0; i < blockCount; i++) {
      blocks.add(block(i));
    }
    return blocks;
  }

  private void checkBlock(int index) {
    if (index < 0 || index >= blockCount) {
      throw new IndexOutOfBoundsException("block " + index + " outside 0.." + (blockCount - 1));
    }
  }

  public int faceCount() {
    return faceBase[faceBase.length - 1];
  }

  /**
   * The index of the face on the upper side of {@code lowerBlock} along {@code axis}, or -1 when
   * that side is the volume border.
   */
  public int faceIndex(int lowerBlock, int axis) {
    long[] g = gridPosition(lowerBlock);
    if (g[axis] == gridShape[axis] - 1) {
      return -1;
    }
    long reduced = 0;
    for (int d = g.length - 1; d >= 0; d--) {
      long extent = d == axis ? gridShape[d] - 1 : gridShape[d];
      reduced = reduced * extent + g[d];
    }
    return faceBase[axis] + (int) reduced;
  }

  /**
   * The index of the face of {@code block} on its lower ({@code upperSide = false}) or upper side
   * along {@code axis}, or -1 when that side is the volume border.
   */
  public int faceIndex(int block, int axis, boolean upperSide) {
    if (upperSide) {
      return faceIndex(block, axis);
    }
    long[] g = gridPosition(block);
    if (g[axis] == 0) {
      return -1;
    }
    g[axis]--;
    return faceIndex(blockIndex(g), axis);
  }

  /** The face with the given index, {@code 0 <= index < faceCount()} (allocates). */
  public Face face(int index) {
    if (index < 0 || index >= faceCount()) {
      throw new IndexOutOfBoundsException("face " + index + " outside 0.." + (faceCount() - 1));
    }
    int axis = 0;
    while (index >= faceBase[axis + 1]) {
      axis++;
    }
    long rest = index - faceBase[axis];
    int n = gridShape.length;
    long[] g = new long[n];
    for (int d = 0; d < n; d++) {
      long extent = d == axis ? gridShape[d] - 1 : gridShape[d];
      g[d] = rest % extent;
      rest /= extent;
    }
    int lower = blockIndex(g);
    g[axis]++;
    int upper = blockIndex(g);
    Block lowerBlock = block(lower);
    long[] min = lowerBlock.coreMin();
    long[] max = lowerBlock.coreMax();
    long position = max[axis] + 1;
    min[axis] = position;
    max[axis] = position;
    return new Face(index, lower, upper, axis, position, min, max);
  }

  /** Every face, in index order (allocates). */
  public List<Face> faces() {
    List<Face> faces = new ArrayList<>(faceCount());
    for (int i = 0; i < faceCount(); i++) {
      faces.add(face(i));
    }
    return faces;
  }

  /** The faces of {@code block}, ascending (allocates). */
  public int[] faceIndicesOf(int block) {
    int n = gridShape.length;
    int[] faces = new int[2 * n];
    int count = 0;
    for (int d = 0; d < n; d++) {
      for (int side = 0; side < 2; side++) {
        int face = faceIndex(block, d, side == 1);
        if (face >= 0) {
          faces[count++] = face;
        }
      }
    }
    int[] result = Arrays.copyOf(faces, count);
    Arrays.sort(result);
    return result;
  }

  /** Chunks per dimension of a dataset with this grid's volume and chunk shape. */
  public long[] chunkGridShape() {
    long[] shape = new long[volumeShape.length];
    for (int d = 0; d < shape.length; d++) {
      shape[d] = ceilDiv(volumeShape[d], chunkShape[d]);
    }
    return shape;
  }

  /** The total number of chunks. */
  public long chunkCount() {
    return Shapes.elementCount(chunkGridShape());
  }

  /** The grid position of chunk {@code index} (dimension 0 fastest; allocates). */
  public long[] chunkPosition(long index) {
    long[] shape = chunkGridShape();
    if (index < 0 || index >= chunkCount()) {
      throw new IndexOutOfBoundsException("chunk " + index + " outside 0.." + (chunkCount() - 1));
    }
    long[] position = new long[shape.length];
    for (int d = 0; d < shape.length; d++) {
      position[d] = index % shape[d];
      index /= shape[d];
    }
    return position;
  }

  /**
   * The grid positions of the chunks in a block's core, dimension 0 fastest (allocates).
   * Together over all blocks these are every chunk exactly once.
   */
  public List<long[]> chunkPositionsOf(int block) {
    Block b = block(block);
    int n = volumeShape.length;
    long[] first = new long[n];
    long[] last = new long[n];
    long total = 1;
    for (int d = 0; d < n; d++) {
      first[d] = b.coreMin()[d] / chunkShape[d];
      last[d] = b.coreMax()[d] / chunkShape[d];
      total *= last[d] - first[d] + 1;
    }
    List<long[]> positions = new ArrayList<>((int) total);
    long[] p = first.clone();
    for (long i = 0; i < total; i++) {
      positions.add(p.clone());
      for (int d = 0; d < n; d++) {
        if (++p[d] <= last[d]) {
          break;
        }
        p[d] = first[d];
      }
    }
    return positions;
  }

  /**
   * Whole chunks, grown one chunk at a time along the axis with the fewest voxels that is still
   * shorter than the volume, until the shape holds at least {@code minVoxels} voxels or covers
   * the volume: the default block shape of a run and the box shape of an evaluation.
   * O(n x chunks added).
   */
  public static int[] wholeChunkShape(long[] volume, int[] chunks, long minVoxels) {
    int n = volume.length;
    int[] shape = chunks.clone();
    while (true) {
      int grow = -1;
      for (int d = 0; d < n; d++) {
        if (shape[d] < volume[d] && (grow < 0 || shape[d] < shape[grow])) {
          grow = d;
        }
      }
      if (Shapes.elementCount(shape) >= minVoxels || grow < 0) {
        return shape;
      }
      shape[grow] += chunks[grow];
    }
  }

  /**
   * The axes along which the halo is shorter than the longest offset (empty when it is long
   * enough everywhere).
   *
   * @param longest the longest offset along each axis, memory order (the offsets' {@code reach})
   * @throws SunderException {@link ErrorKind#INVALID_CONFIG} if it has the wrong dimension
   */
  public List<HaloShortfall> haloShortfalls(int[] longest) {
    int n = volumeShape.length;
    if (longest.length != n) {
      throw new SunderException(ErrorKind.INVALID_CONFIG, "longest offset "
          + Arrays.toString(longest) + " has " + longest.length + " components; the volume has "
          + n + " dimensions");
    }
    List<HaloShortfall> shortfalls = new ArrayList<>();
    for (int d = 0; d < n; d++) {
      if (halo[d] < longest[d]) {
        shortfalls.add(new HaloShortfall(d, halo[d], longest[d]));
      }
    }
    return shortfalls;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof BlockGrid g && Arrays.equals(volumeShape, g.volumeShape)
        && Arrays.equals(chunkShape, g.chunkShape) && Arrays.equals(blockShape, g.blockShape)
        && Arrays.equals(halo, g.halo);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(volumeShape) * 31 + Arrays.hashCode(blockShape);
  }

  @Override
  public String toString() {
    return "BlockGrid[volume " + Arrays.toString(volumeShape) + ", chunk "
        + Arrays.toString(chunkShape) + ", block " + Arrays.toString(blockShape) + ", halo "
        + Arrays.toString(halo) + ", " + blockCount + " blocks, " + faceCount() + " faces]";
  }
}
