package org.sunder.stitching.solve;

import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.LongArray;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.stitching.setup.StitchingSetup;

/**
 * The relabel stage's task: one chunk of the label dataset, provisional ids replaced by final
 * ids in place. The chunk is rewritten atomically (the store writes a temporary file and renames
 * it), and only when it held a provisional id, so a chunk already relabelled is left untouched:
 * running the task twice equals running it once, and a retry after a crash is safe.
 * O(chunk voxels).
 */
public final class RelabelTask {
  private RelabelTask() {}

  /** Relabels chunk {@code chunkPosition} of the setup's label dataset; returns voxels changed. */
  public static long run(StitchingSetup setup, long[] chunkPosition, IdRelabel map) {
    return relabel(setup.openLabels(), chunkPosition, map);
  }

  /** Relabels one chunk of {@code labels} (UINT64); returns the number of voxels changed. */
  public static long relabel(Dataset labels, long[] chunkPosition, IdRelabel map) {
    if (labels.dataType() != DataType.UINT64) {
      throw new SunderException(ErrorKind.INVALID_INPUT, labels + ": label datasets are UINT64,"
          + " this one is " + labels.dataType());
    }
    ArrayImg<?, ?> chunk = labels.readChunk(chunkPosition);
    long[] values = ((LongArray) chunk.update(null)).getCurrentStorageArray();
    int changed = map.applyInPlace(values);
    if (changed > 0) {
      labels.writeChunk(chunkPosition, chunk);
    }
    return changed;
  }
}
