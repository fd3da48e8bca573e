package org.sunder.stitching.bench;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.stream.Stream;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImgs;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.metrics.ContingencyTable;
import org.sunder.blockwise.metrics.ScoreOptions;
import org.sunder.blockwise.metrics.Scorer;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.store.codec.CodecSpec;
import org.sunder.stitching.setup.StitchingSetup;
import org.sunder.stitching.solve.GlobalSolve;
import org.sunder.stitching.solve.RelabelTask;
import org.sunder.stitching.task.BlockSummary;
import org.sunder.stitching.task.PartitionTask;
import org.sunder.stitching.task.SeamEdges;
import org.sunder.stitching.task.SeamTask;

/**
 * What the stitching benchmarks share: affinities written to a Zarr container, the whole-volume
 * run read from and written to it, the blockwise stages run one after another in this thread
 * with their CPU times, the block shape of an even grid, and scores. For benchmarks only.
 */
final class BlockwiseRuns {
  private static final ThreadMXBean CPU = ManagementFactory.getThreadMXBean();
  /** The affinity dataset's path in the container. */
  static final String AFFINITIES = "affinities";

  private BlockwiseRuns() {}

  /** CPU time of this thread, in nanoseconds. */
  static long cpuNanos() {
    return CPU.getCurrentThreadCpuTime();
  }

  /** Thread CPU seconds of the blockwise stages, and the solve's result. */
  record Stages(double partition, double seams, double solve, double relabel,
      GlobalSolve.Result result) {
    double total() {
      return partition + seams + solve + relabel;
    }
  }

  /** Runs partition, seams, solve and relabel in this thread, timing each stage. */
  static Stages runStages(StitchingSetup setup) {
    setup.validateInputs();
    setup.createLabels();
    BlockGrid grid = setup.grid();
    long t0 = cpuNanos();
    List<BlockSummary> summaries = new ArrayList<>();
    for (int b = 0; b < grid.blockCount(); b++) {
      summaries.add(PartitionTask.run(setup, b));
    }
    long t1 = cpuNanos();
    List<SeamEdges> seams = new ArrayList<>();
    for (int f = 0; f < grid.faceCount(); f++) {
      seams.add(SeamTask.run(setup, f));
    }
    long t2 = cpuNanos();
    GlobalSolve.Result result = GlobalSolve.run(setup, summaries, seams);
    long t3 = cpuNanos();
    for (long c = 0; c < grid.chunkCount(); c++) {
      RelabelTask.run(setup, grid.chunkPosition(c), result.finalIds());
    }
    long t4 = cpuNanos();
    return new Stages((t1 - t0) / 1e9, (t2 - t1) / 1e9, (t3 - t2) / 1e9, (t4 - t3) / 1e9,
        result);
  }

  /**
   * Reads the affinities, partitions the whole volume, writes the labels as dataset
   * {@code name} (chunks {@code chunk}): the whole-volume run, with the same I/O as a blockwise
   * one. Returns the labels.
   */
  static long[] wholeVolume(Path root, long[] shape, int[] chunk, Offsets offsets,
      PartitionConfig config, String name) {
    Container container = Container.open(root);
    long[] max = {shape[0] - 1, shape[1] - 1, shape[2] - 1, offsets.count() - 1};
    AffinityBlock block = AffinityBlock.of(container.openDataset(AFFINITIES)
        .read(new FinalInterval(new long[4], max)), new long[3], offsets, null);
    long[] out = toLongs(config.create().partition(block).labels());
    container.createDataset(name, DatasetSpec.of(shape, chunk, DataType.UINT64))
        .write(ArrayImgs.unsignedLongs(out, shape), new long[3]);
    return out;
  }

  /**
   * Creates a Zarr container at {@code root} holding the affinities (layout of
   * {@link org.sunder.blockwise.synth.ExactAffinities}) as dataset {@link #AFFINITIES}, float32
   * in blosc-lz4 chunks of {@code chunk} voxels by all channels.
   */
  static void writeAffinities(Path root, long[] shape, int[] chunk, int channels,
      float[] affinities) {
    Container container = Container.create(root, StorageFormat.ZARR);
    long[] dims = {shape[0], shape[1], shape[2], channels};
    int[] chunks = {chunk[0], chunk[1], chunk[2], channels};
    // blosc-lz4 with byte shuffle: float affinities decode fast, and every block re-reads
    // the chunks of its halo
    container.createDataset(AFFINITIES, DatasetSpec.of(dims, chunks, DataType.FLOAT32)
            .withCodec(CodecSpec.blosc("lz4", 5, 1)))
        .write(ArrayImgs.floats(affinities, dims), new long[4]);
  }

  /** Deletes {@code root} and everything under it. */
  static void deleteTree(Path root) throws IOException {
    try (Stream<Path> paths = Files.walk(root)) {
      for (Path p : paths.sorted(Comparator.reverseOrder()).toList()) {
        Files.delete(p);
      }
    } catch (UncheckedIOException e) {
      throw e.getCause();
    }
  }

  /** The whole of a 3D UINT64 dataset. */
  static long[] read(Dataset dataset, long[] shape) {
    long[] max = {shape[0] - 1, shape[1] - 1, shape[2] - 1};
    return ((LongArray) dataset.read(new FinalInterval(new long[3], max)).update(null))
        .getCurrentStorageArray();
  }

  /**
   * The block shape of a grid with {@code perAxis} blocks along every axis: ceil(shape /
   * perAxis) rounded up to whole chunks (small axes may end up with fewer blocks).
   */
  static int[] blockShape(long[] shape, int[] chunk, int perAxis) {
    int[] block = new int[shape.length];
    for (int d = 0; d < shape.length; d++) {
      int size = (int) ((shape[d] + perAxis - 1) / perAxis);
      block[d] = (size + chunk[d] - 1) / chunk[d] * chunk[d];
    }
    return block;
  }

  /** Per axis, {@code factor} times the longest offset along it (memory order). */
  static int[] halo(int[][] offsets, int factor) {
    int[] halo = new int[offsets[0].length];
    for (int[] o : offsets) {
      for (int d = 0; d < halo.length; d++) {
        halo[d] = Math.max(halo[d], factor * Math.abs(o[d]));
      }
    }
    return halo;
  }

  /**
   * Scores {@code labels} against {@code reference}, with {@link ScoreOptions#DEFAULT};
   * {@code truth}: the reference is ground truth, whose label 0 is not evaluated.
   */
  static SegmentationScores score(long[] reference, long[] labels, boolean truth) {
    ContingencyTable table = new ContingencyTable();
    table.add(reference, labels);
    return new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(truth)).score(table);
  }

  static long[] toLongs(int[] labels) {
    long[] out = new long[labels.length];
    for (int i = 0; i < labels.length; i++) {
      out[i] = labels[i];
    }
    return out;
  }

  static int[] toInts(long[] shape) {
    int[] out = new int[shape.length];
    for (int d = 0; d < shape.length; d++) {
      out[d] = Math.toIntExact(shape[d]);
    }
    return out;
  }
}
