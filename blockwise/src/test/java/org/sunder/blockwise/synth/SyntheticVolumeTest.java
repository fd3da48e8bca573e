package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

class SyntheticVolumeTest {

  private static SynthSpec spec;
  private static SyntheticVolume dense;

  @BeforeAll
  static void generate() {
    spec = SynthSpec.small(13);
    dense = SyntheticVolume.generate(spec);
  }

  @Test
  void sameSpecSameLabelsOtherSeedOtherLabels() {
    assertArrayEquals(dense.labels(), SyntheticVolume.generate(SynthSpec.small(13)).labels());
    assertFalse(Arrays.equals(dense.labels(),
        SyntheticVolume.generate(SynthSpec.small(14)).labels()));
  }

  @Test
  void everyLabelOccursAndEveryObjectIsOneConnectedPiece() {
    long[] labels = dense.labels();
    long[] shape = dense.shape();
    long[] counts = new long[dense.objectCount() + 1];
    for (long l : labels) {
      counts[(int) l]++;
    }
    assertEquals(0, counts[0], "no background was asked for");
    boolean[] seen = new boolean[counts.length];
    for (int i = 0; i < labels.length; i++) {
      int l = (int) labels[i];
      if (!seen[l]) {
        seen[l] = true;
        assertEquals(counts[l], floodCount(labels, shape, i), "object " + l);
        assertTrue(counts[l] >= spec.minObjectVoxels(), "object " + l + " is tiny");
      }
    }
    for (int l = 1; l < counts.length; l++) {
      assertTrue(seen[l], "label " + l + " missing");
    }
  }

  @Test
  void objectsTouchOneAnother() {
    for (SyntheticVolume v : List.of(dense,
        SyntheticVolume.generate(spec.withBackground(true)))) {
      long[] labels = v.labels();
      boolean[] touches = new boolean[v.objectCount() + 1];
      long objectFaces = 0;
      long contactFaces = 0;
      int nx = (int) v.shape()[0];
      int ny = (int) v.shape()[1];
      int[] steps = {1, nx, nx * ny};
      for (int axis = 0; axis < 3; axis++) {
        for (int i = 0; i < labels.length; i++) {
          int c = axis == 0 ? i % nx : axis == 1 ? (i / nx) % ny : i / (nx * ny);
          if (c + 1 >= v.shape()[axis]) {
            continue;
          }
          long a = labels[i];
          long b = labels[i + steps[axis]];
          if (a != b && (a != 0 || b != 0)) {
            objectFaces++;
            if (a != 0 && b != 0) {
              contactFaces++;
              touches[(int) a] = true;
              touches[(int) b] = true;
            }
          }
        }
      }
      int touching = 0;
      for (int l = 1; l < touches.length; l++) {
        touching += touches[l] ? 1 : 0;
      }
      String what = v.spec().background() ? "with background" : "dense";
      assertTrue(touching >= 0.9 * v.objectCount(), what + ": " + touching + " of "
          + v.objectCount() + " objects touch another");
      // most of an object's surface is contact with another object, not background
      assertTrue(contactFaces >= 0.7 * objectFaces, what + ": contact " + contactFaces + " of "
          + objectFaces + " faces");
    }
  }

  @Test
  void backgroundAppearsOnlyWhenAskedFor() {
    SyntheticVolume withBackground = SyntheticVolume.generate(spec.withBackground(true));
    long zeros = Arrays.stream(withBackground.labels()).filter(l -> l == 0).count();
    assertTrue(zeros > 0 && zeros < withBackground.labels().length / 4, "zeros " + zeros);
  }

  @Test
  void fibresAreThinAndLongAndCellsAreCompact() {
    ObjectShapes m = new ObjectShapes(dense.labels(), dense.shape(), spec.voxelSize(),
        dense.objectCount());
    List<Double> fibreRatio = new ArrayList<>();
    List<Double> fibreThickness = new ArrayList<>();
    List<Double> compactRatio = new ArrayList<>();
    List<Double> compactThickness = new ArrayList<>();
    for (int l = 1; l <= dense.objectCount(); l++) {
      if (m.voxels[l] < 300) {
        continue; // pieces cut off by the volume border are neither long nor compact
      }
      double ratio = m.geodesicLength[l] / m.meanBoundaryDistance[l];
      boolean fibre = dense.kindOf(l) == ObjectKind.FIBRE;
      (fibre ? fibreRatio : compactRatio).add(ratio);
      (fibre ? fibreThickness : compactThickness).add(m.meanBoundaryDistance[l]);
    }
    assertTrue(fibreRatio.size() >= 10 && compactRatio.size() >= 3,
        fibreRatio.size() + " fibres, " + compactRatio.size() + " compact objects");
    // a tube of radius r and length L has mean boundary distance r/3, so L / (r/3) = 3 L / r;
    // a ball of radius R has 2R / (R/4) = 8.
    assertTrue(median(fibreRatio) > 30, "fibre length / mean boundary distance "
        + median(fibreRatio));
    assertTrue(median(compactRatio) < 25, "compact ratio " + median(compactRatio));
    assertTrue(median(fibreThickness) < 0.7 * median(compactThickness),
        "fibre thickness " + median(fibreThickness) + " vs " + median(compactThickness));
    assertTrue(median(fibreThickness) < spec.fibreRadiusMax() / 2);
  }

  @Test
  void fibresAreTortuousBranchingAndVaryInRadius() {
    TissueLayout layout = new TissueLayout(spec);
    assertTrue(layout.armDepths.stream().filter(d -> d > 0).count() >= 3, "branches");
    int arms = layout.armDepths.size();
    double[] path = new double[arms];
    double[][] first = new double[arms][];
    double[][] last = new double[arms][];
    double[] rMin = new double[arms];
    double[] rMax = new double[arms];
    Arrays.fill(rMin, Double.MAX_VALUE);
    for (Capsule c : layout.capsules) {
      double[] a = {c.ax(), c.ay(), c.az()};
      double[] b = {c.bx(), c.by(), c.bz()};
      path[c.arm()] += TissueLayout.distance(a, b);
      if (first[c.arm()] == null) {
        first[c.arm()] = a;
      }
      last[c.arm()] = b;
      rMin[c.arm()] = Math.min(rMin[c.arm()], Math.min(c.ra(), c.rb()));
      rMax[c.arm()] = Math.max(rMax[c.arm()], Math.max(c.ra(), c.rb()));
    }
    List<Double> tortuosity = new ArrayList<>();
    List<Double> radiusSpread = new ArrayList<>();
    for (int k = 0; k < arms; k++) {
      if (path[k] > 200) {
        tortuosity.add(path[k] / TissueLayout.distance(first[k], last[k]));
        radiusSpread.add(rMax[k] / rMin[k]);
      }
    }
    assertTrue(tortuosity.size() >= 20);
    assertTrue(median(tortuosity) > 1.15, "path / end-to-end " + median(tortuosity));
    assertTrue(median(radiusSpread) > 1.3, "radius max / min along an arm "
        + median(radiusSpread));
  }

  @Test
  void voxelSizeIsHonouredPerAxis() {
    // one body, a sphere in physical space: with z voxels 3x coarser it spans 3x fewer z voxels
    SynthSpec bodyOnly = new SynthSpec(13, new long[] {60, 50, 24}, new double[] {8, 8, 24},
        0, 18, 36, 0.2, 0, 0, 55, 80, 1, 150, 150, true, 0, 1);
    SyntheticVolume v = SyntheticVolume.generate(bodyOnly);
    int[] lo = {Integer.MAX_VALUE, Integer.MAX_VALUE, Integer.MAX_VALUE};
    int[] hi = {-1, -1, -1};
    int nx = 60;
    int ny = 50;
    for (int i = 0; i < v.labels().length; i++) {
      if (v.labels()[i] != 0) {
        int[] c = {i % nx, (i / nx) % ny, i / (nx * ny)};
        for (int d = 0; d < 3; d++) {
          lo[d] = Math.min(lo[d], c[d]);
          hi[d] = Math.max(hi[d], c[d]);
        }
      }
    }
    assertEquals(1, v.objectCount());
    assertEquals(ObjectKind.BODY, v.kindOf(1));
    assertEquals(2 * 150 / 8.0, hi[0] - lo[0] + 1, 2.0);
    assertEquals(2 * 150 / 8.0, hi[1] - lo[1] + 1, 2.0);
    assertEquals(2 * 150 / 24.0, hi[2] - lo[2] + 1, 1.5);
  }

  private static double median(List<Double> values) {
    double[] v = values.stream().mapToDouble(Double::doubleValue).sorted().toArray();
    return v[v.length / 2];
  }

  static long floodCount(long[] labels, long[] shape, int start) {
    int nx = (int) shape[0];
    int ny = (int) shape[1];
    int nz = (int) shape[2];
    boolean[] seen = new boolean[labels.length];
    int[] queue = new int[labels.length];
    int head = 0;
    int tail = 0;
    queue[tail++] = start;
    seen[start] = true;
    while (head < tail) {
      int i = queue[head++];
      int x = i % nx;
      int y = (i / nx) % ny;
      int z = i / (nx * ny);
      int[][] next = {{x - 1, y, z}, {x + 1, y, z}, {x, y - 1, z}, {x, y + 1, z}, {x, y, z - 1},
          {x, y, z + 1}};
      for (int[] q : next) {
        if (q[0] >= 0 && q[1] >= 0 && q[2] >= 0 && q[0] < nx && q[1] < ny && q[2] < nz) {
          int j = q[0] + nx * (q[1] + ny * q[2]);
          if (!seen[j] && labels[j] == labels[start]) {
            seen[j] = true;
            queue[tail++] = j;
          }
        }
      }
    }
    return tail;
  }
}
