package org.sunder.blockwise.metrics;

import java.util.List;
import java.util.Objects;
import net.imglib2.FinalInterval;
import net.imglib2.Interval;
import org.sunder.blockwise.store.Dataset;

/**
 * Where {@link Evaluator} counts voxels: the whole volume, the non-zero voxels of a mask
 * dataset, or the union of a list of boxes (sparse ground truth annotated in a few boxes;
 * overlapping boxes count their shared voxels once).
 */
public sealed interface EvaluationRegion {

  /** Every voxel. */
  static EvaluationRegion whole() {
    return new Whole();
  }

  /** Voxels where the mask dataset (any integer type, same shape) is non-zero. */
  static EvaluationRegion mask(Dataset mask) {
    return new Masked(Objects.requireNonNull(mask, "mask"));
  }

  /** Voxels inside at least one box (global coordinates, memory order, inclusive maxima). */
  static EvaluationRegion boxes(List<? extends Interval> boxes) {
    Objects.requireNonNull(boxes, "boxes");
    return new Boxes(boxes.stream().map(b -> (Interval) new FinalInterval(b)).toList());
  }

  /** The whole volume. */
  record Whole() implements EvaluationRegion {}

  /** The non-zero voxels of a mask dataset. */
  record Masked(Dataset mask) implements EvaluationRegion {}

  /** The union of boxes; copies of the given intervals. */
  record Boxes(List<Interval> boxes) implements EvaluationRegion {
    public Boxes {
      boxes = List.copyOf(boxes);
    }
  }
}
