package org.sunder.blockwise.synth;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import net.imglib2.FinalInterval;
import net.imglib2.img.array.ArrayImg;
import net.imglib2.img.basictypeaccess.array.ArrayDataAccess;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.testing.PythonReference;

class SyntheticScenarioTest {

  private static final SynthSpec SPEC = SynthSpec.small(13).withShape(40, 36, 12);

  private static Object storage(ArrayImg<?, ?> img) {
    return ((ArrayDataAccess<?>) img.update(null)).getCurrentStorageArray();
  }

  private static ArrayImg<?, ?> readAll(Dataset d) {
    long[] max = d.shape();
    for (int i = 0; i < max.length; i++) {
      max[i]--;
    }
    return d.read(new FinalInterval(new long[max.length], max));
  }

  @Test
  void writesBothDatasetsWithTheirAttributesInEitherFormat(@TempDir Path dir) {
    for (StorageFormat format : StorageFormat.values()) {
      Container c = Container.create(dir.resolve(format.name()), format);
      ScenarioOptions options = ScenarioOptions.defaults().withGroup("input")
          .withChunkShape(16, 16, 8);
      SyntheticScenario.Written w = SyntheticScenario.write(c, SPEC, options);
      Container reopened = Container.open(dir.resolve(format.name()));
      Dataset gt = reopened.openDataset("input/ground-truth");
      Dataset aff = reopened.openDataset("input/affinities");
      assertEquals(DataType.UINT64, gt.dataType());
      assertArrayEquals(new long[] {40, 36, 12}, gt.shape());
      assertArrayEquals(new long[] {40, 36, 12, 9}, aff.shape());
      assertArrayEquals(new int[] {16, 16, 8, 9}, aff.chunkShape());
      assertArrayEquals(w.volume().labels(), (long[]) storage(readAll(gt)));
      int[][] offsets = SyntheticScenario.defaultOffsets().vectors();
      assertArrayEquals(ExactAffinities.compute(w.volume().labels(), SPEC.shape(), offsets),
          (float[]) storage(readAll(aff)));

      Map<String, Object> attributes = reopened.readAttributes("input/affinities");
      assertEquals("zyx", attributes.get("axes"));
      assertEquals(List.of(List.of(-1, 0, 0), List.of(0, -1, 0), List.of(0, 0, -1),
          List.of(-2, 0, 0), List.of(0, -3, 0), List.of(0, 0, -3), List.of(-3, 0, 0),
          List.of(0, -9, 0), List.of(0, 0, -9)), attributes.get("offsets"));
      assertEquals(List.of(24.0, 8.0, 8.0), attributes.get("voxelSize"));
      assertEquals(SPEC, SyntheticScenario.readSpec(reopened, "input/affinities"));
      assertEquals(SPEC, SyntheticScenario.readSpec(reopened, "input/ground-truth"));
      assertEquals(Degradation.none(),
          SyntheticScenario.readDegradation(reopened, "input/affinities"));
      assertEquals(w.volume().objectCount(),
          ((Number) reopened.readAttributes("input/ground-truth").get("objectCount")).intValue());
    }
  }

  @Test
  void degradedUint8AffinitiesRecordTheirDegradation(@TempDir Path dir) {
    Container c = Container.create(dir, StorageFormat.N5);
    Degradation degradation = new Degradation(5, 0.5, 0.05, 0.01, 0.001, 0.1);
    Offsets offsets = Offsets.fromZyx(new int[][] {{0, 0, -1}, {0, -1, 0}, {-1, 0, 0},
        {0, 0, -4}});
    SyntheticScenario.Written w = SyntheticScenario.write(c, SPEC, ScenarioOptions.defaults()
        .withOffsets(offsets).withDegradation(degradation).withAffinityType(DataType.UINT8));
    assertEquals(DataType.UINT8, w.affinities().dataType());
    byte[] stored = (byte[]) storage(readAll(w.affinities()));
    int[][] vectors = offsets.vectors();
    float[] expected = degradation.apply(w.volume().labels(), SPEC.shape(), SPEC.voxelSize(),
        vectors, ExactAffinities.compute(w.volume().labels(), SPEC.shape(), vectors));
    assertArrayEquals(ExactAffinities.toUint8(expected), stored);
    assertEquals(degradation, SyntheticScenario.readDegradation(c, "affinities"));
    assertEquals("probability * 255", c.readAttributes("affinities").get("encoding"));
  }

  @Test
  void refusesToOverwriteAndWritesNothingThen(@TempDir Path dir) {
    Container c = Container.create(dir, StorageFormat.ZARR);
    c.createGroup("affinities");
    SunderException e = assertThrows(SunderException.class,
        () -> SyntheticScenario.write(c, SPEC, ScenarioOptions.defaults()));
    assertEquals(ErrorKind.CONFLICT, e.kind());
    assertTrue(e.getMessage().contains("'affinities'"), e.getMessage());
    assertFalse(c.datasetExists("ground-truth"));
  }

  @Test
  void pythonZarrReadsTheScenarioWithTheSameAxes(@TempDir Path dir) {
    PythonReference.requireModules("zarr", "numpy");
    Container c = Container.create(dir, StorageFormat.ZARR);
    SyntheticScenario.Written w =
        SyntheticScenario.write(c, SPEC, ScenarioOptions.defaults().withChunkShape(16, 16, 8));
    float[] exact = ExactAffinities.compute(w.volume().labels(), SPEC.shape(),
        SyntheticScenario.defaultOffsets().vectors());
    long ones = 0;
    for (float a : exact) {
      ones += a == 1f ? 1 : 0;
    }
    // Reference: zarr 2.13 (the Zarr v2 reference implementation) and numpy, recomputing the
    // exact affinities from the stored ground truth and the "offsets" attribute (zyx).
    String script = """
        import sys, zarr, numpy as np
        root = zarr.open(sys.argv[1], mode='r')
        gt = root['ground-truth'][:]
        aff = root['affinities']
        offsets = aff.attrs['offsets']
        assert aff.attrs['axes'] == 'zyx'
        a = aff[:]
        expected = np.zeros(a.shape, dtype=np.float32)
        def cut(n, d):
            return slice(max(0, -d), n - max(0, d))
        def moved(n, d):
            return slice(max(0, d), n - max(0, -d))
        for k, d in enumerate(offsets):
            at = tuple(cut(n, c) for n, c in zip(gt.shape, d))
            to = tuple(moved(n, c) for n, c in zip(gt.shape, d))
            expected[(k,) + at] = (gt[at] == gt[to]) & (gt[at] != 0)
        print(gt.shape, gt.dtype, a.shape, a.dtype, int(np.abs(a - expected).max()),
              int(gt.max()), int(expected.sum()))
        """;
    String out = PythonReference.runChecked(script, dir.toString()).strip();
    int objects = ((Number) c.readAttributes("ground-truth").get("objectCount")).intValue();
    assertTrue(ones > 50_000, "attractive edges " + ones);
    assertEquals("(12, 36, 40) uint64 (9, 12, 36, 40) float32 0 " + objects + " " + ones, out);
  }
}
