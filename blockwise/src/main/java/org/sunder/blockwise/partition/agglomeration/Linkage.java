package org.sunder.blockwise.partition.agglomeration;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonValue;
import java.util.Locale;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.partition.Clustering;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.Segmentation;

/**
 * How the edges between two clusters combine into one linkage value, from their statistics
 * (see {@link org.sunder.blockwise.graph.EdgeStatistics}): the criteria of "A Generalized
 * Framework for Agglomerative Clustering of Signed Graphs applied to Instance Segmentation"
 * (2019/2022). JSON names: {@code sum}, {@code mean}, {@code max}, {@code min}, {@code abs-max}.
 *
 * <p>Sum and mean values are taken {@link #onGrid on a grid}: a blockwise run adds a pair's
 * weights in another order than a one-block run, so its sums differ in their last bits, and
 * without the grid a pair that ties with another in one run would not in the other; on the grid
 * both fall to the same tie order.
 */
public enum Linkage {
  /** Sum of the weights. */
  SUM("sum"),
  /** Mean weight (average linkage). */
  MEAN("mean"),
  /** Largest weight (single linkage of similarities). */
  MAX("max"),
  /** Smallest weight (complete linkage of similarities). */
  MIN("min"),
  /** Whichever of max and min has the larger magnitude; on a tie, max. */
  ABS_MAX("abs-max");

  private final String jsonName;

  Linkage(String jsonName) {
    this.jsonName = jsonName;
  }

  @JsonValue
  public String jsonName() {
    return jsonName;
  }

  /** The linkage named {@code name}; {@link PartitionConfigException} naming the key if none. */
  @JsonCreator
  public static Linkage fromName(String name) {
    for (Linkage l : values()) {
      if (l.jsonName.equals(name) || l.name().equals(name)
          || l.jsonName.equals(String.valueOf(name).toLowerCase(Locale.ROOT))) {
        return l;
      }
    }
    throw new PartitionConfigException(ErrorKind.INVALID_CONFIG, "linkage: unknown value \""
        + name + "\"; expected one of sum, mean, max, min, abs-max");
  }

  /** The spacing of {@link #onGrid}: 2^-24, a float's resolution at 1. */
  public static final double GRID = 0x1p-24;

  /**
   * {@code x} rounded to the nearest multiple of {@link #GRID}. Sums and means that differ only
   * in their last bits round to the same value (unless they straddle a midpoint, a chance of
   * about their difference over the grid), and sums of values on the grid below 2^29 in
   * magnitude are exact in any order.
   */
  public static double onGrid(double x) {
    return Math.rint(x / GRID) * GRID;
  }

  /** The linkage value of statistics (sum, count, min, max). */
  public double value(double sum, long count, double min, double max) {
    return switch (this) {
      case SUM -> onGrid(sum);
      case MEAN -> onGrid(sum / count);
      case MAX -> max;
      case MIN -> min;
      case ABS_MAX -> Math.abs(max) >= Math.abs(min) ? max : min;
    };
  }
}
