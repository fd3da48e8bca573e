package org.sunder.blockwise.store;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.locks.ReentrantLock;
import net.imglib2.Interval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.type.NativeType;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.files.AtomicWrites;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.store.codec.Codec;

/**
 * A chunked dataset of one {@link DataType} in a {@link Container}: boxes of voxels are read
 * into and written from primitive-array-backed {@link ArrayImg}s (dimension 0 fastest).
 *
 * <p>Thread-safe: concurrent reads, and concurrent writes of different chunks, never interfere.
 * Each chunk file is replaced atomically (temporary file in its directory, then rename), so a
 * reader sees a chunk before or after a write, never half of one. A write that covers a chunk
 * only partly reads the chunk, changes it and writes it back; inside one {@code Dataset} such
 * writes to the same chunk are serialised, across processes they are safe only when no two
 * writers share a chunk. Missing chunks read as the fill value.
 *
 * <p>Cost: a box read or write touches every chunk it intersects once; whole aligned chunks
 * are encoded from and decoded into the caller's or result's array without an extra copy. A
 * read decodes a chunk only up to the last element it needs in memory order where the codec
 * decodes front to back (raw, blosc, zstd; in Zarr's C order and N5): a box of an affinity
 * dataset's first channels, whose channel axis is the slowest, decodes those channels' share.
 */
public final class Dataset {
  private static final int LOCK_STRIPES = 64;

  private final Path dir;
  private final String path;
  private final DatasetSpec spec;
  private final String description;
  private final ChunkFormat format;
  private final long[] gridShape;
  private final ReentrantLock[] locks = new ReentrantLock[LOCK_STRIPES];

  Dataset(Path dir, String path, DatasetSpec spec, ContainerLayout layout, Path root) {
    this.dir = dir;
    this.path = path;
    this.spec = spec;
    this.description = "dataset '" + path + "' in " + layout.format() + " container " + root;
    Codec codec;
    try {
      codec = Codecs.createDecoder(spec.codec(), layout.format(), spec.dataType());
    } catch (StoreException e) {
      throw new StoreException(e.kind(), description + ": " + e.getMessage(), e);
    }
    this.format = layout.chunkFormat(spec, codec);
    this.gridShape = spec.gridShape();
    for (int i = 0; i < LOCK_STRIPES; i++) {
      locks[i] = new ReentrantLock();
    }
  }

  /** What is stored: shape, chunks, type, codec, fill value, byte and chunk order. */
  public DatasetSpec spec() {
    return spec;
  }

  /** The dataset's path inside its container, without leading or trailing slashes. */
  public String path() {
    return path;
  }

  /** The volume size, memory order; a copy. */
  public long[] shape() {
    return spec.shape();
  }

  /** The chunk size, memory order; a copy. */
  public int[] chunkShape() {
    return spec.chunkShape();
  }

  public DataType dataType() {
    return spec.dataType();
  }

  /** Number of chunks per dimension, memory order; a copy. */
  public long[] gridShape() {
    return gridShape.clone();
  }

  /**
   * Reads the voxels of {@code box} (inside the volume) into a new array of the box's size.
   * The element type follows {@link #dataType()} (e.g. {@code UnsignedLongType} for UINT64).
   *
   * @throws StoreException INVALID_INPUT if the box leaves the volume; STORAGE if a chunk is
   *     corrupt (the message names its grid position and file)
   */
  @SuppressWarnings("unchecked")
  public <T extends NativeType<T>> ArrayImg<T, ?> read(Interval box) {
    long[] min = box.minAsLongArray();
    long[] max = box.maxAsLongArray();
    checkBox(min, max, "read");
    int n = min.length;
    int[] dims = boxDims(min, max, "read");
    long[] grid = new long[n];
    if (isChunk(min, dims, grid)) {
      return (ArrayImg<T, ?>) readChunk(grid);
    }
    return (ArrayImg<T, ?>) read(List.of(box)).get(0);
  }

  /**
   * Reads several boxes at once, each as {@link #read(Interval)} would, decoding every chunk
   * that any of them touches once: boxes that overlap (a block's box and the wider context
   * around it, say) cost the decoding of their union's chunks, not of each box's. Memory: the
   * boxes' arrays and one decoded chunk.
   *
   * @throws StoreException as {@link #read(Interval)}, before any chunk is read
   */
  public List<ArrayImg<?, ?>> read(List<? extends Interval> boxes) {
    int n = spec.numDimensions();
    int count = boxes.size();
    long[][] mins = new long[count][];
    int[][] dims = new int[count][];
    Object[] targets = new Object[count];
    long[] first = new long[n];
    long[] last = new long[n];
    Arrays.fill(first, Long.MAX_VALUE);
    Arrays.fill(last, -1);
    for (int b = 0; b < count; b++) {
      long[] min = boxes.get(b).minAsLongArray();
      long[] max = boxes.get(b).maxAsLongArray();
      checkBox(min, max, "read");
      mins[b] = min;
      dims[b] = boxDims(min, max, "read");
      if (Shapes.intElementCount(dims[b]) > 0) {
        for (int d = 0; d < n; d++) {
          first[d] = Math.min(first[d], min[d]);
          last[d] = Math.max(last[d], max[d]);
        }
      }
    }
    for (int b = 0; b < count; b++) {
      targets[b] = ElementArrays.allocate(spec.dataType(), Shapes.intElementCount(dims[b]));
    }
    int[] from = new int[n];
    int[] to = new int[n];
    int[] size = new int[n];
    forEachChunk(first, last, chunk -> {
      int[] lastNeeded = null;
      for (int b = 0; b < count; b++) {
        intersect(chunk, mins[b], dims[b], from, to, size);
        if (positive(size)) {
          lastNeeded = later(lastNeeded, from, size);
        }
      }
      if (lastNeeded == null) {
        return;
      }
      ChunkFormat.DecodedChunk decoded = load(chunk, clippedDims(chunk), lastNeeded);
      for (int b = 0; b < count; b++) {
        intersect(chunk, mins[b], dims[b], from, to, size);
        if (!positive(size)) {
          continue;
        }
        if (decoded == null) {
          if (!spec.fillValue().isZero()) {
            BoxCopy.fill(targets[b], dims[b], to, size, spec.fillValue());
          }
        } else {
          BoxCopy.copy(decoded.elements(), decoded.dims(), from, targets[b], dims[b], to, size);
        }
      }
    });
    List<ArrayImg<?, ?>> images = new ArrayList<>(count);
    for (int b = 0; b < count; b++) {
      images.add(ElementArrays.wrap(targets[b], spec.dataType(), toLong(dims[b])));
    }
    return images;
  }

  /**
   * The later in memory order of {@code current} (or null) and the last element of the box at
   * {@code from} of {@code size}: the position whose slowest differing coordinate is larger.
   */
  private static int[] later(int[] current, int[] from, int[] size) {
    int[] last = new int[from.length];
    for (int d = 0; d < last.length; d++) {
      last[d] = from[d] + size[d] - 1;
    }
    if (current == null) {
      return last;
    }
    for (int d = last.length - 1; d >= 0; d--) {
      if (last[d] != current[d]) {
        return last[d] > current[d] ? last : current;
      }
    }
    return current;
  }

  private static boolean positive(int[] size) {
    for (int s : size) {
      if (s <= 0) {
        return false;
      }
    }
    return true;
  }

  /**
   * Writes {@code data} with its origin at {@code min}; the box must lie inside the volume and
   * the element type must match. Chunks covered only in part are read, changed and rewritten.
   * Every chunk of the box is encoded in memory before the first file is replaced, so bad
   * input or a corrupt existing chunk leaves the dataset unchanged (an I/O failure while
   * replacing the files can still leave some replaced). Memory: the encoded chunks of the box.
   */
  public void write(ArrayImg<?, ?> data, long[] min) {
    int n = spec.numDimensions();
    if (min.length != n || data.numDimensions() != n) {
      throw new StoreException(ErrorKind.INVALID_INPUT, description + ": write of an array of "
          + data.numDimensions() + " dimensions at " + Arrays.toString(min) + "; expected "
          + n + " dimensions for both");
    }
    long[] max = new long[n];
    for (int d = 0; d < n; d++) {
      max[d] = min[d] + data.dimension(d) - 1;
    }
    checkBox(min, max, "write");
    int[] dims = boxDims(min, max, "write");
    Object source = ElementArrays.storage(data, spec.dataType(), description);
    long[] grid = new long[n];
    if (isChunk(min, dims, grid)) {
      writeChunk(grid, data);
      return;
    }
    List<long[]> chunks = new ArrayList<>();
    forEachChunk(min, max, chunks::add);
    List<ReentrantLock> held = lockPartialChunks(chunks, min, dims);
    try {
      List<ByteBuffer[]> contents = new ArrayList<>(chunks.size());
      for (long[] chunk : chunks) {
        contents.add(encodePart(chunk, source, min, dims));
      }
      for (int i = 0; i < chunks.size(); i++) {
        AtomicWrites.write(format.chunkFile(dir, chunks.get(i)), contents.get(i));
      }
    } finally {
      for (int i = held.size() - 1; i >= 0; i--) {
        held.get(i).unlock();
      }
    }
  }

  /**
   * Locks the stripes of the chunks the box covers only in part, in ascending stripe order so
   * that concurrent writers cannot deadlock; returns them in locking order.
   */
  private List<ReentrantLock> lockPartialChunks(List<long[]> chunks, long[] min, int[] dims) {
    java.util.TreeSet<Integer> stripes = new java.util.TreeSet<>();
    int n = dims.length;
    for (long[] chunk : chunks) {
      int[] size = new int[n];
      intersect(chunk, min, dims, new int[n], new int[n], size);
      if (!Arrays.equals(size, clippedDims(chunk))) {
        stripes.add(stripeOf(chunk));
      }
    }
    List<ReentrantLock> held = new ArrayList<>(stripes.size());
    for (int stripe : stripes) {
      locks[stripe].lock();
      held.add(locks[stripe]);
    }
    return held;
  }

  /** The new file content of {@code chunk}: the box's part, merged into the chunk if partial. */
  private ByteBuffer[] encodePart(long[] chunk, Object source, long[] min, int[] dims) {
    int n = dims.length;
    int[] clipped = clippedDims(chunk);
    int[] inChunk = new int[n];
    int[] inBox = new int[n];
    int[] size = new int[n];
    intersect(chunk, min, dims, inChunk, inBox, size);
    int[] stored = format.storedDims(clipped);
    Object elements;
    if (Arrays.equals(size, clipped)) {
      elements = Arrays.equals(stored, clipped)
          ? ElementArrays.allocate(spec.dataType(), Shapes.intElementCount(stored))
          : ElementArrays.allocate(spec.dataType(),
              Shapes.intElementCount(stored), spec.fillValue());
    } else {
      elements = storedElements(chunk, clipped, stored);
    }
    BoxCopy.copy(source, dims, inBox, elements, stored, inChunk, size);
    return format.encode(elements, stored);
  }

  /** The chunk's current content in its stored shape, or the fill value if it is missing. */
  private Object storedElements(long[] chunk, int[] clipped, int[] stored) {
    ChunkFormat.DecodedChunk decoded = load(chunk, clipped, null);
    if (decoded != null && Arrays.equals(decoded.dims(), stored)) {
      return decoded.elements();
    }
    Object elements = ElementArrays.allocate(spec.dataType(),
        Shapes.intElementCount(stored), spec.fillValue());
    if (decoded != null) {
      BoxCopy.copy(decoded.elements(), decoded.dims(), new int[stored.length], elements, stored,
          new int[stored.length], clipped);
    }
    return elements;
  }

  /**
   * Reads one whole chunk, clipped to the volume: the result's dims are the chunk shape, cut
   * at the volume border. A missing chunk reads as the fill value.
   */
  public ArrayImg<?, ?> readChunk(long[] gridPosition) {
    checkGrid(gridPosition);
    int[] clipped = clippedDims(gridPosition);
    ChunkFormat.DecodedChunk decoded = load(gridPosition, clipped, null);
    Object elements;
    if (decoded == null) {
      elements = ElementArrays.allocate(spec.dataType(),
          Shapes.intElementCount(clipped), spec.fillValue());
    } else if (Arrays.equals(decoded.dims(), clipped)) {
      elements = decoded.elements();
    } else {
      elements = ElementArrays.allocate(spec.dataType(), Shapes.intElementCount(clipped));
      int[] origin = new int[clipped.length];
      BoxCopy.copy(decoded.elements(), decoded.dims(), origin, elements, clipped, origin,
          clipped);
    }
    return ElementArrays.wrap(elements, spec.dataType(), toLong(clipped));
  }

  /** Replaces one whole chunk; {@code data}'s dims must be the chunk's, clipped to the volume. */
  public void writeChunk(long[] gridPosition, ArrayImg<?, ?> data) {
    checkGrid(gridPosition);
    int[] clipped = clippedDims(gridPosition);
    long[] dims = data.dimensionsAsLongArray();
    if (!Arrays.equals(dims, toLong(clipped))) {
      throw new StoreException(ErrorKind.INVALID_INPUT, description + ": chunk at grid position "
          + Arrays.toString(gridPosition) + " has shape " + Arrays.toString(clipped)
          + ", the array written to it has " + Arrays.toString(dims));
    }
    Object source = ElementArrays.storage(data, spec.dataType(), description);
    int[] stored = format.storedDims(clipped);
    if (Arrays.equals(stored, clipped)) {
      store(gridPosition, source, stored);
      return;
    }
    Object elements = ElementArrays.allocate(spec.dataType(),
        Shapes.intElementCount(stored), spec.fillValue());
    int[] origin = new int[clipped.length];
    BoxCopy.copy(source, clipped, origin, elements, stored, origin, clipped);
    store(gridPosition, elements, stored);
  }

  /**
   * Deletes the temporary chunk files ({@code .<chunk>.<random>.tmp}) that a writer killed
   * between writing and renaming left in this dataset's directory tree. Only safe while no other
   * process writes to this dataset. O(files in the dataset).
   *
   * @return how many were deleted
   */
  public int removeStaleTemporaries() {
    if (!Files.isDirectory(dir)) {
      return 0;
    }
    List<Path> stale;
    try (java.util.stream.Stream<Path> walk = Files.walk(dir)) {
      stale = walk.filter(p -> AtomicWrites.isTemporary(p.getFileName().toString())
          && Files.isRegularFile(p)).toList();
      for (Path p : stale) {
        Files.deleteIfExists(p);
      }
    } catch (IOException | java.io.UncheckedIOException e) {
      throw new StoreException(ErrorKind.STORAGE, description + ": cannot remove temporary"
          + " chunk files: " + e.getMessage(), e);
    }
    return stale.size();
  }

  /** Whether the chunk's file exists. */
  public boolean chunkExists(long[] gridPosition) {
    checkGrid(gridPosition);
    return Files.isRegularFile(format.chunkFile(dir, gridPosition));
  }

  /** The chunk's file (which may not exist). */
  public Path chunkFile(long[] gridPosition) {
    checkGrid(gridPosition);
    return format.chunkFile(dir, gridPosition);
  }

  /** The chunk at {@code grid} decoded up to {@code lastNeededOrNull} (all when null), or null. */
  private ChunkFormat.DecodedChunk load(long[] grid, int[] clipped, int[] lastNeededOrNull) {
    Path file = format.chunkFile(dir, grid);
    byte[] bytes = AtomicWrites.readIfExists(file);
    if (bytes == null) {
      return null;
    }
    try {
      return format.decode(bytes, clipped, lastNeededOrNull);
    } catch (IOException | RuntimeException e) {
      if (e instanceof StoreException store && store.kind() != ErrorKind.INTERNAL) {
        throw store;
      }
      throw new StoreException(ErrorKind.INVALID_INPUT, description + ": chunk at grid position "
          + Arrays.toString(grid) + " (file " + file + ", " + bytes.length + " bytes, codec "
          + spec.codec() + ") cannot be read, it is corrupt or not in that codec: "
          + e.getMessage(), e);
    }
  }

  private void store(long[] grid, Object elements, int[] stored) {
    ByteBuffer[] content = format.encode(elements, stored);
    AtomicWrites.write(format.chunkFile(dir, grid), content);
  }

  private static int stripeOf(long[] grid) {
    return Math.floorMod(Arrays.hashCode(grid), LOCK_STRIPES);
  }

  private void checkBox(long[] min, long[] max, String what) {
    int n = spec.numDimensions();
    boolean inside = min.length == n && max.length == n;
    for (int d = 0; inside && d < n; d++) {
      inside = min[d] >= 0 && max[d] < spec.shape(d) && max[d] >= min[d] - 1;
    }
    if (!inside) {
      throw new StoreException(ErrorKind.INVALID_INPUT, description + ": " + what + " box min "
          + Arrays.toString(min) + " max " + Arrays.toString(max)
          + " is not inside the volume; expected " + n + " dimensions within [0, "
          + Arrays.toString(spec.shape()) + ") (every list fastest axis first)");
    }
  }

  private int[] boxDims(long[] min, long[] max, String what) {
    int[] dims = new int[min.length];
    long count = 1;
    for (int d = 0; d < dims.length; d++) {
      dims[d] = (int) (max[d] - min[d] + 1);
      count *= dims[d];
    }
    if (count > Integer.MAX_VALUE - 8) {
      throw new StoreException(ErrorKind.INVALID_INPUT, description + ": " + what + " box of "
          + Arrays.toString(dims) + " has " + count + " voxels; one array holds at most 2^31-9");
    }
    return dims;
  }

  private void checkGrid(long[] grid) {
    boolean inside = grid.length == gridShape.length;
    for (int d = 0; inside && d < grid.length; d++) {
      inside = grid[d] >= 0 && grid[d] < gridShape[d];
    }
    if (!inside) {
      throw new StoreException(ErrorKind.INVALID_INPUT, description + ": chunk grid position "
          + Arrays.toString(grid) + " is outside the grid " + Arrays.toString(gridShape));
    }
  }

  /** Whether the box is exactly one chunk (clipped); if so its grid position is put in grid. */
  private boolean isChunk(long[] min, int[] dims, long[] grid) {
    for (int d = 0; d < min.length; d++) {
      int c = spec.chunkShape(d);
      if (min[d] % c != 0) {
        return false;
      }
      grid[d] = min[d] / c;
      long end = Math.min(spec.shape(d), min[d] + c);
      if (min[d] + dims[d] != end) {
        return false;
      }
    }
    return true;
  }

  private int[] clippedDims(long[] grid) {
    int[] dims = new int[grid.length];
    for (int d = 0; d < grid.length; d++) {
      long start = grid[d] * spec.chunkShape(d);
      dims[d] = (int) Math.min(spec.chunkShape(d), spec.shape(d) - start);
    }
    return dims;
  }

  /** Intersection of chunk {@code grid} with the box: start in chunk, start in box, size. */
  private void intersect(long[] grid, long[] min, int[] dims, int[] inChunk, int[] inBox,
      int[] size) {
    for (int d = 0; d < grid.length; d++) {
      long chunkStart = grid[d] * spec.chunkShape(d);
      long chunkEnd = Math.min(spec.shape(d), chunkStart + spec.chunkShape(d));
      long start = Math.max(chunkStart, min[d]);
      long end = Math.min(chunkEnd, min[d] + dims[d]);
      inChunk[d] = (int) (start - chunkStart);
      inBox[d] = (int) (start - min[d]);
      size[d] = (int) (end - start);
    }
  }

  private interface ChunkVisitor {
    void visit(long[] grid);
  }

  private void forEachChunk(long[] min, long[] max, ChunkVisitor visitor) {
    int n = min.length;
    long[] first = new long[n];
    long[] last = new long[n];
    for (int d = 0; d < n; d++) {
      if (max[d] < min[d]) {
        return;
      }
      first[d] = min[d] / spec.chunkShape(d);
      last[d] = max[d] / spec.chunkShape(d);
    }
    long[] grid = first.clone();
    while (true) {
      visitor.visit(grid.clone());
      int d = 0;
      while (d < n && grid[d] == last[d]) {
        grid[d] = first[d];
        d++;
      }
      if (d == n) {
        return;
      }
      grid[d]++;
    }
  }


  private static long[] toLong(int[] dims) {
    long[] out = new long[dims.length];
    for (int d = 0; d < dims.length; d++) {
      out[d] = dims[d];
    }
    return out;
  }

  @Override
  public String toString() {
    return description;
  }
}
