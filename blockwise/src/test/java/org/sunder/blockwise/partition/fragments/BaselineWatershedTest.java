package org.sunder.blockwise.partition.fragments;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.sunder.blockwise.partition.PartitionerContract.assertValidSegmentation;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.graph.AffinityBlock;
import org.sunder.blockwise.graph.GraphInputException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.PartitionConfigException;
import org.sunder.blockwise.partition.ReferenceFiles;
import org.sunder.blockwise.partition.Segmentation;
import org.sunder.testing.PythonReference;

class BaselineWatershedTest {

  /** Memory order (x, y, z): three nearest-neighbour channels, one upward, two long-range. */
  private static final int[][] OFFSETS = {
      {-1, 0, 0}, {0, -1, 0}, {0, 0, -1}, {0, 1, 0}, {-3, 0, 0}, {0, 0, -2}};

  private static final int[][] SHAPES = {{13, 9, 6}, {7, 12, 10}, {16, 5, 8}, {11, 10, 3}};

  @Test
  void boundaryIsOneMinusTheMeanOfTheNearestNeighbourChannelsInsideTheBox() {
    // 3 x 2 box, offsets -x and -y: worked by hand.
    // voxel (0,0): no edge inside -> 1; (1,0): -x only; (0,1): -y only; (1,1): both.
    float[] affinities = {
        0.9f, 0.8f, 0.7f, 0.1f, 0.2f, 0.3f,    // channel -x
        0.5f, 0.5f, 0.5f, 0.4f, 0.6f, 0.0f};   // channel -y
    AffinityBlock block = AffinityBlock.ofFloats(affinities, new int[] {3, 2}, new long[2],
        Offsets.of(new int[] {-1, 0}, new int[] {0, -1}), null);
    float[] expected = {1f, 1 - 0.8f, 1 - 0.7f, 1 - 0.4f, (float) (1 - (0.2 + 0.6) / 2),
        (float) (1 - (0.3 + 0.0) / 2)};
    assertArrayEquals(expected, BaselineWatershed.boundary(block), 1e-7f);
  }

  @Test
  void boundaryMatchesItsDefinitionOnRandomBoxesFloatAndByte() {
    Random random = new Random(13);
    for (int[] shape : SHAPES) {
      int n = VoxelBox.size(shape);
      float[] floats = new float[n * OFFSETS.length];
      byte[] bytes = new byte[floats.length];
      for (int i = 0; i < floats.length; i++) {
        int v = random.nextInt(256);
        bytes[i] = (byte) v;
        floats[i] = v / 255f;
      }
      float[] expected = definitionBoundary(floats, shape, OFFSETS);
      assertArrayEquals(expected, BaselineWatershed.boundary(AffinityBlock.ofFloats(floats,
          shape, new long[3], Offsets.of(OFFSETS), null)));
      assertArrayEquals(expected, BaselineWatershed.boundary(AffinityBlock.ofBytes(bytes,
          shape, new long[3], Offsets.of(OFFSETS), null)));
    }
  }

  @Test
  void randomInputsGiveValidDeterministicPartitions() {
    Random random = new Random(13);
    for (int trial = 0; trial < 24; trial++) {
      int[] shape = SHAPES[trial % SHAPES.length];
      int n = VoxelBox.size(shape);
      float[] affinities = trial % 3 == 0 ? noise(random, n) : smooth(random, shape);
      byte[] mask = trial % 2 == 1 ? SeededWatershedTest.randomMask(random, n) : null;
      double threshold = trial % 4 == 3 ? 0.35 : BaselineWatershed.DEFAULT_THRESHOLD;
      BaselineWatershed baseline = new BaselineWatershed(threshold);
      AffinityBlock block = AffinityBlock.ofFloats(affinities, shape, new long[3],
          Offsets.of(OFFSETS), mask);
      Segmentation segmentation = baseline.partition(block);
      String what = "trial " + trial;
      assertValidSegmentation(segmentation, mask, VoxelBox.size(shape), what);
      assertEquals(segmentation, baseline.partition(block), what + ": second run differs");
      assertEquals(segmentation, baseline.partition(affinities.clone(), shape, OFFSETS,
          mask == null ? null : mask.clone()), what + ": raw overload differs");
      int[] seeds = definitionSeeds(BaselineWatershed.boundary(block), shape, mask, threshold);
      assertEachSeedComponentInItsOwnSegment(seeds, segmentation.labels(), what);
    }
  }

  @Test
  void quantizedBlockSegmentsAsItsFloatValues() {
    Random random = new Random(13);
    int[] shape = SHAPES[1];
    int n = VoxelBox.size(shape);
    float[] smooth = smooth(random, shape);
    byte[] bytes = new byte[smooth.length];
    float[] floats = new float[smooth.length];
    for (int i = 0; i < bytes.length; i++) {
      int v = Math.round(smooth[i] * 255);
      bytes[i] = (byte) v;
      floats[i] = v / 255f;
    }
    byte[] mask = SeededWatershedTest.randomMask(random, n);
    BaselineWatershed baseline = new BaselineWatershed();
    Segmentation fromBytes = baseline.partition(AffinityBlock.ofBytes(bytes, shape, new long[3],
        Offsets.of(OFFSETS), mask));
    assertValidSegmentation(fromBytes, mask, VoxelBox.size(shape), "bytes");
    assertEquals(baseline.partition(floats, shape, OFFSETS, mask), fromBytes);
    assertTrue(fromBytes.segmentCount() > 1, "a smooth field gives several basins");
  }

  @Test
  void twoBasinsSplitAtTheRidgeIn2d() {
    // 6 x 2 image; affinity of the -x edge into column x: high except across x = 3.
    int[] shape = {6, 2};
    float[] dx = {0.0f, 0.9f, 0.8f, 0.1f, 0.9f, 0.95f};
    float[] affinities = new float[24];
    for (int y = 0; y < 2; y++) {
      for (int x = 0; x < 6; x++) {
        affinities[y * 6 + x] = dx[x];
        affinities[12 + y * 6 + x] = 0.9f;
      }
    }
    Segmentation s = new BaselineWatershed().partition(affinities, shape,
        new int[][] {{-1, 0}, {0, -1}}, null);
    assertArrayEquals(new int[] {1, 1, 1, 2, 2, 2, 1, 1, 1, 2, 2, 2}, s.labels());
    assertEquals(2, s.segmentCount());
  }

  /**
   * The weakness the class javadoc states, worked by hand: two boxes touching at the face
   * x = 2.5, exact affinities (1 inside one box, 0 across). A voxel at x = 3 reads
   * {@code b = 1/3} (one crossing edge of three), a seed at the default threshold 0.5, so the
   * seeds of both boxes join into one; below 1/3 they stay apart.
   */
  @Test
  void meanMapJoinsTouchingObjectsInThreeDimensionsAtTheDefaultThreshold() {
    int[] shape = {6, 4, 3};
    int n = VoxelBox.size(shape);
    int[][] offsets = {{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}};
    int[] strides = VoxelBox.strides(shape);
    float[] affinities = new float[3 * n];
    for (int k = 0; k < 3; k++) {
      for (int i = 0; i < n; i++) {
        int x = i % shape[0];
        int c = (i / strides[k]) % shape[k];
        boolean crosses = k == 0 && x == 3;
        affinities[k * n + i] = c > 0 && !crosses ? 1f : 0f;
      }
    }
    float[] b = BaselineWatershed.boundary(AffinityBlock.ofFloats(affinities, shape,
        new long[3], Offsets.of(offsets), null));
    assertEquals(1f / 3, b[3 + strides[1] + strides[2]], 1e-7f);
    assertEquals(1, new BaselineWatershed().partition(affinities, shape, offsets, null)
        .segmentCount());
    Segmentation apart = new BaselineWatershed(0.3).partition(affinities, shape, offsets, null);
    assertEquals(2, apart.segmentCount());
    for (int i = 0; i < n; i++) {
      int x = i % shape[0];
      if (x != 3) {
        assertEquals(x < 3 ? 1 : 2, apart.labels()[i], "voxel " + i);
      }
    }
  }

  @Test
  void seedlessVolumeIsOneSegmentAndSeedlessMaskRegionsAreTheirOwn() {
    int[] shape = {4, 3};
    float[] allBoundary = new float[24];
    Segmentation all = new BaselineWatershed().partition(allBoundary, shape,
        new int[][] {{-1, 0}, {0, -1}}, null);
    assertEquals(1, all.segmentCount());
    // Column x = 1 masked out: left column (x = 0) and right part (x = 2, 3) are cut apart.
    byte[] mask = new byte[12];
    for (int i = 0; i < 12; i++) {
      mask[i] = (byte) (i % 4 == 1 ? 0 : 1);
    }
    Segmentation cut = new BaselineWatershed().partition(allBoundary, shape,
        new int[][] {{-1, 0}, {0, -1}}, mask);
    assertArrayEquals(new int[] {1, 0, 2, 2, 1, 0, 2, 2, 1, 0, 2, 2}, cut.labels());
  }

  @Test
  void badSettingsAndOffsetsAreNamed() {
    for (double t : new double[] {0, -0.1, 1.5, Double.NaN}) {
      PartitionConfigException e =
          assertThrows(PartitionConfigException.class, () -> new BaselineWatershed(t));
      assertEquals(ErrorKind.INVALID_CONFIG, e.kind());
      assertTrue(e.getMessage().contains("threshold " + t), e.getMessage());
    }
    GraphInputException e = assertThrows(GraphInputException.class,
        () -> new BaselineWatershed().partition(new float[8], new int[] {2, 2},
            new int[][] {{-2, 0}, {0, -2}}, null));
    assertTrue(e.getMessage().contains("nearest-neighbour"), e.getMessage());
    assertThrows(GraphInputException.class, () -> new BaselineWatershed().partition(
        new float[7], new int[] {2, 2}, new int[][] {{-1, 0}, {0, -1}}, null));
  }

  /**
   * Reference: {@code scipy.ndimage.label} (scipy 1.10, default structure = face neighbours) of
   * {@code b < threshold} for the markers, then {@code skimage.segmentation.watershed}
   * (scikit-image 0.19, connectivity=1, mask when given) of {@code b}; {@code b} is computed in
   * the script from the affinities, independently. The affinities carry a random jitter and
   * every case is checked to have all-distinct {@code b} values, so tie order cannot matter.
   * Partitions are compared up to relabelling (a one-to-one contingency), on the voxels that
   * scikit-image labels; in-mask voxels it leaves 0 (regions without a seed) must be segments of
   * their own in ours.
   */
  @Test
  void agreesWithScipyMarkersAndScikitImageWatershed(@TempDir Path dir) throws Exception {
    PythonReference.requireModules("numpy", "scipy.ndimage", "skimage.segmentation");
    Random random = new Random(13);
    List<String> manifest = new ArrayList<>();
    List<Segmentation> ours = new ArrayList<>();
    List<float[]> boundaries = new ArrayList<>();
    List<byte[]> masks = new ArrayList<>();
    int cases = 10;
    for (int c = 0; c < cases; c++) {
      int[] shape = SHAPES[c % SHAPES.length];
      int n = VoxelBox.size(shape);
      byte[] mask = c % 3 == 2 ? SeededWatershedTest.randomMask(random, n) : null;
      double threshold = c % 4 == 1 ? 0.4 : 0.5;
      float[] affinities;
      float[] boundary;
      do {
        affinities = smooth(random, shape);
        boundary = BaselineWatershed.boundary(AffinityBlock.ofFloats(affinities, shape,
            new long[3], Offsets.of(OFFSETS), null));
      } while (!allDistinct(boundary));
      ours.add(new BaselineWatershed(threshold).partition(affinities, shape, OFFSETS, mask));
      boundaries.add(boundary);
      masks.add(mask);
      ReferenceFiles.write(dir, "a" + c, affinities);
      ReferenceFiles.write(dir, "k" + c, mask == null ? ones(n) : mask);
      manifest.add(c + " " + threshold + " " + (mask == null ? 0 : 1) + " "
          + shape[2] + " " + shape[1] + " " + shape[0]);
    }
    StringBuilder offsets = new StringBuilder();
    for (int[] o : OFFSETS) {
      offsets.append(o[2]).append(',').append(o[1]).append(',').append(o[0]).append(';');
    }
    manifest.add(0, offsets.toString());
    Files.write(dir.resolve("manifest"), manifest);
    PythonReference.runChecked("""
        import sys, numpy as np
        from scipy import ndimage
        from skimage.segmentation import watershed
        d = sys.argv[1]
        lines = open(d + '/manifest').read().split('\\n')
        offsets = [tuple(int(v) for v in o.split(',')) for o in lines[0].split(';') if o]
        for line in lines[1:]:
            if not line.strip():
                continue
            parts = line.split()
            c, t, masked = parts[0], float(parts[1]), parts[2] == '1'
            shape = tuple(int(s) for s in parts[3:])
            a = np.fromfile(d + '/a' + c, dtype='<f4').reshape((len(offsets),) + shape)
            mask = np.fromfile(d + '/k' + c, dtype=np.uint8).reshape(shape).astype(bool)
            total = np.zeros(shape)
            count = np.zeros(shape, dtype=np.int64)
            grid = np.indices(shape)
            for k, o in enumerate(offsets):
                if sum(v != 0 for v in o) != 1 or sum(abs(v) for v in o) != 1:
                    continue
                inside = np.ones(shape, dtype=bool)
                for axis in range(3):
                    target = grid[axis] + o[axis]
                    inside &= (target >= 0) & (target < shape[axis])
                total += np.where(inside, a[k].astype(np.float64), 0.0)
                count += inside
            b = np.where(count > 0, 1.0 - total / np.maximum(count, 1), 1.0).astype(np.float32)
            b.astype('<f4').tofile(d + '/b' + c)
            markers, _ = ndimage.label((b.astype(np.float64) < t) & mask)
            out = watershed(b, markers, connectivity=1, mask=mask if masked else None)
            out.astype('<i4').tofile(d + '/w' + c)
        """, dir.toString());
    int segments = 0;
    for (int c = 0; c < cases; c++) {
      assertArrayEquals(boundaries.get(c), ReferenceFiles.readFloats(dir.resolve("b" + c)),
          "case " + c + ": boundary map differs from the script's");
      int[] reference = ReferenceFiles.readInts(dir.resolve("w" + c));
      assertSamePartition(ours.get(c).labels(), reference, masks.get(c), "case " + c);
      segments += ours.get(c).segmentCount();
    }
    System.out.printf("baseline vs scipy + scikit-image: %d cases, %d segments, identical%n",
        cases, segments);
    assertTrue(segments > 3 * cases, "inputs give several basins per case: " + segments);
  }

  // --- checks -----------------------------------------------------------------------------

  /** Every seed component in one segment, no segment with two. */
  private static void assertEachSeedComponentInItsOwnSegment(int[] seeds, int[] labels,
      String what) {
    Map<Integer, Integer> segmentOfSeed = new HashMap<>();
    Map<Integer, Integer> seedOfSegment = new HashMap<>();
    for (int i = 0; i < seeds.length; i++) {
      if (seeds[i] > 0) {
        Integer before = segmentOfSeed.putIfAbsent(seeds[i], labels[i]);
        assertTrue(before == null || before == labels[i], what + ": seed " + seeds[i]
            + " split between segments " + before + " and " + labels[i]);
        Integer other = seedOfSegment.putIfAbsent(labels[i], seeds[i]);
        assertTrue(other == null || other == seeds[i], what + ": segment " + labels[i]
            + " holds seeds " + other + " and " + seeds[i]);
      }
    }
  }

  /**
   * Equal up to relabelling: our labels map to reference labels as a function, and the
   * reference's non-zero labels map back to ours as a function, so the two are one-to-one there;
   * in-mask voxels the reference leaves 0 lie in our segments that hold no labelled voxel.
   */
  private static void assertSamePartition(int[] ours, int[] reference, byte[] mask,
      String what) {
    Map<Integer, Integer> oursToReference = new HashMap<>();
    Map<Integer, Integer> referenceToOurs = new HashMap<>();
    for (int i = 0; i < ours.length; i++) {
      boolean inside = mask == null || mask[i] != 0;
      if (!inside) {
        assertEquals(0, ours[i], what + ": masked voxel " + i);
        assertEquals(0, reference[i], what + ": masked voxel " + i + " (reference)");
        continue;
      }
      assertNotEquals(0, ours[i], what + ": voxel " + i);
      if (mask == null) {
        assertNotEquals(0, reference[i], what + ": voxel " + i + " (reference, no mask)");
      }
      Integer r = oursToReference.putIfAbsent(ours[i], reference[i]);
      assertTrue(r == null || r == reference[i], what + ": our segment " + ours[i]
          + " meets reference segments " + r + " and " + reference[i] + " (voxel " + i + ")");
      if (reference[i] != 0) {
        Integer o = referenceToOurs.putIfAbsent(reference[i], ours[i]);
        assertTrue(o == null || o == ours[i], what + ": reference segment " + reference[i]
            + " meets our segments " + o + " and " + ours[i] + " (voxel " + i + ")");
      }
    }
  }

  // --- definitions, written independently of the class under test ---------------------------

  private static float[] definitionBoundary(float[] affinities, int[] shape, int[][] offsets) {
    int n = VoxelBox.size(shape);
    float[] b = new float[n];
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++) {
          int i = x + shape[0] * (y + shape[1] * z);
          int[] p = {x, y, z};
          double sum = 0;
          int count = 0;
          for (int k = 0; k < offsets.length; k++) {
            int[] o = offsets[k];
            if (Math.abs(o[0]) + Math.abs(o[1]) + Math.abs(o[2]) != 1) {
              continue;
            }
            boolean inside = true;
            for (int d = 0; d < 3; d++) {
              inside &= p[d] + o[d] >= 0 && p[d] + o[d] < shape[d];
            }
            if (inside) {
              sum += affinities[k * n + i];
              count++;
            }
          }
          b[i] = count == 0 ? 1f : (float) (1.0 - sum / count);
        }
      }
    }
    return b;
  }

  /** Face-connected components of {b < t} inside the mask, by repeated label propagation. */
  private static int[] definitionSeeds(float[] b, int[] shape, byte[] mask, double t) {
    int n = b.length;
    int[] comp = new int[n];
    for (int i = 0; i < n; i++) {
      comp[i] = b[i] < t && (mask == null || mask[i] != 0) ? i + 1 : 0;
    }
    int[] strides = VoxelBox.strides(shape);
    boolean changed = true;
    while (changed) {
      changed = false;
      for (int i = 0; i < n; i++) {
        if (comp[i] == 0) {
          continue;
        }
        for (int d = 0; d < 3; d++) {
          int c = (i / strides[d]) % shape[d];
          for (int s = -1; s <= 1; s += 2) {
            if (c + s >= 0 && c + s < shape[d]) {
              int j = i + s * strides[d];
              if (comp[j] != 0 && comp[j] < comp[i]) {
                comp[i] = comp[j];
                changed = true;
              }
            }
          }
        }
      }
    }
    return comp;
  }

  // --- inputs -----------------------------------------------------------------------------

  /**
   * Affinities from a smooth random field {@code f} in (0, 1]: random cells (Voronoi regions of
   * 8 random centres) with {@code f = exp(−(d2 − d1) / 2)} ({@code d1}, {@code d2}: distances to
   * the nearest and second-nearest centre, so {@code f} is 1 on the cell faces and falls inside
   * the cells), plus a gentle random cosine ripple that makes some faces weak and some interiors
   * uneven. {@code a(p, q) = 1 − (f(p) + f(q)) / 2} plus a jitter of ±0.01, clipped to [0, 1];
   * edges leaving the box get a random value (the boundary map must ignore them).
   */
  static float[] smooth(Random random, int[] shape) {
    int n = VoxelBox.size(shape);
    double[][] centres = new double[8][3];
    for (double[] centre : centres) {
      for (int d = 0; d < 3; d++) {
        centre[d] = random.nextDouble() * shape[d];
      }
    }
    double[] ripple = new double[4];
    for (int j = 0; j < 3; j++) {
      ripple[j] = (random.nextDouble() * 2 - 1) * 0.8;
    }
    ripple[3] = random.nextDouble() * 2 * Math.PI;
    int[] strides = VoxelBox.strides(shape);
    double[] f = new double[n];
    for (int i = 0; i < n; i++) {
      double d1 = Double.MAX_VALUE;
      double d2 = Double.MAX_VALUE;
      double phase = ripple[3];
      for (double[] centre : centres) {
        double squared = 0;
        for (int d = 0; d < 3; d++) {
          double delta = (i / strides[d]) % shape[d] - centre[d];
          squared += delta * delta;
        }
        double distance = Math.sqrt(squared);
        if (distance < d1) {
          d2 = d1;
          d1 = distance;
        } else if (distance < d2) {
          d2 = distance;
        }
      }
      for (int d = 0; d < 3; d++) {
        phase += ripple[d] * ((i / strides[d]) % shape[d]);
      }
      f[i] = 0.8 * Math.exp(-(d2 - d1) / 2) + 0.1 * (1 + Math.cos(phase));
    }
    float[] affinities = new float[n * OFFSETS.length];
    for (int k = 0; k < OFFSETS.length; k++) {
      for (int i = 0; i < n; i++) {
        int j = i;
        boolean inside = true;
        for (int d = 0; d < 3; d++) {
          int c = (i / strides[d]) % shape[d] + OFFSETS[k][d];
          inside &= c >= 0 && c < shape[d];
          j += OFFSETS[k][d] * strides[d];
        }
        double a = inside ? 1 - (f[i] + f[j]) / 2 + (random.nextDouble() - 0.5) * 0.02
            : random.nextDouble();
        affinities[k * n + i] = (float) Math.min(1, Math.max(0, a));
      }
    }
    return affinities;
  }

  private static float[] noise(Random random, int n) {
    float[] a = new float[n * OFFSETS.length];
    for (int i = 0; i < a.length; i++) {
      a[i] = random.nextFloat();
    }
    return a;
  }

  private static byte[] ones(int n) {
    byte[] b = new byte[n];
    Arrays.fill(b, (byte) 1);
    return b;
  }

  private static boolean allDistinct(float[] values) {
    float[] sorted = values.clone();
    Arrays.sort(sorted);
    for (int i = 1; i < sorted.length; i++) {
      if (sorted[i] == sorted[i - 1]) {
        return false;
      }
    }
    return true;
  }
}
