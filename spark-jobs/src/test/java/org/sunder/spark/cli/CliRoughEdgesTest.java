package org.sunder.spark.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.spark.api.java.JavaSparkContext;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.SunderException;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.spark.Launcher;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.demo.DemoScenario;
import org.sunder.spark.plan.RunPlan;
import org.sunder.spark.run.BlockShapeOrigin;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.run.TestContainers;
import org.sunder.spark.stage.StageReport;
import org.sunder.spark.workdir.Stage;
import org.sunder.stitching.demo.DemoVolume;

/** The rough edges a new user met on the command line and in {@code plan}, each smoothed. */
class CliRoughEdgesTest {
  private static final long[] VOLUME = {12, 20, 28};
  private static final int[] CHUNKS = {6, 10, 14};

  @TempDir
  Path dir;
  private Path input;

  @BeforeEach
  void scene() {
    input = dir.resolve("v.zarr");
    TestContainers.withAffinities(input, StorageFormat.ZARR, VOLUME, CHUNKS,
        TestContainers.OFFSETS_ZYX);
  }

  private Path config(String name, String json) throws IOException {
    Path file = dir.resolve(name);
    Files.createDirectories(file.getParent());
    Files.writeString(file, json);
    return file;
  }

  private String basic(String more) {
    return "{\"input\": {\"container\": \"" + input + "\"}, \"blocks\": {\"shape\": [6, 10, 14]}"
        + more + "}";
  }

  // ------------------------------------------------------------ unknown keys

  @Test
  void anUnknownKeyGetsOneStyleEverywhereNamingTheFileAndTheKnownKeys() throws IOException {
    String[][] cases = {
        {basic(", \"partition\": {\"methd\": \"mutex-watershed\"}"), "partition.methd", "method"},
        {basic(", \"partition\": {\"method\": \"fragments-multicut\", \"fragments\":"
            + " {\"perSlise\": true}}"), "partition.fragments.perSlise", "perSlice"},
        {basic(", \"blokcs\": {}"), "blokcs", "blocks"},
        {"{\"input\": {\"container\": \"" + input + "\", \"afinities\": \"a\"}}",
            "input.afinities", "affinities"}};
    for (String[] c : cases) {
      Path file = config("run.json", c[0]);
      for (String command : new String[] {"run", "plan"}) {
        CliRun run = CliRun.withoutSpark(command, file.toString());
        assertEquals(ErrorKind.INVALID_CONFIG.exitCode(), run.exitCode(), run.err());
        String err = run.err();
        assertTrue(err.contains(file.toString() + ": unknown key '" + c[1] + "'; known keys there: "),
            err);
        assertTrue(Pattern.compile("known keys there: .*\\b" + c[2] + "\\b").matcher(err).find(),
            err);
        assertFalse(err.contains("ignorable") || err.contains("org.sunder") || err.contains("\tat "),
            err);
      }
    }
  }

  // ------------------------------------------------------------ no command, unknown command

  @Test
  void noCommandPrintsTheUsageAndAnUnknownCommandTheListOfCommandsBothExit2() {
    CliRun bare = CliRun.withoutSpark();
    assertEquals(2, bare.exitCode());
    assertTrue(bare.err().contains("Usage: sunder"), bare.err());
    CliRun typo = CliRun.withoutSpark("rnu", "run.json");
    assertEquals(2, typo.exitCode());
    assertTrue(typo.err().startsWith("sunder: unknown command 'rnu'; the commands are:"),
        typo.err());
    assertFalse(typo.err().contains("sunder sunder"), typo.err());
    for (String command : new String[] {"run", "stage", "plan", "demo", "evaluate", "inspect"}) {
      assertTrue(Pattern.compile("^\\s+" + command + "\\s", Pattern.MULTILINE)
          .matcher(typo.err()).find(), command + " missing from\n" + typo.err());
    }
    assertTrue(typo.err().contains("Try 'bin/sunder --help'"), typo.err());
  }

  // ------------------------------------------------------------ suggestions that work as printed

  @Test
  void printedSuggestionsNameTheLauncher() {
    CliRun help = CliRun.withoutSpark("--help");
    assertTrue(help.out().contains("bin/sunder demo") && help.out().contains("bin/sunder plan run.json")
        && help.out().contains("bin/sunder run run.json"), help.out());
    assertFalse(Pattern.compile("(^|[^/])sunder (demo|plan|run) ").matcher(help.out()).find(),
        help.out());
    String before = System.getProperty(Launcher.PROPERTY);
    System.setProperty(Launcher.PROPERTY, "/opt/tools/sunder/bin/sunder");
    try {
      CliRun withPath = CliRun.withoutSpark("--help");
      assertTrue(withPath.out().contains("/opt/tools/sunder/bin/sunder plan run.json"),
          withPath.out());
      CliRun usage = CliRun.withoutSpark("plan");
      assertTrue(usage.err().contains("Try '/opt/tools/sunder/bin/sunder plan --help'"),
          usage.err());
    } finally {
      if (before == null) {
        System.clearProperty(Launcher.PROPERTY);
      } else {
        System.setProperty(Launcher.PROPERTY, before);
      }
    }
  }

  // ------------------------------------------------------------ relative paths

  @Test
  void relativePathsResolveAgainstTheConfigurationsFolderAndTheHelpSaysSo() throws IOException {
    Path file = config("configs/run.json", "{\"input\": {\"container\": \"../v.zarr\"},"
        + " \"output\": {\"container\": \"out/seg.zarr\"}, \"workDir\": \"work\"}");
    CliRun plan = CliRun.withoutSpark("plan", "--no-sample", file.toString());
    assertEquals(0, plan.exitCode(), plan.err());
    assertTrue(plan.out().contains("input      " + input + "  dataset affinities"), plan.out());
    assertTrue(plan.out().contains("output     " + dir.resolve("configs/out/seg.zarr")), plan.out());
    assertTrue(plan.out().contains("work dir   " + dir.resolve("configs/work")), plan.out());
    for (String command : new String[] {"run", "plan", "stage"}) {
      String help = CliRun.withoutSpark(command, "--help").out().replaceAll("\\s+", " ");
      assertTrue(help.contains("Relative paths in it are relative to the configuration file's"
          + " folder"), help);
    }
  }

  @Test
  void theLocalDemoExampleIsAcceptedByPlanAfterTheDemo() throws IOException {
    // The demo's default --dir, sunder-demo, seen from the project folder; the example lives in
    // config-examples/ beside it.
    Path project = dir.resolve("project");
    Path demo = project.resolve("sunder-demo");
    DemoScenario.prepare(demo, DemoVolume.in(demo, "zarr"), "compact-cells",
        new long[] {8, 16, 16}, 13);
    Path example = project.resolve("config-examples/local-demo.json");
    Files.createDirectories(example.getParent());
    Files.copy(Path.of("..", "config-examples", "local-demo.json"), example);
    CliRun plan = CliRun.withoutSpark("plan", "--no-sample", example.toString());
    assertEquals(0, plan.exitCode(), plan.err());
    assertTrue(plan.out().contains("input      " + project.resolve("sunder-demo/volume.zarr")),
        plan.out());
  }

  // ------------------------------------------------------------ plan refuses what run refuses

  @Test
  void planRefusesAnEarlierRunsOtherSettingsWithRunsMessageListingOnlyChangedValues()
      throws IOException {
    Path file = config("run.json", basic(""));
    RunLoader.prepare(file, null, false).close();
    Files.writeString(file, basic(", \"partition\": {\"method\": \"mutex-watershed\"}"));
    CliRun plan = CliRun.withoutSpark("plan", "--no-sample", file.toString());
    CliRun run = CliRun.withoutSpark("run", file.toString());
    assertEquals(ErrorKind.CONFLICT.exitCode(), plan.exitCode(), plan.err());
    assertEquals(ErrorKind.CONFLICT.exitCode(), run.exitCode(), run.err());
    assertEquals(run.err().replace("sunder run:", ""), plan.err().replace("sunder plan:", ""));
    assertTrue(plan.err().contains("partition.method: "), plan.err());
    // The manifest holds solve.maxDriverEdges as written (a long), read back as an int: equal.
    assertFalse(plan.err().contains("maxDriverEdges"), plan.err());
    Matcher change = Pattern.compile("\n  ([^\n:]+): ([^\n]+) -> ([^\n]+)").matcher(plan.err());
    int changes = 0;
    while (change.find()) {
      changes++;
      assertFalse(change.group(2).equals(change.group(3)), "unchanged value listed: "
          + change.group());
    }
    assertTrue(changes > 0, plan.err());
    assertEquals(0, CliRun.withoutSpark("plan", "--no-sample", "--fresh", file.toString())
        .exitCode());
  }

  @Test
  void aDefaultBlockShapeChangedByTheMemoryKeepsTheEarlierRunsShapeWithANote()
      throws IOException {
    Path wide = dir.resolve("wide.zarr");
    TestContainers.withAffinities(wide, StorageFormat.ZARR, new long[] {24, 40, 84}, CHUNKS,
        TestContainers.OFFSETS_ZYX);
    String container = "{\"input\": {\"container\": \"" + wide + "\"}, \"blocks\":"
        + " {\"memoryPerTask\": ";
    Path file = config("wide.json", container + "\"1g\"}}");
    int[] first;
    try (PreparedRun run = RunLoader.prepare(file, null, false)) {
      first = run.settings().blockShape();
      assertEquals(BlockShapeOrigin.CHOSEN, run.settings().blockOrigin().source());
    }
    // 1 KiB per task holds not even one chunk with its halo: the default would be one chunk.
    Files.writeString(file, container + "1024}}");
    Assumptions.assumeFalse(Arrays.equals(first, new int[] {14, 10, 6}),
        "on this many cores the 1g default is one chunk too");
    CliRun plan = CliRun.withoutSpark("plan", "--no-sample", file.toString());
    assertEquals(0, plan.exitCode(), plan.err());
    assertTrue(plan.out().contains("note       blocks.shape is not set: keeping "), plan.out());
    assertTrue(plan.out().contains("the default for this configuration and memory would be"
        + " [6, 10, 14]"), plan.out());
    assertTrue(plan.out().contains("shape kept from the earlier run in the work dir"), plan.out());
    try (PreparedRun again = RunLoader.prepare(file, null, false)) {
      assertArrayEquals(first, again.settings().blockShape());
      assertTrue(again.notes().get(0).startsWith("blocks.shape is not set: keeping"),
          again.notes().toString());
    }
    CliRun fresh = CliRun.withoutSpark("plan", "--no-sample", "--fresh", file.toString());
    assertEquals(0, fresh.exitCode(), fresh.err());
    assertTrue(fresh.out().contains("blocks     shape [6, 10, 14]"), fresh.out());
    assertTrue(fresh.out().contains("limited by the memory per task"), fresh.out());
  }

  @Test
  void planRefusesAWorkDirThatAnotherRunHolds() throws IOException {
    Path file = config("run.json", basic(""));
    try (PreparedRun first = RunLoader.prepare(file, null, false)) {
      CliRun plan = CliRun.withoutSpark("plan", "--no-sample", file.toString());
      assertEquals(ErrorKind.CONFLICT.exitCode(), plan.exitCode(), plan.err());
      assertTrue(plan.err().contains("pid " + ProcessHandle.current().pid()), plan.err());
    }
  }

  // ------------------------------------------------------------ --work-dir, --ignore-background

  @Test
  void everyCommandThatUsesAWorkDirTakesWorkDir() throws IOException {
    Path file = config("run.json", basic(""));
    Path inside = input.resolve("work");
    for (List<String> args : List.of(List.of("run", file.toString()),
        List.of("plan", "--no-sample", file.toString()),
        List.of("stage", "partition", file.toString()))) {
      List<String> all = new java.util.ArrayList<>(args);
      all.addAll(List.of("--work-dir", inside.toString()));
      CliRun run = CliRun.withoutSpark(all.toArray(String[]::new));
      assertEquals(ErrorKind.INVALID_CONFIG.exitCode(), run.exitCode(), run.err());
      assertTrue(run.err().contains("workDir: " + inside + " is inside the input container"),
          run.err());
    }
    assertTrue(CliRun.withoutSpark("evaluate", "--help").out().contains("--work-dir"));
  }

  @Test
  void ignoreBackgroundMatchesTheConfigurationKeyAndTheOldSpellingPointsToIt() {
    CliRun old = CliRun.withoutSpark("evaluate", "--segmentation", "a.zarr:s", "--truth",
        "a.zarr:t", "--keep-background");
    assertEquals(ErrorKind.INVALID_CONFIG.exitCode(), old.exitCode(), old.err());
    assertTrue(old.err().contains("use --ignore-background=false"), old.err());
    CliRun renamed = CliRun.withoutSpark("evaluate", "--segmentation",
        dir.resolve("none.zarr") + ":s", "--truth", dir.resolve("none.zarr") + ":t",
        "--ignore-background=false", "--master", "local[1]");
    // Accepted as an option: it fails only on the missing containers.
    assertEquals(ErrorKind.INVALID_INPUT.exitCode(), renamed.exitCode(), renamed.err());
    String help = CliRun.withoutSpark("evaluate", "--help").out();
    assertTrue(help.contains("--ignore-background") && help.contains("evaluate.ignoreBackground")
        && !help.contains("--keep-background"), help);
  }

  // ------------------------------------------------------------ labelled times, demo reuse

  @Test
  void stageTimesAreLabelled() {
    String line = new StageReport(Stage.PARTITION, 8, 3, 5, 0.39).line();
    assertEquals("partition 8 tasks (3 skipped, 5 run)  in 0.39 s", line);
  }

  /** Stops a command where it would start Spark, with an error of its own. */
  private static final SparkContextSource NO_SPARK = new SparkContextSource() {
    @Override
    public JavaSparkContext open(String defaultMaster) {
      throw new SunderException(ErrorKind.INTERNAL, "this test starts no Spark");
    }

    @Override
    public void release(JavaSparkContext context) {}
  };

  @Test
  void theDemoSaysWhenItReusesItsVolume() {
    Path demo = dir.resolve("demo");
    CliRun first = CliRun.with(NO_SPARK, "demo", "--dir", demo.toString(), "--shape", "8,16,16");
    assertTrue(first.out().contains("demo: preparing a synthetic volume in "
        + demo.resolve("volume.zarr")), first.out());
    assertTrue(first.err().contains("this test starts no Spark"), first.err());
    CliRun second = CliRun.with(NO_SPARK, "demo", "--dir", demo.toString(), "--shape", "8,16,16");
    assertTrue(second.out().contains("demo: reusing the synthetic volume in "
        + demo.resolve("volume.zarr")), second.out());
    assertFalse(second.out().contains("preparing"), second.out());
  }

  // ------------------------------------------------------------ plan's figures

  @Test
  void planDurationsAreReadableAndWallTimeIsAtLeastTheLongestTask() {
    // 75838814.5 s of work: 877 days and 18 hours (75838814.5 / 3600 = 21066.3 h).
    assertEquals("877 d 18 h", RunPlan.duration(75_838_814.5));
    assertEquals("21 h 4 min", RunPlan.duration(21 * 3600 + 4 * 60 + 10));
    assertEquals("3 min 5 s", RunPlan.duration(185));
    assertEquals("0.39 s", RunPlan.duration(0.39));
    // One task of 100 s on 8 cores takes 100 s, not 12.5 s.
    String one = RunPlan.estimate("partition", 1, 100, 8);
    assertTrue(one.contains("about 1 min 40 s of work, 1 min 40 s on 8 cores (1 task of"), one);
    // 9 tasks of 10 s on 4 cores: three rounds, 30 s.
    String nine = RunPlan.estimate("seams", 9, 10, 4);
    assertTrue(nine.startsWith("seams      about"), nine);
    assertTrue(nine.contains("about 1 min 30 s of work, 30.0 s on 4 cores (9 tasks of about"
        + " 10.0 s, 3 rounds)"), nine);
    assertEquals("1 block", RunPlan.count(1, "block"));
    assertEquals("2 blocks", RunPlan.count(2, "block"));
  }

  @Test
  void planOfOneBlockSaysSoAndShowsTheSampleBlocksPosition() throws IOException {
    Path one = config("one.json", "{\"input\": {\"container\": \"" + input + "\"},"
        + " \"blocks\": {\"shape\": [12, 20, 28]}}");
    CliRun plan = CliRun.withoutSpark("plan", "--cores", "4", one.toString());
    assertEquals(0, plan.exitCode(), plan.err());
    String out = plan.out();
    assertTrue(out.contains("grid [1, 1, 1] = 1 block\n"), out);
    assertTrue(out.contains("partition 1, seams 0, solve 1 (driver), relabel 1 (8 chunks)"), out);
    assertTrue(out.contains("sample block at grid [0, 0, 0], voxels z 0..11, y 0..19, x 0..27"
        + " (zyx)"), out);
    Matcher wall = Pattern.compile("about (.+) of work, (.+) on 4 cores \\(1 task").matcher(out);
    assertTrue(wall.find(), out);
    assertEquals(wall.group(1), wall.group(2), "one task: the wall time is the task's time");
    Path xyz = config("xyz.json", "{\"axes\": \"xyz\", \"input\": {\"container\": \"" + input
        + "\", \"offsets\": [[0, 0, -1], [0, -1, 0], [-1, 0, 0], [0, -3, 0], [-4, 0, 0]]},"
        + " \"blocks\": {\"shape\": [14, 10, 6]}}");
    CliRun plan2 = CliRun.withoutSpark("plan", xyz.toString());
    assertEquals(0, plan2.exitCode(), plan2.err());
    // Grid [2, 2, 2]: the central block is at 1 along each axis, listed x first.
    assertTrue(plan2.out().contains("sample block at grid [1, 1, 1], voxels x 14..27, y 10..19,"
        + " z 6..11 (xyz)"), plan2.out());
    assertTrue(plan2.out().contains("= 8 blocks"), plan2.out());
  }
}
