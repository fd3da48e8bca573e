package org.sunder.stitching.solve;

import java.io.Serializable;
import java.util.Arrays;
import java.util.List;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.IdLayout;

/**
 * The final ids of the segments the solve decided (the reduced graph's nodes, and segments a
 * size filter joined to them), with each block's offset: everything the relabel of a block
 * needs besides its own summary, and nothing of the size of the volume's segments. Each block
 * then numbers its own map ({@link BlockIdMap}).
 *
 * <p>The numbering is {@link FinalIds}'s, so the result is identical: block by block in index
 * order, local ids ascending, each segment takes the next id unless the solve put it in a
 * cluster that already has one. A cluster is <em>owned</em> by the block of its representative,
 * its smallest provisional id, and numbered there. Block {@code b} hands out
 * {@code segments(b) - solved(b) + representatives(b)} ids, from {@code offset(b) + 1}; a
 * representative with local id {@code k} gets {@code offset(b) + k - (solved segments of b before
 * k that are not representatives)}. O(blocks + solved segments) time and memory; consecutive
 * from 1 and independent of task order.
 */
public final class SolvedFinalIds implements Serializable {
  private static final long serialVersionUID = 1L;

  private final IdLayout layout;
  private final long[] segmentCounts;
  private final long[] offsets;
  private final int[] blockStart;
  private final int[] locals;
  private final long[] finals;
  private final long finalIdCount;

  private SolvedFinalIds(IdLayout layout, long[] segmentCounts, long[] offsets, int[] blockStart,
      int[] locals, long[] finals, long finalIdCount) {
    this.layout = layout;
    this.segmentCounts = segmentCounts;
    this.offsets = offsets;
    this.blockStart = blockStart;
    this.locals = locals;
    this.finals = finals;
    this.finalIdCount = finalIdCount;
  }

  /**
   * One block's share: its offset and its solved segments' final ids.
   *
   * @param block the block index
   * @param offset final ids handed out by the blocks before it
   * @param locals local ids of its solved segments, ascending
   * @param finals their final ids
   */
  public record BlockPart(int block, long offset, int[] locals, long[] finals)
      implements Serializable {}

  /**
   * Numbers the solved segments.
   *
   * @param segmentCounts per block index, its number of segments (local ids {@code 1..n})
   * @param solvedIds provisional ids of the solved segments, ascending (as signed longs, which
   *     for provisional ids is block, then local id, ascending)
   * @param clusterOf per solved segment, its cluster (any non-negative int)
   */
  public static SolvedFinalIds number(IdLayout layout, long[] segmentCounts, long[] solvedIds,
      int[] clusterOf) {
    int blocks = segmentCounts.length;
    if (clusterOf.length != solvedIds.length) {
      throw new IllegalArgumentException(solvedIds.length + " solved ids but " + clusterOf.length
          + " clusters");
    }
    int maxCluster = -1;
    for (int c : clusterOf) {
      if (c < 0) {
        throw new IllegalArgumentException("negative cluster " + c);
      }
      maxCluster = Math.max(maxCluster, c);
    }
    boolean[] seen = new boolean[maxCluster + 1];
    int[] blockStart = new int[blocks + 1];
    int[] locals = new int[solvedIds.length];
    long[] owned = new long[blocks];
    boolean[] isRep = new boolean[solvedIds.length];
    for (int i = 0; i < solvedIds.length; i++) {
      long id = solvedIds[i];
      int block = layout.blockOf(id);
      long local = layout.localOf(id);
      if (!IdLayout.isProvisional(id) || block >= blocks || local < 1
          || local > segmentCounts[block] || i > 0 && solvedIds[i - 1] >= id) {
        throw new SunderException(ErrorKind.INTERNAL, "solved id " + Long.toUnsignedString(id)
            + " at " + i + " is not an ascending provisional id of a known segment");
      }
      locals[i] = (int) local;
      blockStart[block + 1]++;
      if (!seen[clusterOf[i]]) {
        seen[clusterOf[i]] = true;
        isRep[i] = true;
        owned[block]++;
      }
    }
    for (int b = 0; b < blocks; b++) {
      owned[b] += segmentCounts[b] - blockStart[b + 1];
      blockStart[b + 1] += blockStart[b];
    }
    long[] offsets = org.sunder.stitching.solve.BlockFinalIds.offsets(owned);
    long[] finalOfCluster = new long[maxCluster + 1];
    long[] finals = new long[solvedIds.length];
    for (int b = 0; b < blocks; b++) {
      int nonReps = 0;
      for (int i = blockStart[b]; i < blockStart[b + 1]; i++) {
        if (isRep[i]) {
          finalOfCluster[clusterOf[i]] = offsets[b] + locals[i] - nonReps;
        } else {
          nonReps++;
        }
        finals[i] = finalOfCluster[clusterOf[i]];
      }
    }
    long total = blocks == 0 ? 0 : offsets[blocks - 1] + owned[blocks - 1];
    return new SolvedFinalIds(layout, segmentCounts.clone(), offsets, blockStart, locals, finals,
        total);
  }

  /**
   * The final ids from each block's share, as the tasks of a hierarchical solve write them
   * ({@link LevelTasks#blockIds}: there a share lists only the segments whose cluster another
   * segment represents, so {@link #finalIdOf} knows only those). Holds every share: for tests
   * and the in-process runner. O(blocks + entries).
   *
   * @param parts per block index, its share
   */
  public static SolvedFinalIds ofParts(IdLayout layout, long[] segmentCounts,
      List<BlockPart> parts, long finalIdCount) {
    int blocks = segmentCounts.length;
    int[] blockStart = new int[blocks + 1];
    long[] offsets = new long[blocks];
    for (int b = 0; b < blocks; b++) {
      BlockPart part = parts.get(b);
      if (part.block() != b) {
        throw new IllegalArgumentException("share " + b + " is block " + part.block() + "'s");
      }
      offsets[b] = part.offset();
      blockStart[b + 1] = blockStart[b] + part.locals().length;
    }
    int[] locals = new int[blockStart[blocks]];
    long[] finals = new long[blockStart[blocks]];
    for (int b = 0; b < blocks; b++) {
      BlockPart part = parts.get(b);
      System.arraycopy(part.locals(), 0, locals, blockStart[b], part.locals().length);
      System.arraycopy(part.finals(), 0, finals, blockStart[b], part.finals().length);
    }
    return new SolvedFinalIds(layout, segmentCounts.clone(), offsets, blockStart, locals, finals,
        finalIdCount);
  }

  /** The number of final ids (the largest one). */
  public long finalIdCount() {
    return finalIdCount;
  }

  public int blockCount() {
    return offsets.length;
  }

  /** Block {@code block}'s share (copies its slice). */
  public BlockPart part(int block) {
    int from = blockStart[block];
    int to = blockStart[block + 1];
    return new BlockPart(block, offsets[block], Arrays.copyOfRange(locals, from, to),
        Arrays.copyOfRange(finals, from, to));
  }

  /** Block {@code block}'s whole map (O(segments of the block)). */
  public BlockIdMap blockMap(int block) {
    return BlockIdMap.of(layout, segmentCounts[block], part(block));
  }

  /**
   * The map of every block at once, as one value. Holds a number per segment of the volume:
   * for tests and the in-process runner; a distributed run builds {@link #blockMap} per block.
   */
  public FinalIdMap toMap() {
    long[][] ids = new long[offsets.length][];
    for (int b = 0; b < ids.length; b++) {
      ids[b] = blockMap(b).finalIds();
    }
    return new FinalIdMap(layout, ids, finalIdCount);
  }

  /** The final id of solved segment {@code provisionalId}, or -1 if the solve did not see it. */
  public long finalIdOf(long provisionalId) {
    int block = layout.blockOf(provisionalId);
    if (block >= offsets.length) {
      return -1;
    }
    int at = Arrays.binarySearch(locals, blockStart[block], blockStart[block + 1],
        (int) layout.localOf(provisionalId));
    return at < 0 ? -1 : finals[at];
  }
}
