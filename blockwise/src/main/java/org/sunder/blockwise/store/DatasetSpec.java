package org.sunder.blockwise.store;

import java.io.Serializable;
import java.util.Arrays;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.StoreException;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.store.codec.CodecSpec;

/**
 * The layout of a dataset: shape and chunk shape in memory order (dimension 0 fastest), element
 * type, codec, fill value, and the Zarr-only choices byte order, chunk order and dimension
 * separator. A value: arrays are copied in and out, {@code equals} compares their content.
 *
 * <p>N5 always stores big-endian, {@link ChunkOrder#C}, {@code "/"}-separated chunks with fill
 * value zero; {@link Container#createDataset} replaces those fields for N5 and
 * {@link Dataset#spec()} reports what is stored.
 *
 * @param shape the volume size per dimension, memory order
 * @param chunkShape the chunk size per dimension, memory order
 * @param dataType the element type
 * @param codec the chunk compression
 * @param fillValue what missing chunks read as
 * @param endianness byte order of stored elements (Zarr)
 * @param chunkOrder element order inside a stored chunk (Zarr)
 * @param dimensionSeparator {@code "."} or {@code "/"} between chunk indices in Zarr keys
 */
public record DatasetSpec(long[] shape, int[] chunkShape, DataType dataType, CodecSpec codec,
    FillValue fillValue, Endianness endianness, ChunkOrder chunkOrder, String dimensionSeparator)
    implements Serializable {

  /** Validates and copies; throws {@link StoreException} (INVALID_CONFIG) naming the bad value. */
  public DatasetSpec {
    Objects.requireNonNull(shape, "shape");
    Objects.requireNonNull(chunkShape, "chunkShape");
    Objects.requireNonNull(dataType, "dataType");
    Objects.requireNonNull(codec, "codec");
    Objects.requireNonNull(fillValue, "fillValue");
    Objects.requireNonNull(endianness, "endianness");
    Objects.requireNonNull(chunkOrder, "chunkOrder");
    Objects.requireNonNull(dimensionSeparator, "dimensionSeparator");
    shape = shape.clone();
    chunkShape = chunkShape.clone();
    if (shape.length == 0 || shape.length != chunkShape.length) {
      throw invalid("shape " + Arrays.toString(shape) + " and chunk shape "
          + Arrays.toString(chunkShape) + " must have the same number (at least 1) of dimensions");
    }
    long chunkElements = 1;
    for (int d = 0; d < shape.length; d++) {
      if (shape[d] < 0) {
        throw invalid("shape " + Arrays.toString(shape) + " has a negative size in dimension " + d);
      }
      if (chunkShape[d] <= 0) {
        throw invalid("chunk shape " + Arrays.toString(chunkShape)
            + " must be positive in every dimension (dimension " + d + ")");
      }
      chunkElements *= chunkShape[d];
    }
    if (chunkElements * dataType.bytes() > Integer.MAX_VALUE - 64) {
      throw invalid("chunk shape " + Arrays.toString(chunkShape) + " of " + dataType
          + " exceeds 2 GiB per chunk");
    }
    if (!dimensionSeparator.equals(".") && !dimensionSeparator.equals("/")) {
      throw invalid("dimension separator '" + dimensionSeparator + "' must be \".\" or \"/\"");
    }
  }

  private static StoreException invalid(String message) {
    return new StoreException(ErrorKind.INVALID_CONFIG, message);
  }

  /**
   * A spec with codec zstd level 3, fill value zero, little-endian C-order chunks and {@code "/"}
   * as the Zarr dimension separator.
   */
  public static DatasetSpec of(long[] shape, int[] chunkShape, DataType dataType) {
    return new DatasetSpec(shape, chunkShape, dataType, CodecSpec.zstd(3), FillValue.zero(),
        Endianness.LITTLE, ChunkOrder.C, "/");
  }

  @Override
  public long[] shape() {
    return shape.clone();
  }

  @Override
  public int[] chunkShape() {
    return chunkShape.clone();
  }

  /** Number of dimensions. */
  public int numDimensions() {
    return shape.length;
  }

  /** The size of dimension {@code d}; no copy. */
  public long shape(int d) {
    return shape[d];
  }

  /** The chunk size along dimension {@code d}; no copy. */
  public int chunkShape(int d) {
    return chunkShape[d];
  }

  /** Number of elements in one full chunk. */
  public int chunkElements() {
    return Shapes.intElementCount(chunkShape);
  }

  /** Chunks per dimension (the last may be cut by the volume border); allocates. */
  public long[] gridShape() {
    long[] grid = new long[shape.length];
    for (int d = 0; d < shape.length; d++) {
      grid[d] = (shape[d] + chunkShape[d] - 1) / chunkShape[d];
    }
    return grid;
  }

  public DatasetSpec withCodec(CodecSpec newCodec) {
    return new DatasetSpec(shape, chunkShape, dataType, newCodec, fillValue, endianness,
        chunkOrder, dimensionSeparator);
  }

  public DatasetSpec withFillValue(FillValue newFill) {
    return new DatasetSpec(shape, chunkShape, dataType, codec, newFill, endianness, chunkOrder,
        dimensionSeparator);
  }

  public DatasetSpec withEndianness(Endianness newEndianness) {
    return new DatasetSpec(shape, chunkShape, dataType, codec, fillValue, newEndianness,
        chunkOrder, dimensionSeparator);
  }

  public DatasetSpec withChunkOrder(ChunkOrder newOrder) {
    return new DatasetSpec(shape, chunkShape, dataType, codec, fillValue, endianness, newOrder,
        dimensionSeparator);
  }

  public DatasetSpec withDimensionSeparator(String separator) {
    return new DatasetSpec(shape, chunkShape, dataType, codec, fillValue, endianness, chunkOrder,
        separator);
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof DatasetSpec that
        && Arrays.equals(shape, that.shape)
        && Arrays.equals(chunkShape, that.chunkShape)
        && dataType == that.dataType
        && codec.equals(that.codec)
        && fillValue.equals(that.fillValue)
        && endianness == that.endianness
        && chunkOrder == that.chunkOrder
        && dimensionSeparator.equals(that.dimensionSeparator);
  }

  @Override
  public int hashCode() {
    return Objects.hash(Arrays.hashCode(shape), Arrays.hashCode(chunkShape), dataType, codec,
        fillValue, endianness, chunkOrder, dimensionSeparator);
  }

  @Override
  public String toString() {
    return "DatasetSpec[shape=" + Arrays.toString(shape) + ", chunkShape="
        + Arrays.toString(chunkShape) + ", " + dataType + ", " + codec + ", fill " + fillValue
        + ", " + endianness + ", " + chunkOrder + ", separator '" + dimensionSeparator + "']";
  }
}
