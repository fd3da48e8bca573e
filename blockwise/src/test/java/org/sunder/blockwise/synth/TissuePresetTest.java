package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.sunder.blockwise.SunderException;

/** The presets are what their javadoc says, at a small shape. */
class TissuePresetTest {
  private static final long[] SHAPE = {96, 80, 24};

  private static double backgroundShare(SyntheticVolume v) {
    long zeros = 0;
    for (long l : v.labels()) {
      zeros += l == 0 ? 1 : 0;
    }
    return (double) zeros / v.labels().length;
  }

  @Test
  void eachKindHasItsBackgroundAndVoxelSize() {
    SyntheticVolume neurites = TissuePreset.DENSE_NEURITES.volume(3, SHAPE);
    SyntheticVolume cells = TissuePreset.COMPACT_CELLS.volume(3, SHAPE);
    SyntheticVolume bodies = TissuePreset.BODIES_AND_NEURITES.volume(3, SHAPE);
    double share = backgroundShare(neurites);
    assertTrue(share > 0.03 && share < 0.25, "neurite background " + share);
    assertEquals(0.0, backgroundShare(cells));
    assertTrue(backgroundShare(bodies) > 0.02, "the empty region of the bodies preset");
    assertEquals(4.0, neurites.spec().voxelSize()[2] / neurites.spec().voxelSize()[0]);
    for (SyntheticVolume v : new SyntheticVolume[] {neurites, cells, bodies}) {
      assertArrayEquals(SHAPE, v.shape());
      assertTrue(v.objectCount() >= 5, "objects " + v.objectCount());
    }
  }

  @Test
  void theEmptyRegionIsACylinderAlongZAndObjectsStayConnected() {
    SyntheticVolume bodies = TissuePreset.BODIES_AND_NEURITES.volume(5, SHAPE);
    int nx = (int) SHAPE[0];
    int plane = nx * (int) SHAPE[1];
    long[] labels = bodies.labels();
    // a cylinder along z: each column is background in every slice or in none (pieces below the
    // minimum size may also turn to background, so only check columns empty in slice 0)
    for (int i = 0; i < plane; i++) {
      if (labels[i] == 0) {
        int empty = 0;
        for (int z = 0; z < SHAPE[2]; z++) {
          empty += labels[z * plane + i] == 0 ? 1 : 0;
        }
        assertTrue(empty >= SHAPE[2] - 2, "column " + i + " empty in " + empty + " slices");
      }
    }
    long[] counts = new long[bodies.objectCount() + 1];
    int[] first = new int[counts.length];
    for (int i = labels.length - 1; i >= 0; i--) {
      counts[(int) labels[i]]++;
      first[(int) labels[i]] = i;
    }
    for (int l = 1; l < counts.length; l++) {
      assertEquals(counts[l], SyntheticVolumeTest.floodCount(labels, SHAPE, first[l]), "object " + l);
    }
  }

  @Test
  void deterministicAndSeeded() {
    for (TissuePreset p : TissuePreset.values()) {
      SyntheticVolume a = p.volume(7, SHAPE);
      assertArrayEquals(a.labels(), p.volume(7, SHAPE).labels());
      assertArrayEquals(p.affinities(a, 7), p.affinities(a, 7));
      assertEquals(13, TissuePreset.offsets().count());
      assertEquals(p, TissuePreset.named(p.presetName()));
    }
    assertTrue(!java.util.Arrays.equals(TissuePreset.COMPACT_CELLS.volume(7, SHAPE).labels(),
        TissuePreset.COMPACT_CELLS.volume(8, SHAPE).labels()));
    SunderException e = assertThrows(SunderException.class, () -> TissuePreset.named("liver"));
    assertTrue(e.getMessage().contains("compact-cells"), e.getMessage());
  }
}
