package org.sunder.stitching.task;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.SunderException;

class LabelPyramidTest {

  @Test
  void isotropicVoxelsHalveEveryAxisUntilOneChunk() {
    LabelPyramid p = LabelPyramid.plan(new long[] {100, 60, 30}, new int[] {16, 16, 8},
        new double[] {4, 4, 4});
    assertArrayEquals(new long[][] {{100, 60, 30}, {50, 30, 15}, {25, 15, 8}, {13, 8, 4}},
        p.shapes());
    assertArrayEquals(new int[] {2, 2, 2}, p.factors()[1]);
    assertArrayEquals(new double[] {32, 32, 32}, p.voxelSizes()[3]);
  }

  @Test
  void coarseZKeepsFactorOneUntilTheOtherAxesCatchUp() {
    // voxels 8 x 8 x 40 (x y z): z stays until x and y reach 32, then all halve
    LabelPyramid p = LabelPyramid.plan(new long[] {512, 512, 64}, new int[] {32, 32, 8},
        new double[] {8, 8, 40});
    assertArrayEquals(new int[] {2, 2, 1}, p.factors()[1]);  // 16, 16, 40
    assertArrayEquals(new int[] {2, 2, 1}, p.factors()[2]);  // 32, 32, 40
    assertArrayEquals(new int[] {2, 2, 2}, p.factors()[3]);  // 64, 64, 80
    assertArrayEquals(new double[] {64, 64, 80}, p.voxelSizes()[3]);
  }

  @Test
  void aVolumeOfOneChunkHasNoCoarserLevel() {
    LabelPyramid p = LabelPyramid.plan(new long[] {10, 8, 6}, new int[] {16, 16, 8},
        new double[] {1, 1, 1});
    assertEquals(1, p.levelCount());
  }

  @Test
  void badVoxelSizeIsATypedError() {
    SunderException e = assertThrows(SunderException.class, () -> LabelPyramid.plan(
        new long[] {10, 8, 6}, new int[] {4, 4, 4}, new double[] {1, 0, 1}));
    assertEquals(true, e.getMessage().contains("voxel size"), e.getMessage());
  }

  @Test
  void chunkPositionsEnumerateTheLevelGridXFastest() {
    LabelPyramid p = LabelPyramid.plan(new long[] {40, 30, 20}, new int[] {8, 8, 8},
        new double[] {1, 1, 1});
    // level 1: 20 x 15 x 10 -> 3 x 2 x 2 chunks
    assertEquals(12, p.chunkCount(1));
    assertArrayEquals(new long[] {0, 0, 0}, p.chunkPosition(1, 0));
    assertArrayEquals(new long[] {2, 0, 0}, p.chunkPosition(1, 2));
    assertArrayEquals(new long[] {0, 1, 0}, p.chunkPosition(1, 3));
    assertArrayEquals(new long[] {2, 1, 1}, p.chunkPosition(1, 11));
  }

  @Test
  void modeTiesGoToTheSmallestUnsignedLabel() {
    assertEquals(3, LabelPyramid.mode(new long[] {7, 3, 7, 3}, 4));
    assertEquals(0, LabelPyramid.mode(new long[] {0, 5, 0, 5, 9}, 5));
    // as unsigned, -1 (2^64 - 1) is the largest value
    assertEquals(4, LabelPyramid.mode(new long[] {-1, 4}, 2));
    assertEquals(-1, LabelPyramid.mode(new long[] {-1, 4, -1}, 3));
  }

  /** Brute force: count every window's labels in a map. */
  private static long[] bruteForce(long[] in, int[] shape, int[] f, int[] out) {
    long[] result = new long[out[0] * out[1] * out[2]];
    int i = 0;
    for (int z = 0; z < out[2]; z++) {
      for (int y = 0; y < out[1]; y++) {
        for (int x = 0; x < out[0]; x++, i++) {
          Map<Long, Integer> counts = new HashMap<>();
          for (int c = z * f[2]; c < Math.min(shape[2], z * f[2] + f[2]); c++) {
            for (int b = y * f[1]; b < Math.min(shape[1], y * f[1] + f[1]); b++) {
              for (int a = x * f[0]; a < Math.min(shape[0], x * f[0] + f[0]); a++) {
                counts.merge(in[a + shape[0] * (b + shape[1] * c)], 1, Integer::sum);
              }
            }
          }
          long best = 0;
          int bestCount = -1;
          for (Map.Entry<Long, Integer> e : counts.entrySet()) {
            if (e.getValue() > bestCount || (e.getValue() == bestCount
                && Long.compareUnsigned(e.getKey(), best) < 0)) {
              best = e.getKey();
              bestCount = e.getValue();
            }
          }
          result[i] = best;
        }
      }
    }
    return result;
  }

  @Test
  void downsampleEqualsBruteForceOnRandomLabelsWithOddBorders() {
    Random random = new Random(13);
    for (int trial = 0; trial < 20; trial++) {
      int[] shape = {1 + random.nextInt(13), 1 + random.nextInt(11), 1 + random.nextInt(7)};
      int[] f = {2, random.nextBoolean() ? 2 : 1, random.nextBoolean() ? 2 : 1};
      int[] out = new int[3];
      for (int d = 0; d < 3; d++) {
        out[d] = (shape[d] + f[d] - 1) / f[d];
      }
      long[] in = new long[shape[0] * shape[1] * shape[2]];
      for (int i = 0; i < in.length; i++) {
        in[i] = random.nextInt(4);
      }
      assertArrayEquals(bruteForce(in, shape, f, out),
          LabelPyramid.downsample(in, shape, f, out), "trial " + trial);
    }
  }

  @Test
  void metadataDescribesEveryLevelSlowestAxisFirst() {
    LabelPyramid p = LabelPyramid.plan(new long[] {64, 64, 16}, new int[] {16, 16, 16},
        new double[] {8, 8, 40});
    Map<String, Object> a = MultiscaleMetadata.attributes(p, List.of("seg", "seg_s1", "seg_s2"),
        "seg", "nm");
    @SuppressWarnings("unchecked")
    Map<String, Object> m = (Map<String, Object>) ((List<?>) a.get("multiscales")).get(0);
    assertEquals("0.4", m.get("version"));
    assertEquals("[{name=z, type=space, unit=nanometer}, {name=y, type=space, unit=nanometer},"
        + " {name=x, type=space, unit=nanometer}]", m.get("axes").toString());
    assertEquals(3, ((List<?>) m.get("datasets")).size());
    assertEquals(true, ((List<?>) m.get("datasets")).get(1).toString()
        .contains("scale=[40.0, 16.0, 16.0]"), m.get("datasets").toString());
  }

  @Test
  void unitNamesFollowTheSpecificationsList() {
    assertEquals("nanometer", MultiscaleMetadata.unitName("nm"));
    assertEquals("micrometer", MultiscaleMetadata.unitName("µm"));
    assertEquals("micrometer", MultiscaleMetadata.unitName("micrometer"));
    assertEquals(null, MultiscaleMetadata.unitName("furlong"));
    assertEquals(null, MultiscaleMetadata.unitName(null));
  }
}
