package org.sunder.spark.it;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Path;
import java.util.Map;
import net.imglib2.img.array.ArrayImgs;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.metrics.SeamAudit;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.spark.cli.CliRun;
import org.sunder.spark.run.RunResolver;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.WorkDir;

/**
 * {@code evaluate} prints the seam audit of segmentations cut on purpose along a block grid,
 * computed on Spark ({@code local[2]}), equal to the in-memory audit.
 */
class SeamAuditIntegrationTest {
  private static final int[] CHUNK_XYZ = {32, 28, 10};
  @RegisterExtension
  static final SharedSpark.PerClass SPARK = SharedSpark.perClass("local[2]");

  /** The ground truth relabelled per block of a grid with the given origin (x y z). */
  private static long[] cutPerBlock(long[] gt, long[] shape, int[] origin) {
    long[] seg = new long[gt.length];
    int i = 0;
    for (int z = 0; z < shape[2]; z++) {
      for (int y = 0; y < shape[1]; y++) {
        for (int x = 0; x < shape[0]; x++, i++) {
          long bx = Math.floorDiv(x - origin[0], CHUNK_XYZ[0]) + 1;
          long by = Math.floorDiv(y - origin[1], CHUNK_XYZ[1]) + 1;
          long bz = Math.floorDiv(z - origin[2], CHUNK_XYZ[2]) + 1;
          seg[i] = gt[i] == 0 ? 0 : gt[i] * 1000 + (bz * 10 + by) * 10 + bx;
        }
      }
    }
    return seg;
  }

  private static void writeLabels(Path root, String name, long[] labels, long[] shape) {
    Container.open(root).createDataset(name, DatasetSpec.of(shape, CHUNK_XYZ, DataType.UINT64))
        .write(ArrayImgs.unsignedLongs(labels, shape), new long[3]);
  }

  private static CliRun evaluate(Path root, String segmentation, String... more) {
    String[] base = {"evaluate", "--segmentation", root + ":" + segmentation, "--truth",
        root + ":ground-truth"};
    String[] args = java.util.Arrays.copyOf(base, base.length + more.length);
    System.arraycopy(more, 0, args, base.length, more.length);
    CliRun run = CliRun.with(SPARK.source(), args);
    assertEquals(0, run.exitCode(), run.out() + run.err());
    return run;
  }

  @Test
  void evaluatePrintsTheAuditAndFlagsCutsOnTheFacesButNotHalfABlockAway(@TempDir Path dir) {
    Scenes.Scene scene = Scenes.write(dir, StorageFormat.ZARR, Degradation.none(), CHUNK_XYZ,
        "{\"method\": \"mutex-watershed\"}");
    Path root = scene.container();
    long[] gt = Scenes.labels(root, "ground-truth");
    long[] shape = Container.open(root).openDataset("ground-truth").shape();
    long[] atFaces = cutPerBlock(gt, shape, new int[3]);
    long[] shifted = cutPerBlock(gt, shape, new int[] {16, 14, 5});
    writeLabels(root, "cut", atFaces, shape);
    writeLabels(root, "shifted", shifted, shape);

    String cut = evaluate(root, "cut", "--block-shape", "10,28,32").out();
    SeamAudit expected = SeamAudit.of(gt, atFaces, shape, CHUNK_XYZ);
    assertTrue(expected.worseThanControl(), expected.toString());
    assertTrue(cut.contains("seam audit: blocks [10, 28, 32] (zyx), 3 face planes"), cut);
    assertTrue(cut.contains("objects_cut_at_faces   " + expected.objectsCutAtFaces() + "  (of "
        + expected.objectsCrossingFaces() + " objects crossing a face)"), cut);
    assertTrue(cut.contains("objects_cut_at_control 0  (of "), cut);
    assertTrue(cut.contains("boundary_share_faces   1.000000"), cut);
    assertTrue(cut.contains("SEAMS WORSE THAN THE CONTROL: " + expected.objectsCutAtFaces()
        + " objects cut at faces, 0 at control planes (tolerance +2)"), cut);

    String half = evaluate(root, "shifted", "--block-shape", "10,28,32").out();
    assertTrue(half.contains("objects_cut_at_faces   0  (of "), half);
    assertTrue(half.contains("seams no worse than the control: 0 objects cut at faces"), half);

    String skipped = evaluate(root, "shifted").out();
    assertTrue(skipped.contains("seam audit: skipped, no block shape"), skipped);
  }

  @Test
  void evaluateReadsTheBlockShapeFromTheManifestOfTheRunThatWroteTheSegmentation(
      @TempDir Path dir) {
    Scenes.Scene scene = Scenes.write(dir, StorageFormat.N5, Degradation.none(), CHUNK_XYZ,
        "{\"method\": \"mutex-watershed\"}");
    Path root = scene.container();
    long[] gt = Scenes.labels(root, "ground-truth");
    long[] shape = Container.open(root).openDataset("ground-truth").shape();
    writeLabels(root, "cut", cutPerBlock(gt, shape, new int[3]), shape);
    ObjectMapper json = new ObjectMapper();
    ObjectNode config = json.createObjectNode();
    config.putObject("input").put("axes", "xzy");
    config.putObject("output").put("container", root.toAbsolutePath().normalize().toString())
        .put("dataset", "cut");
    config.putObject("blocks").set("shape", json.valueToTree(new int[] {32, 10, 28}));
    Path work = RunResolver.defaultWorkDir(root, "cut");
    new WorkDir(work).writeManifest(new Manifest(Manifest.TOOL, "test", "run-1", "hash",
        Map.of(), config, "fingerprint", "summary"));
    String out = evaluate(root, "cut").out();
    assertTrue(out.contains("seam audit: blocks [32, 10, 28] (xzy, from the run's manifest in "
        + work + "), 3 face planes"), out);
    assertTrue(out.contains("SEAMS WORSE THAN THE CONTROL"), out);
  }

  @Test
  void aBlockShapeOfTheWrongLengthIsRefusedBeforeSparkStarts(@TempDir Path dir) {
    CliRun run = CliRun.withoutSpark("evaluate", "--segmentation", dir + "/a.zarr:seg",
        "--truth", dir + "/a.zarr:gt", "--block-shape", "10,28");
    assertEquals(2, run.exitCode(), run.err());
    assertTrue(run.err().contains("--block-shape: expected 3 sizes in zyx order, got [10, 28]"),
        run.err());
  }
}
