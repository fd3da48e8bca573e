package org.sunder.blockwise.metrics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;

class ScorerTest {

  private static final Scorer COUNT_ZERO =
      new Scorer(ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(false));

  private static SegmentationScores score(Scorer scorer, long[] gt, long[] seg) {
    ContingencyTable table = new ContingencyTable();
    table.add(gt, seg);
    return scorer.score(table);
  }

  @Test
  void splitOnlyExampleHasKnownScores() {
    // Object 1 (4 voxels) split in halves: H(S|G) = 4/8 * 1 bit; pairs in both 2+2+12 = 16 of
    // 24 ground-truth pairs (ordered, distinct voxels).
    SegmentationScores s = score(COUNT_ZERO, new long[] {1, 1, 1, 1, 2, 2, 2, 2},
        new long[] {7, 7, 8, 8, 9, 9, 9, 9});
    assertEquals(0.5, s.voiSplit(), 1e-15);
    assertEquals(0.0, s.voiMerge());
    assertEquals(1.0, s.randPrecision());
    assertEquals(16.0 / 24.0, s.randRecall(), 1e-15);
    assertEquals(1 - 2 * (16.0 / 24.0) / (1 + 16.0 / 24.0), s.adaptedRandError(), 1e-15);
    assertEquals(3, s.segmentCount());
    assertEquals(2, s.groundTruthObjectCount());
    assertEquals(1, s.worstSplits().size());
    ObjectOverlaps split = s.worstSplits().get(0);
    assertEquals(1, split.label());
    assertEquals(4, split.voxels());
    assertEquals(2, split.overlapCount());
    assertArrayEquals(new long[] {7, 8}, split.overlapLabels());
    assertArrayEquals(new long[] {2, 2}, split.overlapVoxels());
    assertEquals(2, split.misassignedVoxels());
    assertTrue(s.worstMerges().isEmpty());
  }

  @Test
  void mergeOnlyExampleHasKnownScores() {
    // One segment over objects of 3 and 1 voxels: H(G|S) = H(3/4, 1/4) = 0.811278... bits
    // (binary entropy, a fact of information theory); precision 6 / 12 pairs.
    SegmentationScores s = score(COUNT_ZERO, new long[] {4, 4, 4, 6, 2, 2},
        new long[] {1, 1, 1, 1, 3, 3});
    double h = -(0.75 * Math.log(0.75) + 0.25 * Math.log(0.25)) / Math.log(2);
    assertEquals(h * 4 / 6, s.voiMerge(), 1e-15);
    assertEquals(0.0, s.voiSplit());
    assertEquals((6.0 + 2) / (12 + 2), s.randPrecision(), 1e-15);
    assertEquals(1.0, s.randRecall());
    ObjectOverlaps merge = s.worstMerges().get(0);
    assertEquals(1, merge.label());
    assertArrayEquals(new long[] {4, 6}, merge.overlapLabels());
    assertArrayEquals(new long[] {3, 1}, merge.overlapVoxels());
    assertTrue(s.worstSplits().isEmpty());
  }

  @Test
  void ignoringGroundTruthZeroDropsThoseVoxelsEverywhere() {
    long[] gt = {0, 0, 0, 1, 1, 2, 2, 2};
    long[] seg = {5, 6, 7, 5, 5, 8, 8, 8};
    SegmentationScores ignored = score(new Scorer(ScoreOptions.DEFAULT), gt, seg);
    assertEquals(5, ignored.evaluatedVoxels());
    assertEquals(0.0, ignored.voi());
    assertEquals(1.0, ignored.adjustedRandIndex());
    assertEquals(2, ignored.segmentCount());
    SegmentationScores counted = score(COUNT_ZERO, gt, seg);
    assertEquals(8, counted.evaluatedVoxels());
    assertTrue(counted.voiSplit() > 0 && counted.voiMerge() > 0);
    assertEquals(0, counted.worstSplits().get(0).label());
  }

  @Test
  void scoresDoNotDependOnLabelValues() {
    Random random = new Random(13);
    int n = 3000;
    long[] gt = new long[n];
    long[] seg = new long[n];
    long[] gtRenamed = new long[n];
    long[] segRenamed = new long[n];
    for (int i = 0; i < n; i++) {
      gt[i] = random.nextInt(9);
      seg[i] = random.nextInt(4) == 0 ? random.nextInt(12) : gt[i] / 2;
      gtRenamed[i] = gt[i] == 0 ? 0 : gt[i] * 0x1234_5678_9ABL + Long.MIN_VALUE;
      segRenamed[i] = -1 - seg[i];
    }
    for (Scorer scorer : new Scorer[] {new Scorer(ScoreOptions.DEFAULT), COUNT_ZERO}) {
      SegmentationScores a = score(scorer, gt, seg);
      SegmentationScores b = score(scorer, gtRenamed, segRenamed);
      assertEquals(a.voiSplit(), b.voiSplit(), 1e-12);
      assertEquals(a.voiMerge(), b.voiMerge(), 1e-12);
      assertEquals(a.adaptedRandError(), b.adaptedRandError(), 1e-12);
      assertEquals(a.adjustedRandIndex(), b.adjustedRandIndex(), 1e-12);
      assertEquals(a.worstSplits().size(), b.worstSplits().size());
      assertEquals(a.worstMerges().get(0).misassignedVoxels(),
          b.worstMerges().get(0).misassignedVoxels());
    }
  }

  @Test
  void identicalPartitionsScorePerfectly() {
    Random random = new Random(13);
    long[] gt = ContingencyTableTest.smoothLabels(random, 30);
    SegmentationScores s = score(COUNT_ZERO, gt, gt.clone());
    assertEquals(0.0, s.voiSplit());
    assertEquals(0.0, s.voiMerge());
    assertEquals(0.0, s.adaptedRandError());
    assertEquals(1.0, s.adjustedRandIndex());
    assertTrue(s.worstSplits().isEmpty() && s.worstMerges().isEmpty());
  }

  @Test
  void worstListsAreRankedAndBounded() {
    // object 1 loses 3 voxels, object 2 loses 1, object 3 loses 2; keep the two worst
    long[] gt = {1, 1, 1, 1, 1, 1, 2, 2, 2, 3, 3, 3, 3};
    long[] seg = {10, 10, 10, 11, 12, 13, 20, 20, 21, 30, 30, 31, 31};
    SegmentationScores s = score(new Scorer(new ScoreOptions(true, 2, 2)), gt, seg);
    assertEquals(2, s.worstSplits().size());
    assertEquals(1, s.worstSplits().get(0).label());
    assertEquals(4, s.worstSplits().get(0).overlapCount());
    assertEquals(2, s.worstSplits().get(0).overlapLabels().length);
    assertEquals(3, s.worstSplits().get(1).label());
    assertArrayEquals(new long[] {30, 31}, s.worstSplits().get(1).overlapLabels());
  }

  @Test
  void nothingToEvaluateIsAnInputError() {
    ContingencyTable table = new ContingencyTable();
    table.add(new long[] {0, 0}, new long[] {1, 2});
    SunderException e = assertThrows(SunderException.class,
        () -> new Scorer(ScoreOptions.DEFAULT).score(table));
    assertEquals(ErrorKind.INVALID_INPUT, e.kind());
    assertTrue(e.getMessage().contains("ground-truth label 0"), e.getMessage());
  }
}
