package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.Arrays;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;

/**
 * Final ids block by block, without a map of the whole volume anywhere: consecutive from 1, and
 * the same numbering as the single map of {@code FinalIds} (block by block in index order, local
 * ids ascending, a cluster numbered where its smallest provisional id lies), whatever order the
 * tasks run in.
 *
 * <p>A cluster of the solve is <em>owned</em> by the block of its representative (its smallest
 * provisional id). Three task steps and one prefix sum:
 * <ol>
 *   <li>per block, {@link #ownedCount}: segments that are not boundary segments, plus boundary
 *       segments that represent their cluster;
 *   <li>on the driver, {@link #offsets}: the exclusive prefix sum of those counts in block order
 *       (one number per block);
 *   <li>per block, {@link #number}: its owned ids get {@code offset + 1, offset + 2, ...} in
 *       local id order; it publishes (representative, final id) for the clusters it owns;
 *   <li>per block, {@link #complete}: boundary segments of clusters owned elsewhere take their
 *       final id from the owners' publications ({@link #needed} lists which; a distributed run
 *       joins them by representative).
 * </ol>
 * Each step is O(segments of the block + log of what it looks up).
 */
public final class BlockFinalIds {
  private BlockFinalIds() {}

  /**
   * One block's segments as the solve left them.
   *
   * @param block the block index
   * @param segmentCount local ids {@code 1..segmentCount}
   * @param boundaryLocalIds local ids of the boundary segments, ascending
   * @param representatives per boundary segment, its cluster's representative (provisional id)
   */
  public record BlockClusters(int block, int segmentCount, int[] boundaryLocalIds,
      long[] representatives) implements Serializable {
    public BlockClusters {
      if (boundaryLocalIds.length != representatives.length) {
        throw new IllegalArgumentException("block " + block + ": " + boundaryLocalIds.length
            + " boundary segments but " + representatives.length + " representatives");
      }
      for (int i = 0; i < boundaryLocalIds.length; i++) {
        if (boundaryLocalIds[i] < 1 || boundaryLocalIds[i] > segmentCount
            || i > 0 && boundaryLocalIds[i] <= boundaryLocalIds[i - 1]) {
          throw new IllegalArgumentException("block " + block + ": boundary local id "
              + boundaryLocalIds[i] + " at " + i + " is not ascending within 1.." + segmentCount);
        }
      }
    }
  }

  /**
   * A block's numbering before the look-ups.
   *
   * @param finalIds per local id (index 0 unused), its final id; 0 where a cluster owned by
   *     another block must be looked up
   * @param ownedRepresentatives representatives of the clusters this block owns, ascending
   * @param ownedFinalIds their final ids
   */
  public record Numbered(int block, long[] finalIds, long[] ownedRepresentatives,
      long[] ownedFinalIds) implements Serializable {}

  /** Step 1: how many final ids the block hands out. */
  public static long ownedCount(IdLayout layout, BlockClusters b) {
    long owned = b.segmentCount() - b.boundaryLocalIds().length;
    for (int i = 0; i < b.boundaryLocalIds().length; i++) {
      if (b.representatives()[i] == layout.provisional(b.block(), b.boundaryLocalIds()[i])) {
        owned++;
      }
    }
    return owned;
  }

  /**
   * Step 2: per block, the number of final ids handed out by the blocks before it.
   *
   * @param counts per block index, its {@link #ownedCount}
   */
  public static long[] offsets(long[] counts) {
    long[] offsets = new long[counts.length];
    long sum = 0;
    for (int b = 0; b < counts.length; b++) {
      if (counts[b] < 0) {
        throw new SunderException(ErrorKind.INTERNAL, "block " + b + " owns " + counts[b]
            + " final ids");
      }
      offsets[b] = sum;
      sum = Math.addExact(sum, counts[b]);
      if (sum > IdLayout.maxFinalId()) {
        throw new SunderException(ErrorKind.INVALID_INPUT, "the run has more than "
            + IdLayout.maxFinalId() + " final ids (reached at block " + b + ")");
      }
    }
    return offsets;
  }

  /** Step 3: numbers the ids the block owns, from {@code offset + 1}. */
  public static Numbered number(IdLayout layout, BlockClusters b, long offset) {
    long[] ids = new long[b.segmentCount() + 1];
    int[] boundary = b.boundaryLocalIds();
    int owned = 0;
    for (int i = 0; i < boundary.length; i++) {
      if (b.representatives()[i] == layout.provisional(b.block(), boundary[i])) {
        owned++;
      }
    }
    long[] reps = new long[owned];
    long[] finals = new long[owned];
    owned = 0;
    long next = offset;
    int at = 0;
    for (int local = 1; local <= b.segmentCount(); local++) {
      if (at < boundary.length && boundary[at] == local) {
        long self = layout.provisional(b.block(), local);
        if (b.representatives()[at] == self) {
          ids[local] = ++next;
          reps[owned] = self;
          finals[owned++] = next;
        }
        at++;
      } else {
        ids[local] = ++next;
      }
    }
    return new Numbered(b.block(), ids, reps, finals);
  }

  /** The representatives the block must look up (owned by other blocks), ascending, unique. */
  public static long[] needed(IdLayout layout, BlockClusters b) {
    long[] out = new long[b.representatives().length];
    int count = 0;
    for (long rep : b.representatives()) {
      if (layout.blockOf(rep) != b.block()) {
        out[count++] = rep;
      }
    }
    out = Arrays.copyOf(out, count);
    Arrays.sort(out);
    return Arrays.stream(out).distinct().toArray();
  }

  /**
   * Step 4: the block's final map (per local id, index 0 = 0).
   *
   * @param representatives ascending, at least {@link #needed}'s
   * @param finalIds their final ids, from the owners' {@link Numbered}
   */
  public static long[] complete(IdLayout layout, BlockClusters b, Numbered numbered,
      long[] representatives, long[] finalIds) {
    long[] ids = numbered.finalIds().clone();
    for (int i = 0; i < b.boundaryLocalIds().length; i++) {
      int local = b.boundaryLocalIds()[i];
      if (ids[local] != 0) {
        continue;
      }
      long rep = b.representatives()[i];
      long[] table = layout.blockOf(rep) == b.block() ? numbered.ownedRepresentatives()
          : representatives;
      long[] values = table == representatives ? finalIds : numbered.ownedFinalIds();
      int at = Arrays.binarySearch(table, rep);
      if (at < 0) {
        throw new SunderException(ErrorKind.INTERNAL, "block " + b.block() + " local id "
            + local + ": no final id for its representative " + Long.toUnsignedString(rep)
            + " (block " + layout.blockOf(rep) + ")");
      }
      ids[local] = values[at];
    }
    return ids;
  }
}
