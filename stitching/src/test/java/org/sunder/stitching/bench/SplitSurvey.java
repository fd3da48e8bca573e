package org.sunder.stitching.bench;

import static org.sunder.blockwise.partition.config.FragmentsMulticutMethod.LOGIT_CLAMP;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import net.imglib2.FinalInterval;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.graph.Subsampling;
import org.sunder.blockwise.graph.WeightRule;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.partition.fragments.BlockFragments;
import org.sunder.blockwise.partition.fragments.FragmentOptions;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * Where the default method splits objects, on one tissue preset's whole volume against its
 * ground truth. Prints:
 *
 * <ul>
 *   <li>the <em>extra</em> segments (each segment belongs to the ground-truth object holding most
 *       of its voxels; an extra one is not that object's largest segment) by how many sections
 *       along z they span, with their voxels;
 *   <li>how pure the fragments and the segments are: voxels outside the object holding most of
 *       their fragment or segment, and the fragments or segments with at least 20 such voxels;
 *   <li>per channel, between each extra segment spanning at least {@value #LONG_PIECE} sections
 *       and its object's largest segment, the summed logit weights (affinities clamped as the
 *       multicut clamps them) of the voxel edges whose two ends lie in one ground-truth object
 *       and of those whose ends lie in two: what holds the two pieces apart.
 * </ul>
 *
 * <p>Arguments: preset name, seed, and optionally the shape {@code x y z} (default
 * {@link TissuePreset#STANDARD_SHAPE}). One thread; about a minute per volume.
 */
public final class SplitSurvey {
  /** Extra segments spanning at least this many sections count as long pieces. */
  private static final int LONG_PIECE = 7;
  private static final int[] CHUNK = {32, 32, 8};
  /** The default method's voxel-edge weights. */
  private static final WeightRule LOGIT = WeightRule.logit(LOGIT_CLAMP);

  private SplitSurvey() {}

  public static void main(String[] args) throws Exception {
    TissuePreset preset = TissuePreset.named(args[0]);
    long seed = Long.parseLong(args[1]);
    long[] shape = args.length >= 5 ? new long[] {Long.parseLong(args[2]),
        Long.parseLong(args[3]), Long.parseLong(args[4])} : TissuePreset.STANDARD_SHAPE.clone();
    SyntheticVolume volume = preset.volume(seed, shape);
    float[] affinities = preset.affinities(volume, seed);
    long[] truth = volume.labels();
    Offsets offsets = TissuePreset.offsets();
    double[] voxelSize = volume.spec().voxelSize();
    Path root = Files.createTempDirectory("sunder-split-survey");
    BlockwiseRuns.writeAffinities(root, shape, CHUNK, offsets.count(), affinities);
    long[] segments = BlockwiseRuns.wholeVolume(root, shape, CHUNK, offsets,
        PartitionConfig.robustDefault(voxelSize), "whole");
    Container container = Container.open(root);
    long[] max = {shape[0] - 1, shape[1] - 1, shape[2] - 1, offsets.count() - 1};
    AffinityBlock block = AffinityBlock.of(container.openDataset(BlockwiseRuns.AFFINITIES)
        .read(new FinalInterval(new long[4], max)), new long[3], offsets, null);
    int[] fragments = BlockFragments.of(block, FragmentOptions.fittedTo(voxelSize), LOGIT,
        Subsampling.none(), true).labels();

    Pieces pieces = new Pieces(segments, truth, (int) (shape[0] * shape[1]));
    System.out.printf(Locale.ROOT, "%s seed %d, %s voxels: %d segments, %d extra%n",
        preset.presetName(), seed, java.util.Arrays.toString(shape), pieces.size.size(),
        pieces.extraCount());
    pieces.printExtrasBySpan();
    printPurity("fragments", toLongs(fragments), truth);
    printPurity("segments", segments, truth);
    printCostsApart(pieces, segments, truth, majorityObjects(fragments, truth), fragments,
        affinities, offsets, shape);
  }

  /** Each segment's size, z span and majority object; each object's largest segment. */
  private static final class Pieces {
    final Map<Long, Long> size = new HashMap<>();
    final Map<Long, int[]> zSpan = new HashMap<>();
    final Map<Long, Long> objectOf = new HashMap<>();
    final Map<Long, Long> largestOf = new HashMap<>();

    Pieces(long[] segments, long[] truth, int plane) {
      Map<Long, Map<Long, Long>> overlap = new HashMap<>();
      for (int i = 0; i < segments.length; i++) {
        long s = segments[i];
        if (truth[i] == 0 || s == 0) {
          continue;
        }
        size.merge(s, 1L, Long::sum);
        overlap.computeIfAbsent(s, k -> new HashMap<>()).merge(truth[i], 1L, Long::sum);
        int z = i / plane;
        int[] span = zSpan.computeIfAbsent(s, k -> new int[] {z, z});
        span[0] = Math.min(span[0], z);
        span[1] = Math.max(span[1], z);
      }
      Map<Long, Long> largestOverlap = new HashMap<>();
      for (var segment : overlap.entrySet()) {
        long best = 0;
        for (var object : segment.getValue().entrySet()) {
          if (object.getValue() > best) {
            best = object.getValue();
            objectOf.put(segment.getKey(), object.getKey());
          }
          if (object.getValue() > largestOverlap.getOrDefault(object.getKey(), 0L)) {
            largestOverlap.put(object.getKey(), object.getValue());
            largestOf.put(object.getKey(), segment.getKey());
          }
        }
      }
    }

    boolean isExtra(long segment) {
      return largestOf.get(objectOf.get(segment)) != segment;
    }

    int sections(long segment) {
      int[] span = zSpan.get(segment);
      return span[1] - span[0] + 1;
    }

    long extraCount() {
      return size.keySet().stream().filter(this::isExtra).count();
    }

    void printExtrasBySpan() {
      int[] count = new int[LONG_PIECE + 1];
      long[] voxels = new long[LONG_PIECE + 1];
      for (var e : size.entrySet()) {
        if (isExtra(e.getKey())) {
          int span = Math.min(LONG_PIECE, sections(e.getKey()));
          count[span]++;
          voxels[span] += e.getValue();
        }
      }
      for (int span = 1; span <= LONG_PIECE; span++) {
        System.out.printf(Locale.ROOT, "  extra segments spanning %s%d sections: %d, %d voxels%n",
            span == LONG_PIECE ? ">= " : "", span, count[span], voxels[span]);
      }
    }
  }

  private static void printPurity(String what, long[] labels, long[] truth) {
    Map<Long, Map<Long, Long>> overlap = new HashMap<>();
    for (int i = 0; i < labels.length; i++) {
      if (truth[i] != 0 && labels[i] != 0) {
        overlap.computeIfAbsent(labels[i], k -> new HashMap<>()).merge(truth[i], 1L, Long::sum);
      }
    }
    long foreign = 0;
    long total = 0;
    int impure = 0;
    for (Map<Long, Long> objects : overlap.values()) {
      long sum = 0;
      long best = 0;
      for (long v : objects.values()) {
        sum += v;
        best = Math.max(best, v);
      }
      total += sum;
      foreign += sum - best;
      impure += sum - best >= 20 ? 1 : 0;
    }
    System.out.printf(Locale.ROOT, "  %s: %d; voxels outside their majority object %d of %d"
        + " (%.2f %%); %d with at least 20 such voxels%n", what, overlap.size(), foreign, total,
        100.0 * foreign / total, impure);
  }

  private static void printCostsApart(Pieces pieces, long[] segments, long[] truth,
      Map<Long, Long> objectOfFragment, int[] fragments, float[] affinities, Offsets offsets,
      long[] shape) {
    // the foreign ends of edges across objects: in a fragment of the segment's own object (a
    // sliver the flood gave it), in a fragment of another object (joined by the multicut), or
    // on ground-truth background
    double[] foreignWeight = new double[3];
    long[] foreignEnds = new long[3];
    int[][] vectors = offsets.vectors();
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    int n = segments.length;
    double[] costSame = new double[vectors.length];
    double[] costAcross = new double[vectors.length];
    long[] edgesSame = new long[vectors.length];
    long[] edgesAcross = new long[vectors.length];
    for (int i = 0; i < n; i++) {
      long a = segments[i];
      if (a == 0 || !pieces.size.containsKey(a)) {
        continue;
      }
      int x = i % nx;
      int y = i / nx % ny;
      int z = i / (nx * ny);
      for (int k = 0; k < vectors.length; k++) {
        int qx = x + vectors[k][0];
        int qy = y + vectors[k][1];
        int qz = z + vectors[k][2];
        if (qx < 0 || qy < 0 || qz < 0 || qx >= nx || qy >= ny || qz >= nz) {
          continue;
        }
        int j = qx + nx * (qy + ny * qz);
        long b = segments[j];
        if (b == 0 || b == a || !pieces.size.containsKey(b)
            || !(isLongPieceOf(pieces, a, b) || isLongPieceOf(pieces, b, a))) {
          continue;
        }
        double w = LOGIT.weight(affinities[i + k * n], 0f);
        if (truth[i] != 0 && truth[i] == truth[j]) {
          costSame[k] += w;
          edgesSame[k]++;
        } else {
          costAcross[k] += w;
          edgesAcross[k]++;
          for (int end : new int[] {i, j}) {
            long object = pieces.objectOf.get(segments[end]);
            if (truth[end] == object) {
              continue;
            }
            int kind = truth[end] == 0 ? 2
                : objectOfFragment.get((long) fragments[end]) == object ? 0 : 1;
            foreignWeight[kind] += w;
            foreignEnds[kind]++;
          }
        }
      }
    }
    System.out.printf(Locale.ROOT, "  between each extra segment spanning >= %d sections and"
        + " its object's largest segment, per channel (offset x, y, z):%n", LONG_PIECE);
    for (int k = 0; k < vectors.length; k++) {
      System.out.printf(Locale.ROOT, "    %-12s ends in one object: %6d edges, weight %8.0f;"
          + " ends in two objects: %6d edges, weight %8.0f%n",
          java.util.Arrays.toString(vectors[k]), edgesSame[k], costSame[k], edgesAcross[k],
          costAcross[k]);
    }
    System.out.printf(Locale.ROOT, "  their foreign ends: in a fragment of the segment's own"
        + " object %d (weight %.0f), in a fragment of another object %d (%.0f), on background %d"
        + " (%.0f)%n", foreignEnds[0], foreignWeight[0], foreignEnds[1], foreignWeight[1],
        foreignEnds[2], foreignWeight[2]);
  }

  /** Per fragment, the ground-truth object (background included) holding most of its voxels. */
  private static Map<Long, Long> majorityObjects(int[] fragments, long[] truth) {
    Map<Long, Map<Long, Long>> overlap = new HashMap<>();
    for (int i = 0; i < fragments.length; i++) {
      overlap.computeIfAbsent((long) fragments[i], k -> new HashMap<>())
          .merge(truth[i], 1L, Long::sum);
    }
    Map<Long, Long> out = new HashMap<>();
    for (var e : overlap.entrySet()) {
      out.put(e.getKey(), e.getValue().entrySet().stream()
          .max(Map.Entry.comparingByValue()).orElseThrow().getKey());
    }
    return out;
  }

  /** Whether {@code piece} is a long extra segment and {@code main} its object's largest. */
  private static boolean isLongPieceOf(Pieces pieces, long piece, long main) {
    return pieces.isExtra(piece) && pieces.sections(piece) >= LONG_PIECE
        && pieces.largestOf.get(pieces.objectOf.get(piece)) == main;
  }

  private static long[] toLongs(int[] labels) {
    long[] out = new long[labels.length];
    for (int i = 0; i < labels.length; i++) {
      out[i] = labels[i];
    }
    return out;
  }
}
