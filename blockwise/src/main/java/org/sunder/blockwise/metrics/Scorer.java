package org.sunder.blockwise.metrics;

import it.unimi.dsi.fastutil.ints.IntArrays;
import it.unimi.dsi.fastutil.ints.IntComparator;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/**
 * Computes {@link SegmentationScores} from a {@link ContingencyTable}. With {@code n_ij} the
 * voxels of ground-truth object {@code i} in segment {@code j}, {@code a_i} and {@code b_j} the
 * object and segment sizes and {@code N} the evaluated voxels:
 *
 * <ul>
 *   <li>variation of information ("Comparing clusterings — an information based distance",
 *       2007), split {@code H(S|G) = (Σ a log2 a - Σ n log2 n) / N}, merge
 *       {@code H(G|S) = (Σ b log2 b - Σ n log2 n) / N};
 *   <li>adapted Rand error ("Crowdsourcing the creation of image segmentation algorithms for
 *       connectomics", 2015) over pairs of distinct voxels: precision
 *       {@code Σ n(n-1) / Σ b(b-1)}, recall {@code Σ n(n-1) / Σ a(a-1)}, error
 *       {@code 1 - 2PR/(P+R)}; a precision or recall with no pair to judge is 1;
 *   <li>adjusted Rand index ("Comparing partitions", 1985) from the pair confusion counts,
 *       1 when no pair is in disagreement.
 * </ul>
 *
 * <p>Segment label 0 is an ordinary segment in the scores; it is left out of
 * {@link SegmentationScores#segmentCount()} only. Sums run in a fixed order (sorted pairs), so
 * equal tables give bit-identical scores however they were accumulated. {@code O(p log p)} for
 * {@code p} label pairs; sums in {@code double}.
 */
public final class Scorer {

  private static final double INVERSE_LN_2 = 1 / Math.log(2);

  private final ScoreOptions options;

  public Scorer(ScoreOptions options) {
    this.options = Objects.requireNonNull(options, "options");
  }

  /**
   * Scores one table.
   *
   * @throws SunderException {@link ErrorKind#INVALID_INPUT} when no voxel is left to evaluate
   */
  public SegmentationScores score(ContingencyTable table) {
    ContingencyTable.Pairs all = table.sortedPairs();
    Pairs p = evaluated(all);
    if (p.size() == 0) {
      throw new SunderException(ErrorKind.INVALID_INPUT, "no voxel to evaluate: the table holds "
          + table.voxelCount() + " voxels" + (options.ignoreGroundTruthZero()
              ? ", all with ground-truth label 0, which is ignored" : ""));
    }
    int[] rowOrder = LabelRanks.identity(p.size());
    int[] columnOrder = new LabelRanks(p.s).stableSort(rowOrder);
    Marginals rows = marginals(p.g, p.c, rowOrder);
    Marginals columns = marginals(p.s, p.c, columnOrder);
    double n = 0;
    double nLogN = 0;
    double nSquares = 0;
    for (int i = 0; i < p.size(); i++) {
      double c = p.c[i];
      n += c;
      nLogN += xlog2x(c);
      nSquares += c * c;
    }
    double voiSplit = Math.max(0, (rows.xLogX - nLogN) / n);
    double voiMerge = Math.max(0, (columns.xLogX - nLogN) / n);
    double precision = ratioOrOne(nSquares - n, columns.squares - n);
    double recall = ratioOrOne(nSquares - n, rows.squares - n);
    double are = precision + recall == 0 ? 1 : 1 - 2 * precision * recall / (precision + recall);
    double ari = adjustedRand(n, nSquares, rows.squares, columns.squares);
    return new SegmentationScores(voiSplit, voiMerge, are, precision, recall, ari,
        columns.nonZeroLabels, rows.nonZeroLabels, (long) n,
        worst(p.g, p.s, p.c, rowOrder), worst(p.s, p.g, p.c, columnOrder));
  }

  private Pairs evaluated(ContingencyTable.Pairs all) {
    int start = 0;
    long[] g = all.groundTruth();
    if (options.ignoreGroundTruthZero()) {
      while (start < g.length && g[start] == 0) {
        start++;
      }
    }
    return new Pairs(Arrays.copyOfRange(g, start, g.length),
        Arrays.copyOfRange(all.segment(), start, g.length),
        Arrays.copyOfRange(all.count(), start, g.length));
  }

  private record Pairs(long[] g, long[] s, long[] c) {
    int size() {
      return c.length;
    }
  }

  private record Marginals(double xLogX, double squares, long nonZeroLabels) {}

  private static Marginals marginals(long[] key, long[] count, int[] order) {
    double xLogX = 0;
    double squares = 0;
    long nonZero = 0;
    int i = 0;
    while (i < order.length) {
      long label = key[order[i]];
      double sum = 0;
      while (i < order.length && key[order[i]] == label) {
        sum += count[order[i]];
        i++;
      }
      xLogX += xlog2x(sum);
      squares += sum * sum;
      if (label != 0) {
        nonZero++;
      }
    }
    return new Marginals(xLogX, squares, nonZero);
  }

  /** sklearn-style pair confusion: tp, fp, fn, tn counted over ordered pairs. */
  private static double adjustedRand(double n, double nSquares, double aSquares,
      double bSquares) {
    double tp = nSquares - n;
    double fp = bSquares - nSquares;
    double fn = aSquares - nSquares;
    double tn = n * n - fp - fn - nSquares;
    if (fp == 0 && fn == 0) {
      return 1.0;
    }
    return 2.0 * (tp * tn - fn * fp) / ((tp + fn) * (fn + tn) + (tp + fp) * (fp + tn));
  }

  private List<ObjectOverlaps> worst(long[] key, long[] other, long[] count, int[] order) {
    List<int[]> groups = new ArrayList<>();
    int i = 0;
    while (i < order.length) {
      int start = i;
      long label = key[order[i]];
      while (i < order.length && key[order[i]] == label) {
        i++;
      }
      if (i - start > 1) {
        groups.add(new int[] {start, i});
      }
    }
    long[] misassigned = new long[groups.size()];
    for (int k = 0; k < misassigned.length; k++) {
      int[] range = groups.get(k);
      long total = 0;
      long largest = 0;
      for (int j = range[0]; j < range[1]; j++) {
        total += count[order[j]];
        largest = Math.max(largest, count[order[j]]);
      }
      misassigned[k] = total - largest;
    }
    int[] ranked = sortedIndices(groups.size(), (x, y) -> {
      int byError = Long.compare(misassigned[y], misassigned[x]);
      if (byError != 0) {
        return byError;
      }
      int[] rx = groups.get(x);
      int[] ry = groups.get(y);
      int byParts = Integer.compare(ry[1] - ry[0], rx[1] - rx[0]);
      return byParts != 0 ? byParts : Long.compareUnsigned(key[order[rx[0]]], key[order[ry[0]]]);
    });
    List<ObjectOverlaps> out = new ArrayList<>();
    for (int k = 0; k < Math.min(ranked.length, options.worstListLength()); k++) {
      out.add(overlaps(groups.get(ranked[k]), key, other, count, order));
    }
    return out;
  }

  private ObjectOverlaps overlaps(int[] range, long[] key, long[] other, long[] count,
      int[] order) {
    int parts = range[1] - range[0];
    int[] byVoxels = sortedIndices(parts, (x, y) -> {
      int a = order[range[0] + x];
      int b = order[range[0] + y];
      int bySize = Long.compare(count[b], count[a]);
      return bySize != 0 ? bySize : Long.compareUnsigned(other[a], other[b]);
    });
    int listed = Math.min(parts, options.overlapsListed());
    long[] labels = new long[listed];
    long[] voxels = new long[listed];
    long total = 0;
    for (int j = 0; j < parts; j++) {
      total += count[order[range[0] + j]];
    }
    for (int j = 0; j < listed; j++) {
      int e = order[range[0] + byVoxels[j]];
      labels[j] = other[e];
      voxels[j] = count[e];
    }
    return new ObjectOverlaps(key[order[range[0]]], total, parts, labels, voxels);
  }

  private static double ratioOrOne(double numerator, double denominator) {
    return denominator == 0 ? 1.0 : numerator / denominator;
  }

  private static double xlog2x(double x) {
    return x <= 1 ? 0 : x * (Math.log(x) * INVERSE_LN_2);
  }

  /**
   * {@code 0 .. n-1} in the order of {@code comparison} (a stable merge sort, {@code O(n log n)}
   * comparisons; allocates the result and a buffer of {@code n} ints).
   */
  private static int[] sortedIndices(int n, IntComparator comparison) {
    int[] index = new int[n];
    for (int i = 0; i < n; i++) {
      index[i] = i;
    }
    IntArrays.mergeSort(index, comparison);
    return index;
  }
}
