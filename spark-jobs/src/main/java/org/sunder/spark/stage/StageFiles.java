package org.sunder.spark.stage;

import java.nio.file.Path;
import org.sunder.blockwise.grid.IdLayout;
import org.sunder.spark.kryo.PayloadCodec;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.solve.BlockIdMap;
import org.sunder.stitching.solve.BlockIdMapFile;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.BlockSummaryFile;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamEdgesFile;

/**
 * Where the partition and seam tasks leave their tables in the work dir, beside their records
 * ({@code stages/partition/<block>.summary}, {@code stages/seams/<face>.seams}), and how the
 * solve and the report read them back. A task's record holds only the figures and checksum of
 * its table ({@link BlockSummaryFile.Stored}, {@link SeamEdgesFile.Stored}), so nothing of the
 * size of a block passes through task results or Kryo's buffers. Clearing a stage's records
 * removes its tables too.
 */
public final class StageFiles {
  private static final PayloadCodec CODEC = new PayloadCodec();

  private StageFiles() {}

  public static Path summaryFile(WorkDir work, int block) {
    return work.ledger(Stage.PARTITION).dir().resolve(block + ".summary");
  }

  public static Path seamFile(WorkDir work, int face) {
    return work.ledger(Stage.SEAMS).dir().resolve(face + ".seams");
  }

  /** The partition record of {@code block}: a few figures. */
  public static BlockSummaryFile.Stored summaryRecord(WorkDir work, int block) {
    return CODEC.decode(work.ledger(Stage.PARTITION).read(block), BlockSummaryFile.Stored.class,
        "partition record " + block);
  }

  /** The block summary {@code block}'s partition task wrote (checked against its record). */
  public static BlockSummary summary(WorkDir work, int block) {
    return BlockSummaryFile.read(summaryFile(work, block), summaryRecord(work, block));
  }

  /** The seams record of {@code face}: a few figures. */
  public static SeamEdgesFile.Stored seamRecord(WorkDir work, int face) {
    return CODEC.decode(work.ledger(Stage.SEAMS).read(face), SeamEdgesFile.Stored.class,
        "seams record " + face);
  }

  /** The seam edges {@code face}'s task wrote (checked against its record). */
  public static SeamEdges seams(WorkDir work, int face) {
    return SeamEdgesFile.read(seamFile(work, face), seamRecord(work, face));
  }

  /** Where the solve leaves block {@code block}'s share of the final ids. */
  public static Path solvedPartFile(WorkDir work, int block) {
    return work.ledger(Stage.SOLVE).dir().resolve(block + ".part");
  }

  /**
   * Block {@code block}'s provisional-to-final map, from its partition record (segment count)
   * and its share of the solve's numbering: reads only that block's files. O(segments of the
   * block).
   */
  public static BlockIdMap blockMap(WorkDir work, IdLayout layout, int block) {
    return BlockIdMap.of(layout, summaryRecord(work, block).segments(),
        BlockIdMapFile.readPart(solvedPartFile(work, block), block));
  }
}
