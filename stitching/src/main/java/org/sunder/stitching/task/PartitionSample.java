package org.sunder.stitching.task;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.stream.Stream;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.array.ArrayImgs;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GridGraph;
import org.sunder.blockwise.grid.Block;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.grid.Shapes;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.stitching.setup.AffinityReader;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * Figures of one sample block, measured in this process without writing to the run's output:
 * the partition task's computation ({@link PartitionTask}: read the extended box, partition,
 * summarise), timed as a whole and its read alone; the seam task's first half on one face
 * per axis, on the block's upper side, else its lower side (read the slab's affinities, build its graph; the label read and the
 * edge aggregation are not timed); and the relabel task's chunk I/O on the block's provisional
 * labels (write them into a temporary dataset of the output's chunk shape in
 * {@code java.io.tmpdir}, then read, map and rewrite every chunk, as relabel does; the
 * temporary container is removed). Costs about one partition task.
 *
 * @param block the block's index
 * @param extendedVoxels voxels of its extended box
 * @param coreVoxels voxels of its core
 * @param seconds the partition task's computation (read included)
 * @param readSeconds reading the extended box's affinities
 * @param segments segments of the core
 * @param boundarySegments segments near a face
 * @param innerEdges inner and interior edges of the summary (what the reduced graph gathers from
 *     the block)
 * @param boundaryPerSide per side (bit {@code 2 * axis + 1} upper, {@code 2 * axis} lower),
 *     boundary segments near it
 * @param seamFaces faces timed (one per axis that has a face on either side)
 * @param seamSlabVoxels voxels of the timed face slabs
 * @param seamSeconds reading and building the graphs of those slabs
 * @param relabelVoxels voxels of the relabelled chunks
 * @param relabelSeconds reading, mapping and rewriting them
 */
public record PartitionSample(int block, long extendedVoxels, long coreVoxels, double seconds,
    double readSeconds, int segments, int boundarySegments, long innerEdges,
    int[] boundaryPerSide, int seamFaces, long seamSlabVoxels, double seamSeconds, long relabelVoxels,
    double relabelSeconds) {

  public PartitionSample {
    boundaryPerSide = boundaryPerSide.clone();
  }

  @Override
  public int[] boundaryPerSide() {
    return boundaryPerSide.clone();
  }

  /** Measures block {@code blockIndex} of {@code setup}. */
  public static PartitionSample measure(StitchingSetup setup, int blockIndex) {
    BlockGrid grid = setup.grid();
    Block block = grid.block(blockIndex);
    long start = System.nanoTime();
    AffinityBlock affinities = AffinityReader.readBlock(setup, block);
    double read = (System.nanoTime() - start) / 1e9;
    CoreSegments.Result result =
        PartitionTask.partition(setup, block, affinities, setup.partition());
    double seconds = (System.nanoTime() - start) / 1e9;
    affinities = null;
    BlockSummary summary = result.summary();
    int n = grid.numDimensions();
    int[] perSide = new int[2 * n];
    for (int sides : summary.boundarySides()) {
      for (int bit = 0; bit < 2 * n; bit++) {
        perSide[bit] += (sides >>> bit) & 1;
      }
    }
    long slabVoxels = 0;
    int faces = 0;
    long seamStart = System.nanoTime();
    PartitionConfig config = setup.partition();
    for (int axis = 0; axis < n; axis++) {
      int faceIndex = grid.faceIndex(blockIndex, axis, true);
      if (faceIndex < 0) {
        faceIndex = grid.faceIndex(blockIndex, axis, false);
      }
      if (faceIndex >= 0) {
        Face face = grid.face(faceIndex);
        SeamExtraction.Box slab = SeamExtraction.slab(grid, face, setup.offsets());
        AffinityBlock slabAffinities = AffinityReader.read(setup, slab.min(), slab.max());
        GridGraph.of(slabAffinities, config.weights(), config.subsampling());
        faces++;
        slabVoxels += Shapes.elementCount(extent(slab.min(), slab.max()));
      }
    }
    double seamSeconds = (System.nanoTime() - seamStart) / 1e9;
    int[] coreShape = block.coreShape();
    long[] core = new long[n];
    for (int d = 0; d < n; d++) {
      core[d] = coreShape[d];
    }
    double relabelSeconds = timeRelabel(result.provisionalLabels(), core, grid.chunkShape());
    return new PartitionSample(blockIndex, Shapes.elementCount(extent(block.extendedMin(),
        block.extendedMax())), Shapes.elementCount(core), seconds, read,
        summary.segmentCount(), summary.boundaryLocalIds().length,
        (long) summary.innerEdges().size() + summary.interiorEdges().size(), perSide,
        faces, slabVoxels, seamSeconds, Shapes.elementCount(core), relabelSeconds);
  }

  /**
   * Writes {@code labels} (a box of {@code shape}) into a temporary uint64 dataset with chunks
   * {@code chunks}, then times reading, mapping (an array lookup per voxel, as the final-id map
   * does) and rewriting every chunk. O(voxels).
   */
  private static double timeRelabel(long[] labels, long[] shape, int[] chunks) {
    Path dir;
    try {
      dir = Files.createTempDirectory("sunder-plan-sample");
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot create a temporary directory for"
          + " the sample relabel: " + e.getMessage(), e);
    }
    try {
      Container container = Container.create(dir.resolve("sample.zarr"), StorageFormat.ZARR);
      Dataset dataset = container.createDataset("labels",
          DatasetSpec.of(shape, chunks, DataType.UINT64));
      dataset.write(ArrayImgs.unsignedLongs(labels, shape), new long[shape.length]);
      long[] grid = dataset.gridShape();
      long[] position = new long[grid.length];
      long start = System.nanoTime();
      long chunkCount = Shapes.elementCount(grid);
      long[] shift = {0, 1};
      for (long c = 0; c < chunkCount; c++) {
        long rest = c;
        for (int d = 0; d < grid.length; d++) {
          position[d] = rest % grid[d];
          rest /= grid[d];
        }
        ArrayImg<?, ?> chunk = dataset.readChunk(position);
        long[] values = ((LongArray) chunk.update(null)).getCurrentStorageArray();
        for (int i = 0; i < values.length; i++) {
          values[i] += shift[(int) (values[i] & 1)];
        }
        dataset.writeChunk(position, chunk);
      }
      return (System.nanoTime() - start) / 1e9;
    } finally {
      deleteTree(dir);
    }
  }

  private static long[] extent(long[] min, long[] max) {
    long[] e = new long[min.length];
    for (int d = 0; d < min.length; d++) {
      e[d] = max[d] - min[d] + 1;
    }
    return e;
  }

  private static void deleteTree(Path dir) {
    try (Stream<Path> walk = Files.walk(dir)) {
      for (Path path : walk.sorted(Comparator.reverseOrder()).toList()) {
        Files.deleteIfExists(path);
      }
    } catch (IOException e) {
      throw new SunderException(ErrorKind.STORAGE, "cannot remove the temporary " + dir + ": "
          + e.getMessage(), e);
    }
  }
}
