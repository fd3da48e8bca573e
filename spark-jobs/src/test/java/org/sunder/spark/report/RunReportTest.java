package org.sunder.spark.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.spark.cli.CliRun;
import org.sunder.spark.it.Scenes;
import org.sunder.spark.it.SharedSpark;
import org.sunder.testing.PythonReference;

/**
 * A run writes {@code report.html} into its work dir, {@code report} rewrites it, and headless
 * Chromium shows it with every picture loaded. One small scene (64 x 56 x 20 voxels, 8 blocks)
 * on {@code local[2]}.
 */
class RunReportTest {
  private static final int[] CHUNK_XYZ = {32, 28, 10};
  @RegisterExtension
  static final SharedSpark.PerClass SPARK = SharedSpark.perClass("local[2]");
  @TempDir
  static Path dir;
  private static Path config;
  private static Path page;
  private static String html;

  @BeforeAll
  static void run() throws IOException {
    Scenes.Scene scene = Scenes.write(dir, StorageFormat.ZARR, Degradation.moderate(13),
        CHUNK_XYZ, "{}");
    config = scene.config();
    CliRun run = CliRun.with(SPARK.source(), "run", config.toString());
    assertEquals(0, run.exitCode(), run.out() + run.err());
    Matcher m = Pattern.compile("report: (\\S+report\\.html)").matcher(run.out());
    assertTrue(m.find(), run.out());
    page = Path.of(m.group(1));
    html = Files.readString(page);
  }

  private static int count(String text, String part) {
    int n = 0;
    for (int i = text.indexOf(part); i >= 0; i = text.indexOf(part, i + 1)) {
      n++;
    }
    return n;
  }

  @Test
  void reportHasEverySectionOfAFinishedEvaluatedRun() {
    for (String part : new String[] {"Settings", "Stages", "Segment size histogram",
        "Slices through the volume", "Seam audit", "Scores against the ground truth",
        "Worst splits", "Worst merges", "Least certain decisions of the solve",
        "need proofreading"}) {
      assertTrue(html.contains(part), part);
    }
    // 9 slices (3 axes x 3 positions) and the histogram, at least
    assertTrue(count(html, "<img ") >= 10, "images: " + count(html, "<img "));
    // every partition task ran and was timed: "8 of 8" then the timed count 8
    assertTrue(html.contains("<td class=\"l\">partition</td><td>8 of 8</td><td>8</td>"), html);
    // no figure printed as NaN (pictures are left out: base64 text may spell it by chance)
    assertFalse(html.replaceAll("data:image/png;base64,[A-Za-z0-9+/=]+", "").contains("NaN"));
  }

  @Test
  void segmentCountMatchesNumpyOnTheWrittenSegmentation() {
    PythonReference.requireModules("zarr", "numpy");
    Matcher m = Pattern.compile("<p>(\\d+) segments; ").matcher(html);
    assertTrue(m.find(), "segment count line");
    // reference: numpy.unique over the segmentation zarr wrote, background 0 left out
    String out = PythonReference.runChecked("""
        import sys, zarr, numpy as np
        a = zarr.open(sys.argv[1], mode='r')[sys.argv[2]][...]
        print(len(np.setdiff1d(np.unique(a), [0])))
        """, dir.resolve("scene.zarr").toString(), "segmentation");
    assertEquals(Long.parseLong(out.strip()), Long.parseLong(m.group(1)));
  }

  @Test
  void objectBoxesMatchScipyFindObjects() {
    PythonReference.requireModules("zarr", "numpy", "scipy.ndimage");
    Path root = dir.resolve("scene.zarr");
    long[] labels = {1, 2, 5, 7, 123456};
    long[][] boxes = ObjectBoxes.of(SPARK.context(), root.toString(),
        SyntheticScenario.GROUND_TRUTH, org.sunder.blockwise.grid.BlockGrid.of(
            new long[] {64, 56, 20}, CHUNK_XYZ, CHUNK_XYZ, new int[3]), labels);
    // reference: scipy.ndimage.find_objects on the ground truth (zyx slices, stop exclusive)
    String out = PythonReference.runChecked("""
        import sys, zarr, numpy as np, scipy.ndimage as ndi
        a = zarr.open(sys.argv[1], mode='r')[sys.argv[2]][...].astype(np.int64)
        found = ndi.find_objects(a)
        for label in map(int, sys.argv[3:]):
            s = found[label - 1] if label <= len(found) else None
            if s is None:
                print('none')
            else:
                print(s[2].start, s[1].start, s[0].start, s[2].stop - 1, s[1].stop - 1, s[0].stop - 1)
        """, root.toString(), SyntheticScenario.GROUND_TRUTH, "1", "2", "5", "7", "123456");
    String[] lines = out.strip().split("\n");
    for (int i = 0; i < labels.length; i++) {
      String expected = lines[i].strip();
      String actual = boxes[i] == null ? "none"
          : String.join(" ", java.util.Arrays.stream(boxes[i]).mapToObj(Long::toString).toList());
      assertEquals(expected, actual, "label " + labels[i]);
    }
  }

  @Test
  void reportCommandRewritesTheReport() throws IOException {
    Path copy = dir.resolve("first-report.html");
    Files.copy(page, copy);
    Files.delete(page);
    CliRun run = CliRun.with(SPARK.source(), "report", config.toString());
    assertEquals(0, run.exitCode(), run.out() + run.err());
    assertTrue(Files.isRegularFile(page));
    String again = Files.readString(page);
    assertEquals(count(html, "<img "), count(again, "<img "));
    assertTrue(again.contains("Least certain decisions of the solve"));
  }

  @Test
  void chromiumLoadsEveryPictureAndShowsAColourfulPage() throws IOException {
    HeadlessChromium.require();
    String dom = HeadlessChromium.dumpDom(page);
    assertTrue(dom.contains("data-images=\"loaded\""), "images not all loaded");
    Matcher m = Pattern.compile("data-image-count=\"(\\d+)\"").matcher(dom);
    assertTrue(m.find(), "the page's load script did not run");
    assertEquals(count(html, "<img "), Integer.parseInt(m.group(1)));
    Path png = dir.resolve("report.png");
    HeadlessChromium.screenshot(page, png, 1280, 2400);
    BufferedImage shot = ImageIO.read(png.toFile());
    assertEquals(1280, shot.getWidth());
    Set<Integer> colours = new HashSet<>();
    for (int y = 0; y < shot.getHeight(); y += 2) {
      for (int x = 0; x < shot.getWidth(); x += 2) {
        colours.add(shot.getRGB(x, y) & 0xffffff);
      }
    }
    // a blank or text-only page has a few dozen colours; the slice pictures bring thousands
    assertTrue(colours.size() > 1000, "distinct colours: " + colours.size());
  }
}
