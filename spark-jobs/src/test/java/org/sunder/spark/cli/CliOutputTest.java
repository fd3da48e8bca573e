package org.sunder.spark.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.spark.run.TestContainers;

/** What {@code inspect}, {@code plan} and {@code --help} print. */
class CliOutputTest {
  private static final long[] VOLUME = {12, 20, 28};
  private static final int[] CHUNKS = {6, 10, 14};

  @Test
  void inspectListsDatasetsWithShapeChunksTypeCodecAndAttributes(@TempDir Path dir) {
    for (StorageFormat format : StorageFormat.values()) {
      Path root = dir.resolve("v-" + format);
      Container c = TestContainers.withAffinities(root, format, VOLUME, CHUNKS,
          TestContainers.OFFSETS_ZYX);
      c.createGroup("more");
      TestContainers.labels(c, "more/labels", VOLUME, CHUNKS);
      CliRun run = CliRun.withoutSpark("inspect", root.toString());
      assertEquals(0, run.exitCode(), run.err());
      String out = run.out();
      assertTrue(out.contains("format " + format.name().toLowerCase()), out);
      assertTrue(out.contains("affinities  dataset"), out);
      assertTrue(out.contains("shape   [5, 12, 20, 28]  (c, z, y, x)"), out);
      assertTrue(out.contains("chunks  [5, 6, 10, 14]"), out);
      assertTrue(out.contains("dtype   float32"), out);
      assertTrue(out.contains("codec   zstd"), out);
      assertTrue(out.contains("\"offsets\":[[-1,0,0],[0,-1,0],[0,0,-1],[0,-3,0],[0,0,-4]]"), out);
      assertTrue(out.contains("more/  group"), out);
      assertTrue(out.contains("more/labels  dataset"), out);
      assertTrue(out.contains("shape   [12, 20, 28]  (z, y, x)"), out);
      assertTrue(out.contains("dtype   uint64"), out);
      CliRun one = CliRun.withoutSpark("inspect", root.toString(), "more/labels");
      assertTrue(one.out().contains("more/labels  dataset") && !one.out().contains("affinities"),
          one.out());
    }
  }

  @Test
  void inspectOfSomethingElseIsAnInputError(@TempDir Path dir) throws Exception {
    Files.writeString(dir.resolve("notes.txt"), "x");
    CliRun run = CliRun.withoutSpark("inspect", dir.toString());
    assertEquals(ErrorKind.INVALID_INPUT.exitCode(), run.exitCode());
    assertTrue(run.err().contains("is not an N5 or Zarr container"), run.err());
  }

  @Test
  void planShowsGridTasksMemoryAndEstimate(@TempDir Path dir) throws Exception {
    Path root = dir.resolve("v.n5");
    TestContainers.withAffinities(root, StorageFormat.N5, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    Path config = dir.resolve("run.json");
    Files.writeString(config, "{\"input\": {\"container\": \"" + root + "\"},"
        + " \"blocks\": {\"shape\": [6, 10, 14], \"halo\": [1, 2, 2]}}");
    CliRun run = CliRun.withoutSpark("plan", config.toString(), "--cores", "2");
    assertEquals(0, run.exitCode(), run.err());
    String out = run.out();
    assertTrue(out.contains("volume     [12, 20, 28] (zyx), 5 channels float32, chunks [6, 10, 14]"), out);
    assertTrue(out.contains("blocks     shape [6, 10, 14], halo [1, 2, 2], grid [2, 2, 2] = 8 blocks"), out);
    assertTrue(out.contains("tasks      partition 8, seams 12, solve 1 (driver), relabel 8 (8 chunks)"), out);
    // The halo (2 along x) is shorter than the longest offset along x (4): reported.
    assertTrue(out.contains("note "), out);
    // Largest extended block: (6+2)(10+4)(14+4) = 2016 voxels x (5 x 4 + 158 + 122) bytes (150
    // working, 8 of labels, 2 x (5 x 4 + 20 + 21) for the fragments' context).
    Matcher memory = Pattern.compile("memory     about ([0-9.]+) MiB per partition task \\(2016"
        + " voxels").matcher(out);
    assertTrue(memory.find(), out);
    assertEquals(2016 * (5 * 4 + 280) / (1024.0 * 1024.0), Double.parseDouble(memory.group(1)), 0.05);
    // The central block of the 2 x 2 x 2 grid, block 7, at its place in the volume.
    Matcher estimate = Pattern.compile("estimate   sample block at grid \\[1, 1, 1\\], voxels"
        + " z 6..11, y 10..19, x 14..27 \\(zyx\\), partitioned here in ([0-9.]+) s \\(reading"
        + " [0-9.]+ s\\): ([0-9]+) segments, ([0-9]+) near a face, ([0-9]+) inner edges\n"
        + " +partition  about .+ of work, .+ on 2 cores \\(8 tasks of about .+, 4 rounds\\)"
        + ": the sample block's partition\n"
        + " +seams      about .+ on 2 cores \\(12 tasks of about .+, 6 rounds\\): the sample's"
        + " 3 faces, .+\n"
        + " +solve      about .+ on 2 cores \\(1 task of about .+\\): the reduced graph's estimated"
        + " edges \\(below\\) at the method's measured cost per edge\n"
        + " +relabel    about .+ on 2 cores \\(8 tasks of about .+, 4 rounds\\): .+\n"
        + "(?: +pyramid    about .+ on 2 cores \\([0-9]+ tasks? of about .+\\): .+\n)?"
        + " +total      about .+ on 2 cores\n"
        + "driver     reduced graph about ([0-9]+) edges \\(estimate: .+\\), [0-9.]+% of"
        + " solve.maxDriverEdges = 20000000\n").matcher(out);
    assertTrue(estimate.find(), out);
    int segments = Integer.parseInt(estimate.group(2));
    assertTrue(segments >= 1 && Integer.parseInt(estimate.group(3)) <= segments, out);
    // The estimate counts at least the sample's inner edges for each of the 8 blocks.
    assertTrue(Long.parseLong(estimate.group(5)) >= 8 * Long.parseLong(estimate.group(4)), out);
    // Halo [1, 2, 2] on blocks [6, 10, 14] of [12, 20, 28], by hand: z (7 + 7) / 12, y (12 + 12)
    // / 20, x (16 + 16) / 28: 1.1667 x 1.2 x 1.1429 = 1.60.
    assertTrue(out.contains("           halo overhead 1.60: the blocks read and partition 1.60 x"
        + " the volume's voxels (target at most 1.35); shape set by blocks.shape\n"), out);
    // Task records: partition 8 + seams 12 + solve 1 + relabel 8 + the pyramid's tasks.
    Matcher pyramid = Pattern.compile("relabel 8 \\(8 chunks\\), pyramid ([0-9]+)\n")
        .matcher(out);
    assertTrue(pyramid.find(), out);
    assertTrue(out.contains("records    " + (29 + Integer.parseInt(pyramid.group(1)))
        + " task records in the work dir"), out);
    assertTrue(out.contains(" per task (this JVM's heap ") && out.contains(" / 2 cores), "), out);
    assertTrue(out.contains("work dir   " + dir.resolve("v.n5.sunder-work/segmentation")), out);
    assertTrue(!Files.exists(dir.resolve("v.n5.sunder-work")), "plan writes nothing");
  }

  @Test
  void planShowsTheLevelsOfASolveAboveTheDriverBound(@TempDir Path dir) throws Exception {
    Path root = dir.resolve("v.n5");
    TestContainers.withAffinities(root, StorageFormat.N5, new long[] {12, 40, 56}, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    Path config = dir.resolve("run.json");
    // blocks [6, 10, 14] of [12, 40, 56]: a grid of 2 x 4 x 4 = 32 blocks, 4 super-blocks of
    // 2 x 2 x 2 at level 1 and 1 at level 2, so one level; a bound of 1 pair (2 edges) that
    // the rest cannot fit under
    Files.writeString(config, "{\"input\": {\"container\": \"" + root + "\"},"
        + " \"blocks\": {\"shape\": [6, 10, 14], \"halo\": [1, 2, 2]},"
        + " \"partition\": {\"method\": \"mutex-watershed\"},"
        + " \"solve\": {\"maxDriverEdges\": 1}}");
    CliRun run = CliRun.withoutSpark("plan", config.toString(), "--cores", "2");
    assertEquals(0, run.exitCode(), run.err());
    String out = run.out();
    // records: the stage's own 1 + 4 parts up and down + the driver's 1 + 32 blocks' ids = 42
    assertTrue(out.contains("levels     the solve runs level by level over super-blocks: 1"
        + " levels (each taken to hand up 0.5 of its edges), 42 records\n"), out);
    assertTrue(Pattern.compile("           largest task about [0-9]+ edges \\(.+\\); the driver's"
        + " share about [0-9]+ edges \\(.+\\); above solve.maxDriverEdges after the last level")
        .matcher(out).find(), out);
    assertTrue(!out.contains("size filter"), out);
    // with a size filter, its own pass of levels: 4 parts up and down and the driver's record
    Files.writeString(config, Files.readString(config).replace("\"mutex-watershed\"}",
        "\"mutex-watershed\", \"minSegmentSize\": 30}"));
    CliRun filtered = CliRun.withoutSpark("plan", config.toString(), "--cores", "2");
    assertEquals(0, filtered.exitCode(), filtered.err());
    assertTrue(Pattern.compile("           then the size filter, level by level from the blocks'"
        + " statistics: 1 levels, 9 records; largest task about [0-9]+ rows \\(.+\\), the"
        + " driver's share about [0-9]+ rows \\(.+\\); above its bound after the last level")
        .matcher(filtered.out()).find(), filtered.out());
  }

  @Test
  void helpNamesEveryCommandAndStatesDefaults() {
    CliRun top = CliRun.withoutSpark("--help");
    assertEquals(0, top.exitCode());
    for (String command : new String[] {"run", "stage", "plan", "demo", "evaluate", "inspect"}) {
      assertTrue(Pattern.compile("^\\s+" + command + "\\s", Pattern.MULTILINE)
          .matcher(top.out()).find(), command + " missing from\n" + top.out());
    }
    CliRun demo = CliRun.withoutSpark("demo", "--help");
    assertTrue(demo.out().contains("default: sunder-demo"), demo.out());
    assertTrue(demo.out().contains("default: 48,128,128"), demo.out());
    CliRun run = CliRun.withoutSpark("run", "--help");
    assertTrue(run.out().contains("default: local[*]"), run.out());
  }
}
