package org.sunder.spark.run;

import java.io.Serializable;
import java.util.Locale;
import org.sunder.blockwise.grid.BlockShapeChoice;

/**
 * Where a run's block shape came from and what it costs, for {@code plan} and the run's notes.
 *
 * @param source {@link #CONFIGURED}, {@link #CHOSEN} or {@link #KEPT}
 * @param overhead voxels of all extended boxes over the volume's voxels ({@link
 *     BlockShapeChoice#overhead}; 1 = no halo cost)
 * @param limitedBy for a chosen shape, what stopped its growth; else {@code null}
 * @param bytesPerExtendedVoxel what a partition task holds per voxel of its extended box
 * @param budget the cores and memory per task the shape was chosen for
 * @param note a line for the user, or {@code null}
 */
public record BlockShapeOrigin(String source, double overhead, BlockShapeChoice.Limit limitedBy,
    long bytesPerExtendedVoxel, TaskBudget budget, String note) implements Serializable {
  /** The configuration sets {@code blocks.shape}. */
  public static final String CONFIGURED = "blocks.shape";
  /** Chosen by {@link BlockShapeChoice} from the chunks, the halo and the memory per task. */
  public static final String CHOSEN = "chosen";
  /** The configuration sets none; kept from the earlier run in the work dir, to resume it. */
  public static final String KEPT = "kept";

  /** A human-readable account of what stopped a chosen shape's growth. */
  public String limitText() {
    if (limitedBy == null) {
      return source.equals(KEPT) ? "kept from the earlier run in the work dir"
          : "set by blocks.shape";
    }
    return switch (limitedBy) {
      case TARGET_REACHED -> String.format(Locale.ROOT, "grown until the halo overhead reached"
          + " the target %.2f", BlockShapeChoice.TARGET_OVERHEAD);
      case MEMORY_BUDGET -> "limited by the memory per task: a larger block would not fit "
          + org.sunder.spark.config.ByteSize.format(budget.memoryPerTask());
      case BLOCK_COUNT -> "limited by the block count: at least " + budget.minBlocks()
          + " blocks (2 x " + budget.cores() + " cores) so that every core has work";
      case VOLUME -> "limited by the volume: blocks span it along every axis that could grow";
    };
  }
}
