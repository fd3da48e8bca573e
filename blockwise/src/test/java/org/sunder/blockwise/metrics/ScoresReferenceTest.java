package org.sunder.blockwise.metrics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.testing.PythonReference;

/**
 * Scores against scikit-image 0.19 ({@code skimage.metrics.variation_of_information},
 * {@code skimage.metrics.adapted_rand_error}) and scikit-learn
 * ({@code sklearn.metrics.adjusted_rand_score}), all cases in one Python run.
 */
class ScoresReferenceTest {

  private static final double TOLERANCE = 1e-9;

  /** Reads every case, prints one line per case; the first two cases are the quirk probes. */
  private static final String SCRIPT = """
      import sys, numpy as np
      from skimage.metrics import variation_of_information, adapted_rand_error
      from sklearn.metrics import adjusted_rand_score
      folder = sys.argv[1]
      for line in open(folder + '/cases.txt'):
          name, ignore = line.split()
          gt = np.fromfile(folder + '/' + name + '.gt', dtype='<i8')
          seg = np.fromfile(folder + '/' + name + '.seg', dtype='<i8')
          labels = (0,) if ignore == '1' else ()
          split, merge = variation_of_information(gt, seg, ignore_labels=labels)
          error, first, second = adapted_rand_error(gt, seg, ignore_labels=labels)
          keep = gt != 0 if ignore == '1' else np.ones(gt.shape, bool)
          ari = adjusted_rand_score(gt[keep], seg[keep])
          print(name, repr(float(split)), repr(float(merge)), repr(float(error)),
                repr(float(first)), repr(float(second)), repr(float(ari)))
      """;

  private record Case(String name, long[] gt, long[] seg, boolean ignoreZero) {}

  @Test
  void scoresMatchScikitImageAndScikitLearn(@TempDir Path folder) throws IOException {
    PythonReference.requireModules("numpy", "skimage", "sklearn");
    List<Case> cases = cases();
    StringBuilder manifest = new StringBuilder();
    for (Case c : cases) {
      write(folder.resolve(c.name + ".gt"), c.gt);
      write(folder.resolve(c.name + ".seg"), c.seg);
      manifest.append(c.name).append(' ').append(c.ignoreZero ? 1 : 0).append('\n');
    }
    Files.writeString(folder.resolve("cases.txt"), manifest);
    String[] lines = PythonReference.runChecked(SCRIPT, folder.toString()).strip().split("\n");
    assertEquals(cases.size(), lines.length);

    // The probes: a split-only case must have precision 1 and a merge-only case recall 1 by
    // definition. Which of adapted_rand_error's two returned values is which is read from them.
    double[] splitOnly = values(lines[0]);
    double[] mergeOnly = values(lines[1]);
    int precisionAt = splitOnly[3] == 1.0 ? 3 : 4;
    int recallAt = 7 - precisionAt;
    assertEquals(1.0, splitOnly[precisionAt]);
    assertTrue(splitOnly[recallAt] < 1.0);
    assertEquals(1.0, mergeOnly[recallAt]);
    assertTrue(mergeOnly[precisionAt] < 1.0);

    for (int k = 0; k < cases.size(); k++) {
      Case c = cases.get(k);
      double[] ref = values(lines[k]);
      ContingencyTable table = new ContingencyTable();
      table.add(c.gt, c.seg);
      SegmentationScores s =
          new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(c.ignoreZero)).score(table);
      String at = "case " + c.name;
      // skimage.metrics.variation_of_information: [H(seg|gt), H(gt|seg)] in bits
      assertEquals(ref[0], s.voiSplit(), TOLERANCE, at + " VOI split vs skimage");
      assertEquals(ref[1], s.voiMerge(), TOLERANCE, at + " VOI merge vs skimage");
      // skimage.metrics.adapted_rand_error: error, then precision/recall as probed above
      assertEquals(ref[2], s.adaptedRandError(), TOLERANCE, at + " ARE vs skimage");
      assertEquals(ref[precisionAt], s.randPrecision(), TOLERANCE, at + " precision vs skimage");
      assertEquals(ref[recallAt], s.randRecall(), TOLERANCE, at + " recall vs skimage");
      // sklearn.metrics.adjusted_rand_score on the evaluated voxels
      assertEquals(ref[5], s.adjustedRandIndex(), TOLERANCE, at + " ARI vs sklearn");
    }
  }

  private static List<Case> cases() {
    List<Case> cases = new ArrayList<>();
    long[] gt = {1, 1, 1, 1, 2, 2, 2, 2};
    cases.add(new Case("split_only", gt, new long[] {1, 1, 3, 3, 2, 2, 2, 2}, false));
    cases.add(new Case("merge_only", gt, new long[] {5, 5, 5, 5, 5, 5, 5, 5}, false));
    Random random = new Random(13);
    int n = 13 * 9 * 5;
    for (int k = 0; k < 4; k++) {
      long[] g = randomLabels(random, n, 3 + 4 * k, false);
      cases.add(new Case("random" + k, g, perturbed(random, g, 0.15 * (k + 1), 9), false));
    }
    cases.add(new Case("independent", randomLabels(random, n, 6, false),
        randomLabels(random, n, 11, false), false));
    for (int k = 0; k < 3; k++) {
      long[] g = randomLabels(random, n, 5 + 3 * k, true);
      long[] seg = perturbed(random, g, 0.2, 7);
      cases.add(new Case("zero_ignored" + k, g, seg, true));
      cases.add(new Case("zero_counted" + k, g, seg, false));
    }
    long[] same = randomLabels(random, n, 8, true);
    cases.add(new Case("identical", same, same.clone(), false));
    cases.add(new Case("identical_ignored", same, same.clone(), true));
    long[] renamed = new long[n];
    for (int i = 0; i < n; i++) {
      renamed[i] = same[i] == 0 ? 0 : 40 - same[i];
    }
    cases.add(new Case("identical_renamed", same, renamed, true));
    return cases;
  }

  /** Blocky labels: runs of equal values, as real label volumes have; label 0 when asked. */
  private static long[] randomLabels(Random random, int n, int labels, boolean withZero) {
    long[] out = new long[n];
    long current = 1;
    for (int i = 0; i < n; i++) {
      if (random.nextInt(6) == 0) {
        current = withZero && random.nextInt(4) == 0 ? 0 : 1 + random.nextInt(labels);
      }
      out[i] = current;
    }
    return out;
  }

  private static long[] perturbed(Random random, long[] g, double fraction, int extra) {
    long[] seg = new long[g.length];
    for (int i = 0; i < g.length; i++) {
      seg[i] = random.nextDouble() < fraction ? 100 + random.nextInt(extra) : g[i] % 5 + 1;
    }
    return seg;
  }

  private static void write(Path file, long[] values) throws IOException {
    ByteBuffer buffer = ByteBuffer.allocate(values.length * 8).order(ByteOrder.LITTLE_ENDIAN);
    buffer.asLongBuffer().put(values);
    Files.write(file, buffer.array());
  }

  private static double[] values(String line) {
    String[] parts = line.strip().split(" ");
    double[] out = new double[parts.length - 1];
    for (int i = 1; i < parts.length; i++) {
      out[i - 1] = Double.parseDouble(parts[i]);
    }
    return out;
  }
}
