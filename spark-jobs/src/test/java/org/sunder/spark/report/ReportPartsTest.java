package org.sunder.spark.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.graph.EdgeStatistics;
import org.sunder.stitching.task.BlockSummary;

class ReportPartsTest {

  @Test
  void segmentSizesAddUpThePiecesOfEachFinalId() {
    // block 0: pieces 5 and 7 voxels; block 1: 4, 9, 1 voxels. Final: 1 = 0:1 + 1:2, 2 = 0:2, 3 = 1:1 + 1:3
    long[] sizes = new long[4];
    SegmentSizes.addBlock(sizes, new long[] {0, 1, 2}, summary(0, 5, 7).segmentSizes());
    SegmentSizes.addBlock(sizes, new long[] {0, 3, 1, 3}, summary(1, 4, 9, 1).segmentSizes());
    assertArrayEquals(new long[] {0, 14, 7, 5}, sizes);
  }

  private static BlockSummary summary(int block, long... sizes) {
    return new BlockSummary(block, sizes, new int[0], new int[0], new long[0],
        EdgeStatistics.empty(), new long[0], new long[0], EdgeStatistics.empty());
  }

  @Test
  void histogramBinsArePowersOfTwo() {
    // sizes 1 -> bin 0; 2, 3 -> bin 1; 4 -> bin 2; 1000 -> bin 9 (512..1023)
    long[] counts = SegmentSizes.log2Histogram(new long[] {0, 1, 2, 3, 4, 1000, 0});
    assertEquals(10, counts.length);
    assertArrayEquals(new long[] {1, 2, 1, 0, 0, 0, 0, 0, 0, 1}, counts);
  }

  @Test
  void decisionPositionIsTheMiddleOfTheMatchingPairsOnTheUpperSide() {
    // a box 4 x 3 x 2 (x y z) two voxels deep along z: layer z=10 below the face, z=11 above
    long[] min = {0, 0, 10};
    long[] max = {3, 2, 11};
    long[] labels = new long[24];
    // pairs (5 below, 6 above) at (x=1, y=0) and (x=3, y=2)
    labels[1] = 5;
    labels[12 + 1] = 6;
    labels[3 + 4 * 2] = 6;
    labels[12 + 3 + 4 * 2] = 5;
    assertArrayEquals(new long[] {2, 1, 11},
        DecisionPositions.of(labels, min, max, 2, 5, 6));
    // a join of 5 with itself has no pair here: the face's centre
    assertArrayEquals(new long[] {2, 1, 11},
        DecisionPositions.of(labels, min, max, 2, 5, 5));
  }

  @Test
  void neighbouringLabelsGetDistinctColoursAndFacesFallOnBlockStarts() {
    Set<Integer> colours = new HashSet<>();
    for (long label = 1; label <= 200; label++) {
      colours.add(SlicePicture.colour(label));
    }
    assertTrue(colours.size() >= 195, "distinct colours: " + colours.size());
    assertNotEquals(SlicePicture.colour(1), SlicePicture.colour(2));
    assertTrue(SlicePicture.isFace(64, 32));
    assertFalse(SlicePicture.isFace(0, 32));
    assertFalse(SlicePicture.isFace(33, 32));
  }

  @Test
  void rowsOfSectionsCutThickerAreTaller() {
    // voxels 8 x 8 x 24 (x y z): a y plane shows z down, x across
    Plane side = new Plane(1, new long[] {0, 5, 0}, new long[] {9, 5, 3});
    assertEquals(6, RunReportWriter.rowScale(new double[] {8, 8, 24}, side, 2));
    Plane section = new Plane(2, new long[] {0, 0, 5}, new long[] {9, 9, 5});
    assertEquals(2, RunReportWriter.rowScale(new double[] {8, 8, 40}, section, 2));
    // never more than 4 times the column scale
    assertEquals(8, RunReportWriter.rowScale(new double[] {1, 1, 100}, side, 2));
    BufferedImage image = SlicePicture.render(side, new float[40], new long[40], null, 0, null,
        2, 10);
    assertEquals(20, image.getWidth());
    assertEquals(40, image.getHeight());
  }

  @Test
  void pictureShowsGreyBoundariesColourAndFaceLines() {
    Plane plane = new Plane(2, new long[] {0, 0, 5}, new long[] {3, 1, 5});
    float[] boundary = {0, 1, 0, 0, 0, 0, 0, 0};
    long[] labels = {0, 0, 0, 0, 0, 0, 0, 7};
    BufferedImage image = SlicePicture.render(plane, boundary, labels, null, 0,
        new int[] {2, 8, 8}, 1);
    assertEquals(0xffffff, image.getRGB(0, 0) & 0xffffff);   // no boundary, no label: white
    assertEquals(0xffd21e, image.getRGB(2, 0) & 0xffffff);   // x = 2 starts a block: face line
    assertEquals(0x000000, image.getRGB(1, 0) & 0xffffff);   // boundary 1: black
    assertEquals(SlicePicture.blend(0xffffff, SlicePicture.colour(7), SlicePicture.OVERLAY),
        image.getRGB(3, 1) & 0xffffff);                       // label 7 over white
    assertNotEquals(0xffffff, image.getRGB(3, 1) & 0xffffff);
  }
}
