package org.sunder.blockwise.metrics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Random;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImgs;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;

class EvaluatorTest {

  private static final long[] SHAPE = {23, 17, 11};
  private long[] gt;
  private long[] seg;

  @BeforeEach
  void labels() {
    Random random = new Random(13);
    gt = ContingencyTableTest.smoothLabels(random, 40);
    seg = ContingencyTableTest.smoothLabels(random, 25);
  }

  private static Dataset labels(Container c, String path, long[] values, int[] chunk) {
    Dataset d = c.createDataset(path, DatasetSpec.of(SHAPE, chunk, DataType.UINT64));
    d.write(ArrayImgs.unsignedLongs(values, SHAPE), new long[3]);
    return d;
  }

  private static SegmentationScores inMemory(long[] g, long[] s, byte[] mask,
      ScoreOptions options) {
    ContingencyTable t = new ContingencyTable();
    if (mask == null) {
      t.add(g, s);
    } else {
      t.add(g, s, mask);
    }
    return new Scorer(options).score(t);
  }

  @Test
  void blockwiseFromEitherFormatEqualsTheWholeArray(@TempDir Path dir) {
    for (StorageFormat format : StorageFormat.values()) {
      Container c = Container.create(dir.resolve(format.name()), format);
      Dataset g = labels(c, "gt", gt, new int[] {8, 5, 4});
      Dataset s = labels(c, "seg", seg, new int[] {7, 7, 7});
      for (int[] block : new int[][] {null, {16, 10, 4}, {24, 20, 12}}) {
        Evaluator evaluator = new Evaluator(g, s, EvaluationRegion.whole(), block);
        for (int threads : new int[] {1, 2}) {
          for (ScoreOptions options : List.of(ScoreOptions.DEFAULT,
              ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(false))) {
            assertEquals(inMemory(gt, seg, null, options), evaluator.evaluate(options, threads));
          }
        }
      }
      assertTrue(new Evaluator(g, s, EvaluationRegion.whole(), null).grid().blockCount() > 20);
    }
  }

  @Test
  void maskAndBoxesRestrictTheVoxels(@TempDir Path dir) {
    Container c = Container.create(dir, StorageFormat.ZARR);
    Dataset g = labels(c, "gt", gt, new int[] {8, 8, 4});
    Dataset s = labels(c, "seg", seg, new int[] {8, 8, 4});
    Random random = new Random(13);
    byte[] mask = new byte[gt.length];
    for (int i = 0; i < mask.length; i++) {
      mask[i] = (byte) (random.nextInt(3) == 0 ? 1 : 0);
    }
    Dataset m = c.createDataset("mask", DatasetSpec.of(SHAPE, new int[] {5, 5, 5},
        DataType.UINT8));
    m.write(ArrayImgs.unsignedBytes(mask, SHAPE), new long[3]);
    ScoreOptions options = ScoreOptions.DEFAULT.withIgnoreGroundTruthZero(false);
    assertEquals(inMemory(gt, seg, mask, options),
        new Evaluator(g, s, EvaluationRegion.mask(m), null).evaluate(options, 2));

    // two overlapping boxes: shared voxels count once
    List<FinalInterval> boxes = List.of(new FinalInterval(new long[] {2, 3, 1},
        new long[] {12, 9, 6}), new FinalInterval(new long[] {10, 0, 5}, new long[] {20, 16, 9}));
    byte[] inBoxes = new byte[gt.length];
    for (int z = 0; z < 11; z++) {
      for (int y = 0; y < 17; y++) {
        for (int x = 0; x < 23; x++) {
          for (FinalInterval b : boxes) {
            if (x >= b.min(0) && x <= b.max(0) && y >= b.min(1) && y <= b.max(1)
                && z >= b.min(2) && z <= b.max(2)) {
              inBoxes[x + 23 * (y + 17 * z)] = 1;
            }
          }
        }
      }
    }
    SegmentationScores byBoxes =
        new Evaluator(g, s, EvaluationRegion.boxes(boxes), null).evaluate(options, 1);
    assertEquals(inMemory(gt, seg, inBoxes, options), byBoxes);
    assertEquals(11 * 7 * 6 + 11 * 17 * 5 - 3 * 7 * 2, byBoxes.evaluatedVoxels());
  }

  @Test
  void otherIntegerTypesAreReadAsUnsignedLabels(@TempDir Path dir) {
    Container c = Container.create(dir, StorageFormat.N5);
    Dataset g = labels(c, "gt", gt, new int[] {8, 8, 4});
    int[] small = new int[seg.length];
    long[] widened = new long[seg.length];
    for (int i = 0; i < seg.length; i++) {
      small[i] = (int) (seg[i] == 0 ? 0xFFFF_FFF0L : seg[i]);
      widened[i] = Integer.toUnsignedLong(small[i]);
    }
    Dataset s = c.createDataset("seg", DatasetSpec.of(SHAPE, new int[] {8, 8, 4},
        DataType.UINT32));
    s.write(ArrayImgs.unsignedInts(small, SHAPE), new long[3]);
    SegmentationScores scores =
        new Evaluator(g, s, EvaluationRegion.whole(), null).evaluate(ScoreOptions.DEFAULT, 1);
    assertEquals(inMemory(gt, widened, null, ScoreOptions.DEFAULT), scores);
  }

  @Test
  void badInputsAreInputErrorsNamingTheDataset(@TempDir Path dir) {
    Container c = Container.create(dir, StorageFormat.ZARR);
    Dataset g = labels(c, "gt", gt, new int[] {8, 8, 4});
    Dataset s = labels(c, "seg", seg, new int[] {8, 8, 4});
    Dataset other = c.createDataset("small", DatasetSpec.of(new long[] {23, 17, 10},
        new int[] {8, 8, 4}, DataType.UINT64));
    Dataset floats = c.createDataset("probabilities", DatasetSpec.of(SHAPE, new int[] {8, 8, 4},
        DataType.FLOAT32));
    Dataset empty = c.createDataset("empty-mask", DatasetSpec.of(SHAPE, new int[] {8, 8, 4},
        DataType.UINT8));

    expectInputError(() -> new Evaluator(g, other, EvaluationRegion.whole(), null),
        "'small'", "[10, 17, 23] (zyx)", "[11, 17, 23] (zyx)");
    expectInputError(() -> new Evaluator(g, floats, EvaluationRegion.whole(), null),
        "'probabilities'", "float32", "integer label type");
    expectInputError(() -> new Evaluator(floats, s, EvaluationRegion.whole(), null),
        "ground truth", "'probabilities'");
    expectInputError(() -> new Evaluator(g, s, EvaluationRegion.mask(other), null),
        "mask", "'small'");
    expectInputError(() -> new Evaluator(g, s, EvaluationRegion.mask(empty), null)
        .evaluate(ScoreOptions.DEFAULT, 2), "'empty-mask'", "selects no voxel");
    expectInputError(() -> new Evaluator(g, s, EvaluationRegion.boxes(List.of()), null),
        "boxes", "empty");
    expectInputError(() -> new Evaluator(g, s, EvaluationRegion.boxes(List.of(
        new FinalInterval(new long[] {0, 0, 0}, new long[] {23, 1, 1}))), null),
        "box 0", "inside the volume");
  }

  private static void expectInputError(Runnable action, String... fragments) {
    SunderException e = assertThrows(SunderException.class, action::run);
    assertEquals(ErrorKind.INVALID_INPUT, e.kind(), e.getMessage());
    for (String fragment : fragments) {
      assertTrue(e.getMessage().contains(fragment), "'" + fragment + "' in: " + e.getMessage());
    }
  }
}
