package org.sunder.stitching.solve;

import java.io.Serializable;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;

/**
 * One block's provisional-to-final map: what the relabel of that block's chunks reads, and only
 * that. Built from the block's segment count and its {@link SolvedFinalIds.BlockPart}: local ids
 * in ascending order take {@code offset + 1, offset + 2, ...}, except solved segments whose
 * cluster a block before them (or an earlier local id) numbered. O(segments of the block).
 *
 * @param layout the id layout of the run
 * @param block the block index
 * @param finalIds per local id, its final id (index 0 = 0)
 */
public record BlockIdMap(IdLayout layout, int block, long[] finalIds)
    implements IdRelabel, Serializable {

  /** The map of a block with {@code segmentCount} segments. */
  public static BlockIdMap of(IdLayout layout, long segmentCount,
      SolvedFinalIds.BlockPart part) {
    long[] ids = new long[Math.toIntExact(segmentCount + 1)];
    long next = part.offset();
    int at = 0;
    int[] locals = part.locals();
    for (int local = 1; local <= segmentCount; local++) {
      if (at < locals.length && locals[at] == local) {
        long id = part.finals()[at++];
        if (id == next + 1) {
          next++;
        } else if (id > next) {
          throw new SunderException(ErrorKind.INTERNAL, "block " + part.block() + " local id "
              + local + ": solved final id " + id + " skips ids after " + next);
        }
        ids[local] = id;
      } else {
        ids[local] = ++next;
      }
    }
    if (at != locals.length) {
      throw new SunderException(ErrorKind.INTERNAL, "block " + part.block() + " has "
          + segmentCount + " segments but the solve names local id " + locals[at]);
    }
    return new BlockIdMap(layout, part.block(), ids);
  }

  /** The final id of {@code value} if it is provisional, else {@code value} itself. */
  @Override
  public long apply(long value) {
    if (!IdLayout.isProvisional(value)) {
      return value;
    }
    long local = layout.localOf(value);
    if (layout.blockOf(value) != block || local >= finalIds.length) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "provisional id "
          + Long.toUnsignedString(value) + " (block " + layout.blockOf(value) + ", local id "
          + local + ") in block " + block + "'s chunks was not written there by this run's"
          + " partition stage");
    }
    return finalIds[(int) local];
  }

  @Override
  public boolean equals(Object other) {
    return other instanceof BlockIdMap m && layout.equals(m.layout) && block == m.block
        && java.util.Arrays.equals(finalIds, m.finalIds);
  }

  @Override
  public int hashCode() {
    return block * 31 + java.util.Arrays.hashCode(finalIds);
  }
}
