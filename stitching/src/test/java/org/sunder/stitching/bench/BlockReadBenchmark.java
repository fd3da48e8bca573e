package org.sunder.stitching.bench;

import static org.sunder.stitching.bench.BlockwiseRuns.AFFINITIES;
import static org.sunder.stitching.bench.BlockwiseRuns.cpuNanos;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;
import org.sunder.stitching.setup.AffinityReader;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * What reading its affinities costs a block of the default method: for every block of an even
 * grid over a tissue preset's volume (written as the other stitching benchmarks write it:
 * float32, blosc-lz4 chunks of 32 × 32 × 8 voxels by all channels), the thread CPU seconds of
 * reading the extended box alone and of reading the block as the partition task does (the
 * extended box with every channel and, where the grid cuts the sections, the fragment context
 * around it with the nearest-neighbour channels), summed over the blocks, best of the rounds,
 * and their ratio. Not a test.
 *
 * <p>Arguments (optional): {@code x y z} shape (default {@link TissuePreset#STANDARD_SHAPE}),
 * blocks per axis (default 3), rounds (default 5), preset name (default dense-neurites).
 */
public final class BlockReadBenchmark {
  private static final int[] CHUNK = {32, 32, 8};

  private BlockReadBenchmark() {}

  public static void main(String[] args) throws Exception {
    long[] shape = args.length >= 3 ? new long[] {Long.parseLong(args[0]),
        Long.parseLong(args[1]), Long.parseLong(args[2])} : TissuePreset.STANDARD_SHAPE.clone();
    int perAxis = args.length >= 4 ? Integer.parseInt(args[3]) : 3;
    int rounds = args.length >= 5 ? Integer.parseInt(args[4]) : 5;
    TissuePreset preset = TissuePreset.named(args.length >= 6 ? args[5] : "dense-neurites");
    SyntheticVolume volume = preset.volume(1, shape);
    Offsets offsets = TissuePreset.offsets();
    Path root = Files.createTempDirectory("sunder-block-read");
    try {
      BlockwiseRuns.writeAffinities(root, shape, CHUNK, offsets.count(),
          preset.affinities(volume, 1));
      int[] block = BlockwiseRuns.blockShape(shape, CHUNK, perAxis);
      BlockGrid grid = BlockGrid.of(shape, CHUNK, block,
          BlockwiseRuns.halo(offsets.vectors(), 1));
      StitchingSetup setup = StitchingSetup.of(root, AFFINITIES, "", root, "unused", grid,
          offsets, PartitionConfig.robustDefault(volume.spec().voxelSize()));
      System.out.printf(Locale.ROOT, "%s, %s voxels (x y z), %d blocks of %s, chunks %s by %d"
          + " channels; thread CPU seconds over all blocks, best of %d%n", preset.presetName(),
          Arrays.toString(shape), grid.blockCount(), Arrays.toString(block),
          Arrays.toString(CHUNK), offsets.count(), rounds);
      double extendedBest = Double.MAX_VALUE;
      double blockBest = Double.MAX_VALUE;
      long checksum = 0;
      for (int round = 0; round < rounds; round++) {
        double extended = 0;
        double asTask = 0;
        for (int b = 0; b < grid.blockCount(); b++) {
          Block at = grid.block(b);
          long t0 = cpuNanos();
          AffinityBlock alone = AffinityReader.read(setup, at.extendedMin(), at.extendedMax());
          long t1 = cpuNanos();
          AffinityBlock read = AffinityReader.readBlock(setup, at);
          long t2 = cpuNanos();
          extended += (t1 - t0) / 1e9;
          asTask += (t2 - t1) / 1e9;
          AffinityBlock context = read.contextOrNull();
          checksum += Float.floatToIntBits(alone.affinity(alone.voxelCount() - 1, 0))
              + (context == null ? 0 : context.voxelCount());
        }
        extendedBest = Math.min(extendedBest, extended);
        blockBest = Math.min(blockBest, asTask);
      }
      System.out.printf(Locale.ROOT, "  extended boxes alone %.3f s, blocks as the partition task"
          + " reads them %.3f s, ratio %.2f (checksum %d)%n", extendedBest, blockBest,
          blockBest / extendedBest, checksum);
    } finally {
      BlockwiseRuns.deleteTree(root);
    }
  }
}
