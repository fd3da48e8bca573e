package org.sunder.blockwise.metrics;

import net.imglib2.Cursor;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.type.numeric.IntegerType;
import net.imglib2.view.Views;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.blockwise.partition.fragments.BaselineWatershed;
import org.sunder.blockwise.store.Dataset;

/**
 * The naive seeded watershed ({@link BaselineWatershed}) at the seed threshold that scores best
 * against the ground truth, the lowest adapted Rand error over {@link #THRESHOLDS}: the
 * strongest fair form of the yardstick, as a lab would tune its one threshold by eye. Ties go to
 * the first threshold listed.
 *
 * @param threshold the chosen seed threshold
 * @param segmentation the baseline's labels at that threshold
 * @param scores its scores against the ground truth
 */
public record TunedBaseline(double threshold, Segmentation segmentation,
    SegmentationScores scores) {

  /** The seed thresholds tried, on the boundary map {@code 1 − mean(nearest-neighbour a)}. */
  public static final double[] THRESHOLDS = {0.1, 0.15, 0.2, 0.3, 0.5};

  /**
   * Runs the baseline at every threshold on {@code block} and keeps the best; {@code
   * groundTruth} holds one label per voxel of the block (0 ignored, as
   * {@link ScoreOptions#DEFAULT} says). One baseline run per threshold.
   */
  public static TunedBaseline of(AffinityBlock block, long[] groundTruth) {
    TunedBaseline best = null;
    for (double threshold : THRESHOLDS) {
      Segmentation seg = new BaselineWatershed(threshold).partition(block);
      ContingencyTable table = new ContingencyTable();
      table.add(groundTruth, widened(seg.labels()));
      SegmentationScores scores = new Scorer(ScoreOptions.DEFAULT).score(table);
      if (best == null || scores.adaptedRandError() < best.scores.adaptedRandError()) {
        best = new TunedBaseline(threshold, seg, scores);
      }
    }
    return best;
  }

  /**
   * The tuned baseline of a volume stored whole: {@code affinities} (channel last) with its
   * {@code offsets}, scored against {@code groundTruth} of the same spatial shape. Reads both
   * into memory ({@code 4 · channels + 8} bytes per voxel): for demo-sized volumes.
   */
  public static TunedBaseline of(Dataset affinities, Offsets offsets, Dataset groundTruth) {
    long[] shape = groundTruth.shape();
    ArrayImg<?, ?> values = affinities.read(new FinalInterval(affinities.shape()));
    AffinityBlock block = AffinityBlock.of(values, new long[shape.length], offsets, null);
    ArrayImg<?, ?> truth = groundTruth.read(new FinalInterval(shape));
    long[] labels = new long[block.voxelCount()];
    Cursor<? extends IntegerType<?>> cursor = Views.flatIterable(
        (ArrayImg<? extends IntegerType<?>, ?>) truth).cursor();
    for (int i = 0; i < labels.length; i++) {
      labels[i] = cursor.next().getIntegerLong();
    }
    return of(block, labels);
  }

  private static long[] widened(int[] labels) {
    long[] wide = new long[labels.length];
    for (int i = 0; i < labels.length; i++) {
      wide[i] = labels[i];
    }
    return wide;
  }
}
