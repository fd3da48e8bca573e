package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

/** Each degradation changes what its javadoc says and nothing else. */
class DegradationTest {

  private static final int[][] OFFSETS = {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {-4, 0, 0},
      {0, -4, 0}, {0, 0, -2}};
  private static SyntheticVolume volume;
  private static long[] labels;
  private static long[] shape;
  private static double[] voxelSize;
  private static float[] exact;
  private static int n;

  @BeforeAll
  static void generate() {
    SynthSpec spec = SynthSpec.small(13).withShape(48, 40, 14).withBackground(true);
    volume = SyntheticVolume.generate(spec);
    labels = volume.labels();
    shape = volume.shape();
    voxelSize = spec.voxelSize();
    exact = ExactAffinities.compute(labels, shape, OFFSETS);
    n = labels.length;
  }

  private static float[] apply(Degradation d) {
    long[] before = labels.clone();
    float[] exactBefore = exact.clone();
    float[] out = d.apply(labels, shape, voxelSize, OFFSETS, exact);
    assertArrayEquals(before, labels, "ground truth untouched");
    assertArrayEquals(exactBefore, exact, "input affinities untouched");
    return out;
  }

  private static int partner(int p, int k) {
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int x = p % nx + OFFSETS[k][0];
    int y = (p / nx) % ny + OFFSETS[k][1];
    int z = p / (nx * ny) + OFFSETS[k][2];
    if (x < 0 || y < 0 || z < 0 || x >= nx || y >= ny || z >= shape[2]) {
      return -1;
    }
    return x + nx * (y + ny * z);
  }

  @Test
  void noneChangesNothing() {
    assertArrayEquals(exact, apply(Degradation.none()));
    assertTrue(Degradation.none().isNone());
  }

  @Test
  void gapsRaiseOnlyEdgesBetweenTwoObjects() {
    float[] out = apply(new Degradation(13, 0, 0, 0.02, 0, 0));
    int changed = 0;
    for (int i = 0; i < out.length; i++) {
      if (out[i] != exact[i]) {
        changed++;
        int p = i % n;
        int q = partner(p, i / n);
        assertEquals(0f, exact[i]);
        assertTrue(q >= 0 && labels[p] != 0 && labels[q] != 0 && labels[p] != labels[q]);
        assertTrue(out[i] >= 0.85f && out[i] < 1f, "gap value " + out[i]);
      }
    }
    assertTrue(changed > 50, "changed " + changed);
  }

  @Test
  void falseBoundariesLowerOnlyEdgesInsideOneObject() {
    float[] out = apply(new Degradation(13, 0, 0, 0, 0.002, 0));
    int changed = 0;
    for (int i = 0; i < out.length; i++) {
      if (out[i] != exact[i]) {
        changed++;
        int p = i % n;
        int q = partner(p, i / n);
        assertEquals(1f, exact[i]);
        assertTrue(labels[p] != 0 && labels[p] == labels[q]);
        assertTrue(out[i] >= 0f && out[i] < 0.15f, "false boundary value " + out[i]);
      }
    }
    assertTrue(changed > 50, "changed " + changed);
  }

  @Test
  void blurChangesValuesOnlyNearChangesAndKeepsTheRange() {
    double sigma = 1.0;
    float[] out = apply(new Degradation(13, sigma, 0, 0, 0, 0));
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    int[] radius = new int[3];
    for (int d = 0; d < 3; d++) {
      radius[d] = (int) Math.ceil(3 * sigma * 8 / voxelSize[d]);
    }
    int constantNeighbourhoods = 0;
    int between = 0;
    for (int i = 0; i < out.length; i++) {
      assertTrue(out[i] >= 0 && out[i] <= 1.0000001f);
      if (out[i] > 0.01f && out[i] < 0.99f) {
        between++;
      }
      int p = i % n;
      int base = i - p;
      int x = p % nx;
      int y = (p / nx) % ny;
      int z = p / (nx * ny);
      boolean constant = true;
      for (int dz = -radius[2]; dz <= radius[2] && constant; dz++) {
        for (int dy = -radius[1]; dy <= radius[1] && constant; dy++) {
          for (int dx = -radius[0]; dx <= radius[0] && constant; dx++) {
            int qx = Math.min(nx - 1, Math.max(0, x + dx));
            int qy = Math.min(ny - 1, Math.max(0, y + dy));
            int qz = Math.min(nz - 1, Math.max(0, z + dz));
            constant = exact[base + qx + nx * (qy + ny * qz)] == exact[i];
          }
        }
      }
      if (constant) {
        constantNeighbourhoods++;
        assertEquals(exact[i], out[i], 1e-6, "blur changed a value far from any edge");
      }
    }
    assertTrue(constantNeighbourhoods > out.length / 20, "" + constantNeighbourhoods);
    assertTrue(between > out.length / 20, "blur made intermediate values: " + between);
    double before = Arrays.stream(toDouble(exact)).sum();
    double after = Arrays.stream(toDouble(out)).sum();
    assertEquals(before, after, 0.02 * before, "blur keeps the mean");
  }

  @Test
  void noiseIsZeroMeanWithTheRequestedSpread() {
    double sigma = 0.05;
    float[] out = apply(new Degradation(13, 0, sigma, 0, 0, 0));
    double sum = 0;
    double squares = 0;
    int unclamped = 0;
    for (int i = 0; i < out.length; i++) {
      assertTrue(out[i] >= 0 && out[i] <= 1);
      if (out[i] > 0 && out[i] < 1) {
        // only the side that cannot clamp: exact 0 going up, exact 1 going down
        double delta = Math.abs(out[i] - exact[i]);
        sum += delta;
        squares += delta * delta;
        unclamped++;
      }
    }
    // |N(0, s^2)| has mean s * sqrt(2 / pi) and second moment s^2 (facts of the normal law)
    assertTrue(unclamped > out.length / 3);
    assertEquals(sigma * Math.sqrt(2 / Math.PI), sum / unclamped, 0.05 * sigma);
    assertEquals(sigma, Math.sqrt(squares / unclamped), 0.05 * sigma);
  }

  @Test
  void corruptedSlicesAreWholeSlicesAndOnlyThose() {
    float[] out = apply(new Degradation(13, 0, 0, 0, 0, 0.3));
    int plane = (int) (shape[0] * shape[1]);
    int corrupted = 0;
    for (int z = 0; z < shape[2]; z++) {
      int changed = 0;
      for (int k = 0; k < OFFSETS.length; k++) {
        for (int i = 0; i < plane; i++) {
          int at = k * n + z * plane + i;
          changed += out[at] != exact[at] ? 1 : 0;
        }
      }
      int values = plane * OFFSETS.length;
      assertTrue(changed == 0 || changed > 0.4 * values, "slice " + z + ": " + changed);
      corrupted += changed > 0 ? 1 : 0;
    }
    assertTrue(corrupted >= 1 && corrupted < shape[2], "corrupted slices " + corrupted);
  }

  @Test
  void deterministicFromTheSeedAndIndependentStreams() {
    Degradation mix = new Degradation(13, 0.8, 0.05, 0.01, 0.001, 0.1);
    assertArrayEquals(apply(mix), apply(mix));
    assertFalse(Arrays.equals(apply(mix), apply(new Degradation(14, 0.8, 0.05, 0.01, 0.001, 0.1))));
    // each kind draws from its own stream: gaps plus slices = gaps outside the corrupted
    // slices and the slices-only values inside them
    float[] gaps = apply(new Degradation(13, 0, 0, 0.02, 0, 0));
    float[] slices = apply(new Degradation(13, 0, 0, 0, 0, 0.3));
    float[] both = apply(new Degradation(13, 0, 0, 0.02, 0, 0.3));
    int plane = (int) (shape[0] * shape[1]);
    boolean[] corrupted = new boolean[(int) shape[2]];
    for (int i = 0; i < slices.length; i++) {
      corrupted[(i % n) / plane] |= slices[i] != exact[i];
    }
    for (int i = 0; i < both.length; i++) {
      assertEquals(corrupted[(i % n) / plane] ? slices[i] : gaps[i], both[i]);
    }
  }

  private static Degradation realistic(int widening, double gapLongRange, double longRangeNoise,
      double correlated, double missing) {
    return new Degradation(13, 0, 0, 0, 0, 0, widening, gapLongRange, longRangeNoise, correlated,
        missing);
  }

  private static boolean longRange(int k) {
    return org.sunder.blockwise.graph.Offsets.of(OFFSETS).isLongRange(k);
  }

  @Test
  void wideBoundariesLowerOnlyNearestNeighbourEdgesInsideAnObjectNextToItsSurface() {
    float[] out = apply(realistic(1, 1, 1, 0, 0));
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int changed = 0;
    for (int i = 0; i < out.length; i++) {
      if (out[i] != exact[i]) {
        changed++;
        int k = i / n;
        int p = i % n;
        int q = partner(p, k);
        assertFalse(longRange(k), "long-range channel " + k + " changed");
        assertTrue(q >= 0 && labels[p] != 0 && labels[p] == labels[q]);
        assertTrue(out[i] >= 0f && out[i] < 0.2f, "widened value " + out[i]);
        // width 1: one end is a surface voxel (another label beside it in-plane; z is coarser)
        assertTrue(inPlaneSurface(p, nx, ny) || inPlaneSurface(q, nx, ny), "edge " + p + "-" + q);
      }
    }
    assertTrue(changed > 100, "changed " + changed);
  }

  private static boolean inPlaneSurface(int p, int nx, int ny) {
    int x = p % nx;
    int y = (p / nx) % ny;
    return (x > 0 && labels[p - 1] != labels[p]) || (x < nx - 1 && labels[p + 1] != labels[p])
        || (y > 0 && labels[p - nx] != labels[p]) || (y < ny - 1 && labels[p + nx] != labels[p]);
  }

  @Test
  void gapsAreWeakerOnLongRangeChannelsAndRestoreWidenedEdges() {
    float[] widened = apply(realistic(1, 1, 1, 0, 0));
    float[] out = apply(new Degradation(13, 0, 0, 0.05, 0, 0, 1, 0.4, 1, 0, 0));
    int crossLongRange = 0;
    int restored = 0;
    for (int i = 0; i < out.length; i++) {
      int k = i / n;
      int p = i % n;
      int q = partner(p, k);
      if (q < 0 || labels[p] == 0 || labels[q] == 0 || out[i] == widened[i]) {
        continue;
      }
      if (labels[p] != labels[q]) {
        float low = longRange(k) ? 0.4f * 0.85f : 0.85f;
        float high = longRange(k) ? 0.4f : 1f;
        assertTrue(out[i] >= low - 1e-6f && out[i] < high, "gap value " + out[i] + " channel " + k);
        crossLongRange += longRange(k) ? 1 : 0;
      } else {
        assertTrue(widened[i] < 0.2f && out[i] >= 0.85f, "raised " + widened[i] + " -> " + out[i]);
        restored++;
      }
    }
    assertTrue(crossLongRange > 20 && restored > 20, crossLongRange + " / " + restored);
  }

  @Test
  void correlatedNoiseIsSmoothAsGaussianFilteredWhiteNoiseAndScaledOnLongRangeChannels() {
    long[] big = {96, 96, 24};
    int voxels = 96 * 96 * 24;
    long[] oneObject = new long[voxels];
    Arrays.fill(oneObject, 1);
    float[] half = new float[voxels * OFFSETS.length];
    Arrays.fill(half, 0.5f);
    float[] out = realistic(0, 1, 2, 0.01, 0).apply(oneObject, big, new double[] {8, 8, 24},
        OFFSETS, half);
    // white noise filtered by a Gaussian of sigma s has autocorrelation exp(-lag^2 / (4 s^2))
    // (textbook fact of linear filtering); s = 3 finest voxels in x, 3 * 8 / 24 = 1 voxel in z
    assertEquals(Math.exp(-1 / 36.0), lagCorrelation(out, big, 0), 0.03);
    assertEquals(Math.exp(-1 / 4.0), lagCorrelation(out, big, 2), 0.05);
    int nearest = 0;
    int far = 3;
    for (int i = 0; i < voxels; i++) {
      assertEquals(2 * (out[nearest * voxels + i] - 0.5), out[far * voxels + i] - 0.5, 1e-6);
    }
  }

  /** Correlation of channel 0 between voxels one step apart along {@code axis}. */
  private static double lagCorrelation(float[] values, long[] box, int axis) {
    int nx = (int) box[0];
    int ny = (int) box[1];
    int nz = (int) box[2];
    int step = axis == 0 ? 1 : axis == 1 ? nx : nx * ny;
    double sxy = 0;
    double sxx = 0;
    double sx = 0;
    int count = 0;
    for (int z = 0; z < nz; z++) {
      for (int y = 0; y < ny; y++) {
        for (int x = 0; x < nx; x++) {
          int[] at = {x, y, z};
          if (at[axis] + 1 >= box[axis]) {
            continue;
          }
          int i = x + nx * (y + ny * z);
          double a = values[i] - 0.5;
          double b = values[i + step] - 0.5;
          sxy += a * b;
          sxx += a * a;
          sx += a;
          count++;
        }
      }
    }
    double mean = sx / count;
    return (sxy / count - mean * mean) / (sxx / count - mean * mean);
  }

  @Test
  void missingSlicesMakeEveryEdgeTouchingThemUncertainAndNothingElse() {
    float[] out = apply(realistic(0, 1, 1, 0, 0.3));
    int nx = (int) shape[0];
    int plane = nx * (int) shape[1];
    boolean[] missing = new boolean[(int) shape[2]];
    for (int z = 0; z < shape[2]; z++) {
      // a missing slice changes its own values on the in-plane channels
      missing[z] = out[z * plane] >= 0.3f && out[z * plane] < 0.5f && out[z * plane] != exact[z * plane];
    }
    int missingCount = 0;
    for (boolean m : missing) {
      missingCount += m ? 1 : 0;
    }
    assertTrue(missingCount >= 1 && missingCount < shape[2], "missing slices " + missingCount);
    for (int i = 0; i < out.length; i++) {
      int k = i / n;
      int p = i % n;
      int z = p / plane;
      int qz = z + OFFSETS[k][2];
      boolean touches = missing[z] || (qz >= 0 && qz < shape[2] && missing[qz]);
      if (touches) {
        assertTrue(out[i] >= 0.3f && out[i] < 0.5f, "value " + out[i] + " at slice " + z);
      } else {
        assertEquals(exact[i], out[i]);
      }
    }
  }

  @Test
  void attributesRoundTripAndOlderAttributesReadAsNeutral() {
    Degradation d = new Degradation(5, 0.5, 0.1, 0.01, 0.001, 0.1, 1, 0.4, 2, 0.05, 0.02);
    assertEquals(d, Degradation.fromAttributes(d.toAttributes()));
    java.util.Map<String, Object> older = new java.util.LinkedHashMap<>(
        new Degradation(5, 0.5, 0.1, 0.01, 0.001, 0.1).toAttributes());
    for (String key : new String[] {"boundaryWidening", "gapLongRangeStrength",
        "longRangeNoiseFactor", "correlatedNoiseSigma", "missingSliceProbability"}) {
      older.remove(key);
    }
    assertEquals(new Degradation(5, 0.5, 0.1, 0.01, 0.001, 0.1),
        Degradation.fromAttributes(older));
    assertThrows(SunderException.class, () -> realistic(4, 1, 1, 0, 0));
  }

  @Test
  void rejectsStrengthsOutOfRangeNamingThem() {
    SunderException e = assertThrows(SunderException.class,
        () -> new Degradation(1, 0, -0.1, 0, 0, 0));
    assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
    assertTrue(e.getMessage().contains("noiseSigma"), e.getMessage());
    assertThrows(SunderException.class, () -> new Degradation(1, 0, 0, 1.5, 0, 0));
  }

  private static double[] toDouble(float[] v) {
    double[] out = new double[v.length];
    for (int i = 0; i < v.length; i++) {
      out[i] = v[i];
    }
    return out;
  }
}
