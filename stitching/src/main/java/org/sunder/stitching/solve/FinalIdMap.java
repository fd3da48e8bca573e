package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;

/**
 * The result of the global solve: the final id of every provisional id. Block {@code b}'s local
 * segment {@code k} maps to {@code finalIds[b][k]} (index 0 unused). Final ids run from 1 to
 * {@link #finalIdCount()} without gaps.
 *
 * <p>{@link #apply} leaves values that are not provisional (background 0, final ids) unchanged,
 * which makes relabelling idempotent. Lookup is O(1). An immutable value; the arrays are not
 * copied on construction and must not be changed afterwards.
 *
 * @param layout the id layout the provisional ids were written with
 * @param finalIds per block, the final id of each local id (index 0 = 0)
 * @param finalIdCount the number of distinct final ids
 */
public record FinalIdMap(IdLayout layout, long[][] finalIds, long finalIdCount)
    implements IdRelabel, Serializable {

  /** The final id of {@code value} if it is provisional, else {@code value} itself. */
  @Override
  public long apply(long value) {
    if (!IdLayout.isProvisional(value)) {
      return value;
    }
    int block = layout.blockOf(value);
    long local = layout.localOf(value);
    if (block >= finalIds.length || local >= finalIds[block].length) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "provisional id "
          + Long.toUnsignedString(value) + " (block " + block + ", local id " + local
          + ") was not produced by the partition stage of this run");
    }
    return finalIds[block][(int) local];
  }

  /** The number of segments (provisional ids) the map knows. */
  public long provisionalCount() {
    long count = 0;
    for (long[] block : finalIds) {
      count += block.length - 1;
    }
    return count;
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof FinalIdMap m && layout.equals(m.layout)
        && finalIdCount == m.finalIdCount && Arrays.deepEquals(finalIds, m.finalIds);
  }

  @Override
  public int hashCode() {
    return Arrays.deepHashCode(finalIds) * 31 + Long.hashCode(finalIdCount);
  }

  @Override
  public String toString() {
    return "FinalIdMap[" + provisionalCount() + " provisional ids -> " + finalIdCount
        + " final ids]";
  }
}
