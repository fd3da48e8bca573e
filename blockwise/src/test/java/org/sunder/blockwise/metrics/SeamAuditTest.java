package org.sunder.blockwise.metrics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import net.imglib2.Interval;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.grid.BlockGrid;
import org.sunder.blockwise.grid.Face;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticVolume;
import org.sunder.testing.PythonReference;

class SeamAuditTest {

  /**
   * Worked by hand. Volume x 8, y 4, z 2; blocks 4 x 4 x 2, so only axis x has a face (between
   * x = 3 and x = 4) and its control plane lies half a block below (between x = 1 and x = 2);
   * each plane has y * z = 8 pairs. Ground truth: object 1 at y in {0, 1}, object 2 at
   * y in {2, 3}: 4 pairs of each across each plane. Segmentation: object 1 is 10 for x < 4 and 11
   * beyond (its 4 face pairs are all cut, none of its control pairs); object 2 is 20 except 21 at
   * z = 0 for x >= 2 (2 of its 4 control pairs are cut, exactly half, none of its face pairs).
   * So 1 object is cut at faces and 1 at control planes (both cross both planes); the face
   * boundary share is 4 / 8 = 0.5 and the control share 2 / 8 = 0.25. 0.5 > 0.25 * 1.5, but the
   * faces hold only 4 - 0.25 * 8 = 2 boundary pairs more than the control share predicts, fewer
   * than 4: not worse. Masking (segment 0) voxel (4, 0, 0) leaves object 1 with 3 face pairs,
   * fewer than 4: no longer cut; the faces then have 7 pairs, 3 of them boundaries.
   */
  @Test
  void handMadeExample() {
    long[] shape = {8, 4, 2};
    long[] gt = new long[64];
    long[] seg = new long[64];
    for (int z = 0; z < 2; z++) {
      for (int y = 0; y < 4; y++) {
        for (int x = 0; x < 8; x++) {
          int i = x + 8 * (y + 4 * z);
          gt[i] = y < 2 ? 1 : 2;
          seg[i] = y < 2 ? (x < 4 ? 10 : 11) : (z == 0 && x >= 2 ? 21 : 20);
        }
      }
    }
    SeamAudit audit = SeamAudit.of(gt, seg, shape, new int[] {4, 4, 2});
    assertEquals(new SeamAudit(true, 1, 2, 1, 2, 1, 8, 4, 8, 2), audit);
    assertEquals(0.5, audit.faceBoundaryShare());
    assertEquals(0.25, audit.controlBoundaryShare());
    assertFalse(audit.objectsWorseThanControl());
    assertFalse(audit.boundariesWorseThanControl());

    seg[4] = 0;
    SeamAudit masked = SeamAudit.of(gt, seg, shape, new int[] {4, 4, 2});
    assertEquals(new SeamAudit(true, 1, 1, 0, 2, 1, 7, 3, 8, 2), masked);
    assertEquals(new SeamAudit(false, 1, 0, 0, 0, 0, 7, 3, 8, 2),
        SeamAudit.of(null, seg, shape, new int[] {4, 4, 2}));
    long[] background = new long[64];
    assertEquals(0, SeamAudit.of(background, seg, shape, new int[] {4, 4, 2})
        .objectsCrossingFaces(), "ground-truth 0 is no object");
  }

  /** Realistic synthetic tissue (64 x 56 x 20 voxels), blocks 16 x 14 x 10 (x y z). */
  private static final int[] BLOCK = {16, 14, 10};

  private static SyntheticVolume tissue(long seed) {
    return SyntheticVolume.generate(SynthSpec.small(seed));
  }

  /** Ground truth relabelled per block of a grid with the given origin: cut on its faces. */
  private static long[] cutPerBlock(long[] gt, long[] shape, int[] block, int[] origin) {
    long[] seg = new long[gt.length];
    int i = 0;
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++, i++) {
          long bx = Math.floorDiv(x - origin[0], block[0]);
          long by = Math.floorDiv(y - origin[1], block[1]);
          long bz = Math.floorDiv(z - origin[2], block[2]);
          seg[i] = gt[i] == 0 ? 0 : gt[i] * 100_000 + ((bz + 1) * 20 + by + 1) * 20 + bx + 1;
        }
      }
    }
    return seg;
  }

  @Test
  void objectsCutAtEveryFaceAreFlaggedAndTheSameCutsHalfABlockAwayAreNot() {
    for (long seed : new long[] {13, 14, 15}) {
      SyntheticVolume volume = tissue(seed);
      long[] shape = volume.shape();
      long[] gt = volume.labels();
      SeamAudit atFaces = SeamAudit.of(gt, cutPerBlock(gt, shape, BLOCK, new int[3]), shape,
          BLOCK);
      assertTrue(atFaces.objectsCutAtFaces() > atFaces.objectsCutAtControl() + 2,
          atFaces.toString());
      assertEquals(atFaces.objectsCrossingFaces(), atFaces.objectsCutAtFaces(),
          "every object crossing a face is cut there: " + atFaces);
      assertEquals(0, atFaces.objectsCutAtControl(), atFaces.toString());
      assertTrue(atFaces.objectsWorseThanControl() && atFaces.boundariesWorseThanControl()
          && atFaces.worseThanControl(), atFaces.toString());

      int[] half = {BLOCK[0] / 2, BLOCK[1] / 2, BLOCK[2] / 2};
      SeamAudit shifted = SeamAudit.of(gt, cutPerBlock(gt, shape, BLOCK, half), shape, BLOCK);
      assertEquals(0, shifted.objectsCutAtFaces(), shifted.toString());
      assertEquals(shifted.objectsCrossingControl(), shifted.objectsCutAtControl());
      assertFalse(shifted.objectsWorseThanControl() || shifted.boundariesWorseThanControl()
          || shifted.worseThanControl(), shifted.toString());

      SeamAudit identity = SeamAudit.of(gt, gt, shape, BLOCK);
      assertEquals(0, identity.objectsCutAtFaces() + identity.objectsCutAtControl());
      assertFalse(identity.worseThanControl() || identity.boundariesWorseThanControl(),
          identity.toString());
      SeamAudit blind = SeamAudit.of(null, cutPerBlock(gt, shape, BLOCK, new int[3]), shape,
          BLOCK);
      assertTrue(blind.worseThanControl(), "without ground truth the share decides: " + blind);
    }
  }

  /** Random labels with runs along x, so that objects have many pairs across planes. */
  private static long[] randomLabels(Random random, long[] shape, int labels, double zeros) {
    int n = (int) (shape[0] * shape[1] * shape[2]);
    long[] out = new long[n];
    long current = 1;
    for (int i = 0; i < n; i++) {
      if (random.nextInt(6) == 0) {
        current = random.nextDouble() < zeros ? 0 : 1 + random.nextInt(labels);
      }
      out[i] = current;
    }
    return out;
  }

  @Test
  void slabsOfEveryFaceMergedInAnyOrderEqualOnePassOverTheVolume() {
    Random random = new Random(13);
    for (int trial = 0; trial < 30; trial++) {
      long[] shape = {5 + random.nextInt(30), 4 + random.nextInt(20), 3 + random.nextInt(12)};
      int[] block = {1 + random.nextInt(12), 1 + random.nextInt(9), 2 + random.nextInt(5)};
      long[] gt = randomLabels(random, shape, 6, 0.1);
      long[] seg = random.nextBoolean() ? randomLabels(random, shape, 9, 0.1) : gt.clone();
      for (int i = 0; i < seg.length; i++) {
        if (random.nextInt(5) == 0) {
          seg[i] = 1 + random.nextInt(4);
        }
      }
      SeamPlanes planes = new SeamPlanes(shape, block);
      SeamTally whole = new SeamTally(planes, true);
      whole.addVolume(gt, seg);

      BlockGrid grid = BlockGrid.of(shape, block, block, new int[3]);
      List<Interval> slabs = new ArrayList<>();
      List<Integer> axes = new ArrayList<>();
      for (Face face : grid.faces()) {
        for (Interval slab : planes.slabsOf(face)) {
          slabs.add(slab);
          axes.add(face.axis());
        }
      }
      List<Integer> order = new ArrayList<>();
      for (int i = 0; i < slabs.size(); i++) {
        order.add(i);
      }
      Collections.shuffle(order, random);
      List<SeamTally> parts = new ArrayList<>();
      int partCount = 1 + random.nextInt(4);
      for (int p = 0; p < partCount; p++) {
        parts.add(new SeamTally(planes, true));
      }
      for (int i : order) {
        long[] min = slabs.get(i).minAsLongArray();
        long[] max = slabs.get(i).maxAsLongArray();
        parts.get(random.nextInt(parts.size())).add(axes.get(i), min, max,
            crop(gt, shape, min, max), crop(seg, shape, min, max));
      }
      SeamTally merged = new SeamTally(planes, true);
      for (SeamTally part : parts) {
        merged.merge(part);
      }
      String where = "trial " + trial + ", shape " + java.util.Arrays.toString(shape)
          + ", block " + java.util.Arrays.toString(block);
      assertEquals(whole.audit(), merged.audit(), where);
      assertEquals(SeamAudit.of(gt, seg, shape, block), merged.audit(), where);
      for (boolean control : new boolean[] {false, true}) {
        assertArrayEquals(whole.cutObjects(control), merged.cutObjects(control), where);
        assertArrayEquals(whole.crossingObjects(control), merged.crossingObjects(control), where);
      }
      for (int plane = 0; plane < planes.planeCount(); plane++) {
        assertEquals(whole.pairs(plane), merged.pairs(plane), where);
        assertEquals(whole.boundaryPairs(plane), merged.boundaryPairs(plane), where);
        assertEquals(planes.planeIndex(planes.axis(plane), planes.position(plane)), plane);
      }
    }
  }

  private static long[] crop(long[] labels, long[] shape, long[] min, long[] max) {
    int sx = (int) (max[0] - min[0] + 1);
    int sy = (int) (max[1] - min[1] + 1);
    int sz = (int) (max[2] - min[2] + 1);
    long[] out = new long[sx * sy * sz];
    int i = 0;
    for (int z = 0; z < sz; z++) {
      for (int y = 0; y < sy; y++) {
        for (int x = 0; x < sx; x++) {
          out[i++] = labels[(int) (x + min[0] + shape[0] * (y + min[1] + shape[1] * (z + min[2])))];
        }
      }
    }
    return out;
  }

  @Test
  void planesAreTheFacesOfTheGridAndOneControlPlaneHalfABlockBelowEach() {
    SeamPlanes planes = new SeamPlanes(new long[] {50, 30, 7}, new int[] {16, 10, 1});
    // x: faces at 16, 32, 48 with controls at 8, 24, 40; y: faces at 10, 20, controls at 5, 15;
    // z: blocks of one voxel layer have no plane between faces and are left out.
    assertEquals(10, planes.planeCount());
    long[] positions = new long[10];
    boolean[] control = new boolean[10];
    for (int p = 0; p < 10; p++) {
      positions[p] = planes.position(p);
      control[p] = planes.isControl(p);
    }
    assertArrayEquals(new long[] {16, 8, 32, 24, 48, 40, 10, 5, 20, 15}, positions);
    assertArrayEquals(new boolean[] {false, true, false, true, false, true, false, true, false,
        true}, control);
    assertEquals(-1, planes.planeIndex(0, 12));
    assertEquals(-1, planes.planeIndex(0, 56));
    assertEquals(-1, planes.planeIndex(2, 3));
  }

  @Test
  void badInputsGetTypedErrors() {
    SunderException shape = assertThrows(SunderException.class,
        () -> new SeamPlanes(new long[] {4, 4}, new int[] {2, 0}));
    assertEquals(ErrorKind.INVALID_CONFIG, shape.kind());
    assertTrue(shape.getMessage().contains("[2, 0]"), shape.getMessage());
    SunderException length = assertThrows(SunderException.class,
        () -> SeamAudit.of(new long[15], new long[16], new long[] {4, 4}, new int[] {2, 2}));
    assertEquals(ErrorKind.INVALID_INPUT, length.kind());
    assertTrue(length.getMessage().contains("ground truth labels have 15 values; expected 16"),
        length.getMessage());
    SeamTally tally = new SeamTally(new SeamPlanes(new long[] {4, 4}, new int[] {2, 2}), false);
    SunderException outside = assertThrows(SunderException.class,
        () -> tally.add(1, new long[] {0, 3}, new long[] {1, 4}, null, new long[4]));
    assertEquals(ErrorKind.INVALID_INPUT, outside.kind());
    SeamTally other = new SeamTally(new SeamPlanes(new long[] {4, 4}, new int[] {2, 2}), true);
    assertThrows(IllegalArgumentException.class, () -> tally.merge(other));
  }

  /**
   * Reference: the definitions re-implemented with numpy array slicing (C order, slowest axis
   * first) by an independent script, on random labels.
   */
  @Test
  void figuresEqualANumpyImplementationOfTheDefinitions(@TempDir Path dir) throws IOException {
    PythonReference.requireModules("numpy");
    Random random = new Random(29);
    long[] shape = {37, 26, 13};
    int[] block = {9, 8, 6};
    long[] gt = randomLabels(random, shape, 7, 0.15);
    long[] seg = gt.clone();
    for (int i = 0; i < seg.length; i++) {
      int r = random.nextInt(10);
      seg[i] = r == 0 ? 0 : r == 1 ? 100 + random.nextInt(3) : seg[i];
    }
    Path g = write(dir.resolve("gt.bin"), gt);
    Path s = write(dir.resolve("seg.bin"), seg);
    String script = String.join("\n",
        "import sys, numpy as np",
        "shape = tuple(int(v) for v in sys.argv[3].split(','))",
        "block = [int(v) for v in sys.argv[4].split(',')]",
        "gt = np.fromfile(sys.argv[1], dtype='<i8').reshape(shape)",
        "seg = np.fromfile(sys.argv[2], dtype='<i8').reshape(shape)",
        "cut = {False: set(), True: set()}; cross = {False: set(), True: set()}",
        "pairs = {False: 0, True: 0}; bound = {False: 0, True: 0}",
        "for ax in range(3):",
        "    b = block[ax]; size = shape[ax]",
        "    if b < 2: continue",
        "    for k in range(1, -(-size // b)):",
        "        for control, pos in ((False, k * b), (True, k * b - b // 2)):",
        "            lo = np.take(seg, pos - 1, axis=ax); hi = np.take(seg, pos, axis=ax)",
        "            glo = np.take(gt, pos - 1, axis=ax); ghi = np.take(gt, pos, axis=ax)",
        "            ok = (lo != 0) & (hi != 0)",
        "            pairs[control] += int(ok.sum()); bound[control] += int((ok & (lo != hi)).sum())",
        "            inside = ok & (glo == ghi) & (glo != 0)",
        "            for o in np.unique(glo[inside]):",
        "                m = inside & (glo == o)",
        "                n = int(m.sum()); c = int((m & (lo != hi)).sum())",
        "                if n >= 4:",
        "                    cross[control].add(int(o))",
        "                    if 2 * c >= n: cut[control].add(int(o))",
        "print(len(cross[False]), len(cut[False]), len(cross[True]), len(cut[True]),",
        "      pairs[False], bound[False], pairs[True], bound[True])");
    String zyxShape = shape[2] + "," + shape[1] + "," + shape[0];
    String zyxBlock = block[2] + "," + block[1] + "," + block[0];
    String[] ref = PythonReference.runChecked(script, g.toString(), s.toString(), zyxShape,
        zyxBlock).trim().split(" ");
    SeamAudit audit = SeamAudit.of(gt, seg, shape, block);
    long[] ours = {audit.objectsCrossingFaces(), audit.objectsCutAtFaces(),
        audit.objectsCrossingControl(), audit.objectsCutAtControl(), audit.facePairs(),
        audit.faceBoundaryPairs(), audit.controlPairs(), audit.controlBoundaryPairs()};
    long[] theirs = new long[ref.length];
    for (int i = 0; i < ref.length; i++) {
      theirs[i] = Long.parseLong(ref[i]);
    }
    assertArrayEquals(theirs, ours, "numpy reference vs SeamAudit: " + audit);
    assertTrue(audit.objectsCutAtFaces() > 0 && audit.objectsCrossingFaces() > 0, audit.toString());
  }

  private static Path write(Path file, long[] values) throws IOException {
    ByteBuffer bytes = ByteBuffer.allocate(values.length * 8).order(ByteOrder.LITTLE_ENDIAN);
    bytes.asLongBuffer().put(values);
    return Files.write(file, bytes.array());
  }
}
