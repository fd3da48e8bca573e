package org.sunder.stitching.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.partition.config.PartitionConfig;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.blockwise.synth.TissuePreset;

/**
 * How many objects the default method's whole-volume result (no blocks, so no seams) cuts at
 * each plane between two voxel layers, by the seam audit's rule ({@link SeamAudit}: at least
 * {@value SeamAudit#MIN_PAIRS} voxel pairs of the object across the plane, at least half of them
 * with different segment labels). A seam audit compares block faces with control planes; this
 * shows how much a seam-free result's cut count varies from plane to plane and with the
 * distance to the volume's ends, which the two sets of planes should share.
 *
 * <p>Prints, per seed and axis, the count at every plane (plane {@code p} lies between layers
 * {@code p - 1} and {@code p}), then per axis the mean count per plane over the seeds by
 * distance to the nearer end of the volume, in bands of {@value #BAND} planes. Arguments:
 * preset name, seeds ({@code 1,2,3}) and optionally the shape {@code x y z} (default
 * {@link TissuePreset#STANDARD_SHAPE}). One thread; about ten seconds per volume.
 */
public final class PlaneCutProfile {
  private static final int BAND = 8;
  private static final int[] CHUNK = {64, 64, 32};
  private static final String[] AXES = {"x", "y", "z"};

  private PlaneCutProfile() {}

  public static void main(String[] args) throws Exception {
    TissuePreset preset = TissuePreset.named(args[0]);
    String[] seeds = args[1].split(",");
    long[] shape = args.length >= 5 ? new long[] {Long.parseLong(args[2]),
        Long.parseLong(args[3]), Long.parseLong(args[4])} : TissuePreset.STANDARD_SHAPE.clone();
    long[][] sums = new long[3][];
    for (int axis = 0; axis < 3; axis++) {
      sums[axis] = new long[(int) shape[axis]];
    }
    for (String seedText : seeds) {
      long seed = Long.parseLong(seedText);
      SyntheticVolume volume = preset.volume(seed, shape);
      float[] affinities = preset.affinities(volume, seed);
      Path root = Files.createTempDirectory("sunder-plane-cuts");
      long[] labels;
      try {
        BlockwiseRuns.writeAffinities(root, shape, CHUNK, TissuePreset.offsets().count(),
            affinities);
        labels = BlockwiseRuns.wholeVolume(root, shape, CHUNK, TissuePreset.offsets(),
            PartitionConfig.robustDefault(volume.spec().voxelSize()), "whole");
      } finally {
        BlockwiseRuns.deleteTree(root);
      }
      for (int axis = 0; axis < 3; axis++) {
        int[] cuts = cutsPerPlane(volume.labels(), labels, shape, axis);
        StringBuilder line = new StringBuilder();
        for (int p = 1; p < cuts.length; p++) {
          sums[axis][p] += cuts[p];
          line.append(p == 1 ? "" : ",").append(cuts[p]);
        }
        System.out.printf(Locale.ROOT, "%s seed %d, planes along %s: %s%n", preset.presetName(),
            seed, AXES[axis], line);
      }
    }
    for (int axis = 0; axis < 3; axis++) {
      int planes = sums[axis].length;
      StringBuilder line = new StringBuilder();
      for (int band = 0; BAND * band + 1 <= planes / 2; band++) {
        long total = 0;
        int count = 0;
        for (int p = 1; p < planes; p++) {
          int distance = Math.min(p, planes - p);
          if (distance > BAND * band && distance <= BAND * (band + 1)) {
            total += sums[axis][p];
            count++;
          }
        }
        line.append(String.format(Locale.ROOT, "  %d-%d: %.2f", BAND * band + 1,
            BAND * (band + 1), (double) total / count / seeds.length));
      }
      System.out.printf(Locale.ROOT, "%s, planes along %s, mean objects cut per plane by"
          + " distance to the nearer end (planes):%s%n", preset.presetName(), AXES[axis], line);
    }
  }

  /**
   * Per plane {@code p} along {@code axis} ({@code 1 <= p < shape[axis]}; index 0 unused), the
   * ground-truth objects it cuts by the seam audit's rule.
   */
  static int[] cutsPerPlane(long[] truth, long[] labels, long[] shape, int axis) {
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    int step = axis == 0 ? 1 : axis == 1 ? nx : nx * ny;
    int[] cuts = new int[(int) shape[axis]];
    for (int p = 1; p < cuts.length; p++) {
      // per object: pairs across the plane inside it, and of those, pairs the labels cut
      Map<Long, int[]> pairs = new HashMap<>();
      for (int z = axis == 2 ? p : 0; z < (axis == 2 ? p + 1 : nz); z++) {
        for (int y = axis == 1 ? p : 0; y < (axis == 1 ? p + 1 : ny); y++) {
          for (int x = axis == 0 ? p : 0; x < (axis == 0 ? p + 1 : nx); x++) {
            int i = x + nx * (y + ny * z);
            int j = i - step;
            if (truth[i] == 0 || truth[i] != truth[j] || labels[i] == 0 || labels[j] == 0) {
              continue;
            }
            int[] tally = pairs.computeIfAbsent(truth[i], object -> new int[2]);
            tally[0]++;
            if (labels[i] != labels[j]) {
              tally[1]++;
            }
          }
        }
      }
      for (int[] tally : pairs.values()) {
        if (tally[0] >= SeamAudit.MIN_PAIRS && 2 * tally[1] >= tally[0]) {
          cuts[p]++;
        }
      }
    }
    return cuts;
  }
}
