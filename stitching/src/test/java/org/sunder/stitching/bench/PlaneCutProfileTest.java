package org.sunder.stitching.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.metrics.SeamAudit;

/**
 * {@link PlaneCutProfile#cutsPerPlane} against the seam audit's own count ({@link SeamAudit},
 * a separate implementation): with blocks that split the volume once along one axis, the audit
 * has one face plane and one control plane, and its objects cut there must equal the profile's
 * count at those two planes.
 */
class PlaneCutProfileTest {

  @Test
  void cutsAtOnePlaneMatchTheSeamAudit() {
    Random random = new Random(17);
    long[] shape = {14, 12, 10};
    int n = 14 * 12 * 10;
    int checked = 0;
    for (int trial = 0; trial < 20; trial++) {
      long[] truth = new long[n];
      long[] labels = new long[n];
      for (int z = 0; z < 10; z++) {
        for (int y = 0; y < 12; y++) {
          for (int x = 0; x < 14; x++) {
            int i = x + 14 * (y + 12 * z);
            // objects: boxes of 4 x 3 x 2 voxels, a few voxels background
            truth[i] = random.nextInt(20) == 0 ? 0 : 1 + x / 4 + 4 * (y / 3) + 16 * (z / 2);
            // segments: the objects, cut by random planes and sprinkled with other labels
            long piece = truth[i] == 0 ? 0 : truth[i] * 8 + (x > 2 + trial % 9 ? 1 : 0)
                + (y > 1 + trial % 7 ? 2 : 0) + (z > trial % 6 ? 4 : 0);
            labels[i] = random.nextInt(10) == 0 ? 1 + random.nextInt(3) : piece;
          }
        }
      }
      for (int axis = 0; axis < 3; axis++) {
        int[] cuts = PlaneCutProfile.cutsPerPlane(truth, labels, shape, axis);
        for (int face = (int) (shape[axis] + 1) / 2; face < shape[axis]; face++) {
          // blocks of the whole volume but `face` voxels along the axis: one face at `face`
          int[] block = {14, 12, 10};
          block[axis] = face;
          SeamAudit audit = SeamAudit.of(truth, labels, shape, block);
          assertEquals(1, audit.facePlanes());
          assertEquals(audit.objectsCutAtFaces(), cuts[face], "face " + face + " axis " + axis);
          assertEquals(audit.objectsCutAtControl(), cuts[face - face / 2],
              "control of face " + face + " axis " + axis);
          checked += audit.objectsCutAtFaces() > 0 ? 1 : 0;
        }
      }
    }
    assertTrue(checked > 10, "cases with a cut object: " + checked);
  }
}
