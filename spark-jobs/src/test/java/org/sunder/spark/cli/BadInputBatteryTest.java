package org.sunder.spark.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import java.util.zip.GZIPOutputStream;
import net.imglib2.img.array.ArrayImgs;
import org.apache.spark.api.java.JavaSparkContext;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.ErrorKind;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.DataType;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.DatasetSpec;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.it.SharedSpark;
import org.sunder.spark.run.PreparedRun;
import org.sunder.spark.run.RunLoader;
import org.sunder.spark.stage.TaskHooks;
import org.sunder.spark.workdir.WorkDirLock;

/**
 * What a new user runs into, one case each: the exit code of {@link ExitCodes#TABLE}, a message
 * naming the file, key or value at fault, no stack trace on stderr, and every input and earlier
 * output byte for byte as it was (SHA-256 of every file before and after). Cases that need a
 * running pipeline share one local Spark context; the work dir lock and the terminal output of
 * failed tasks are tried with real child processes.
 */
class BadInputBatteryTest {
  private static final long[] VOLUME = {12, 20, 28};
  private static final int[] CHUNKS = {6, 10, 14};
  /**
   * A run whose partition is one task, for runs that fail inside a task: Spark cancels a failed
   * job's other tasks asynchronously, and its status tracker can report them finished while they
   * still write into the temporary folder.
   */
  private static final String ONE_BLOCK = ", \"blocks\": {\"shape\": [12, 20, 28]}";
  private static JavaSparkContext spark;

  @TempDir
  Path dir;
  private Path input;

  @BeforeEach
  void scene() {
    input = dir.resolve("v.zarr");
    Container c = org.sunder.spark.run.TestContainers.withAffinities(input, StorageFormat.ZARR,
        VOLUME, CHUNKS, org.sunder.spark.run.TestContainers.OFFSETS_ZYX);
    org.sunder.spark.run.TestContainers.labels(c, "labels", VOLUME, CHUNKS);
  }

  @AfterAll
  static void stopSpark() {
    if (spark != null) {
      spark.stop();
      spark = null;
    }
  }

  private static JavaSparkContext spark() {
    if (spark == null) {
      spark = SharedSpark.start("local[2]");
    }
    return spark;
  }

  private Path config(String json) throws IOException {
    Path file = dir.resolve("run.json");
    Files.writeString(file, json);
    return file;
  }

  private String basic(String extra) {
    return "{\"input\": {\"container\": \"" + input + "\"}" + extra + "}";
  }

  /** SHA-256 of every file under {@code root} (the configuration and logs left out). */
  static Map<String, String> checksums(Path root) throws IOException {
    Map<String, String> sums = new TreeMap<>();
    try (Stream<Path> walk = Files.walk(root)) {
      for (Path p : walk.filter(Files::isRegularFile).toList()) {
        String name = p.getFileName().toString();
        if (!name.equals("run.json") && !name.endsWith(".log")) {
          sums.put(root.relativize(p).toString(), sha256(Files.readAllBytes(p)));
        }
      }
    } catch (java.io.UncheckedIOException e) {
      throw e.getCause();
    }
    return sums;
  }

  private static String sha256(byte[] bytes) {
    try {
      return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes));
    } catch (NoSuchAlgorithmException e) {
      throw new IllegalStateException(e);
    }
  }

  /** Runs the command without Spark and checks the refusal (see the class comment). */
  private CliRun refused(ErrorKind kind, List<String> args, String... expected) throws IOException {
    return refused(kind.exitCode(), null, args, expected);
  }

  private CliRun refused(int code, SparkContextSource source, List<String> args,
      String... expected) throws IOException {
    Map<String, String> before = checksums(dir);
    CliRun run = source == null ? CliRun.withoutSpark(args.toArray(String[]::new))
        : CliRun.with(source, args.toArray(String[]::new));
    assertEquals(code, run.exitCode(), run.err());
    for (String text : expected) {
      assertTrue(run.err().contains(text), () -> "expected '" + text + "' in: " + run.err());
    }
    assertFalse(run.err().contains("\tat "), "no stack trace: " + run.err());
    if (source == null) {
      assertEquals(before, checksums(dir), "nothing written or changed");
    } else {
      CliRun.awaitNoRunningTasks(spark());
      Map<String, String> after = checksums(dir);
      before.forEach((file, sum) -> assertEquals(sum, after.get(file), file + " unchanged"));
    }
    return run;
  }

  /** {@code plan --no-sample} and {@code run} both refuse the configuration. */
  private void planAndRunRefuse(ErrorKind kind, String json, String... expected)
      throws IOException {
    Path file = config(json);
    refused(kind, List.of("plan", "--no-sample", file.toString()), expected);
    refused(kind, List.of("run", file.toString()), expected);
  }

  // ------------------------------------------------------------ 1: the work dir lock

  @Test
  void aSecondRunIsRefusedWhileTheFirstHoldsTheWorkDirAndFreshDeletesNothing() throws Exception {
    Path file = config(basic(""));
    Path work = dir.resolve("v.zarr.sunder-work/segmentation");
    Path lockFile = work.resolve(WorkDirLock.FILE);
    Process child = child(List.of("-D" + TaskHooks.DELAY_KEY + "=60000"), "run", file.toString(),
        "--master", "local[1]");
    try {
      long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
      while (!(Files.isRegularFile(lockFile) && Files.readString(lockFile).contains("pid "))) {
        if (!child.isAlive() || System.nanoTime() > deadline) {
          fail("the child run did not take the lock: " + output(child));
        }
        Thread.sleep(20);
      }
      String pid = "pid " + child.pid();
      refused(ErrorKind.CONFLICT, List.of("run", file.toString()), "work dir " + work,
          "in use by another run", pid);
      refused(ErrorKind.CONFLICT, List.of("run", "--fresh", file.toString()), "in use", pid);
      refused(ErrorKind.CONFLICT, List.of("stage", "partition", file.toString()), "in use", pid);
      assertTrue(Files.isRegularFile(work.resolve("manifest.json")), "--fresh deleted nothing");
    } finally {
      child.destroyForcibly();
      child.waitFor(30, TimeUnit.SECONDS);
    }
    try (WorkDirLock lock = WorkDirLock.acquire(work)) {
      assertTrue(lock.isHeld(), "the operating system released the killed run's lock");
    }
  }

  @Test
  void inOneProcessTheLockIsExclusiveAndReleasedOnClose() throws IOException {
    Path file = config(basic(""));
    PreparedRun first = RunLoader.prepare(file, null, false);
    try {
      refused(ErrorKind.CONFLICT, List.of("run", "--fresh", file.toString()), "in use",
          "pid " + ProcessHandle.current().pid());
    } finally {
      first.close();
    }
    assertFalse(first.lock().isHeld());
    RunLoader.prepare(file, null, false).close();
  }

  // ------------------------------------------------------------ 2: output inside the input

  @Test
  void outputOrWorkDirInsideTheInputIsRefusedUpFront() throws IOException {
    planAndRunRefuse(ErrorKind.INVALID_CONFIG, basic(", \"output\": {\"container\": \""
        + input.resolve("affinities/out.zarr") + "\"}"), "output.container",
        "inside the input container " + input);
    planAndRunRefuse(ErrorKind.INVALID_CONFIG, basic(", \"output\": {\"dataset\":"
        + " \"affinities/seg\"}"), "output.dataset", "'affinities/seg'", "affinity dataset");
    planAndRunRefuse(ErrorKind.INVALID_CONFIG, basic(", \"workDir\": \""
        + input.resolve("affinities/work") + "\""), "workDir", "inside the input container");
  }

  // ------------------------------------------------------------ 3: out of memory

  @Test
  void outOfMemoryInATaskExitsWithItsOwnCodeAndAHint() throws IOException {
    Path file = config(basic(ONE_BLOCK));
    Map<String, String> inputBefore = checksums(input.resolve("affinities"));
    System.setProperty(TaskHooks.MEMORY_KEY, "partition:0");
    try {
      refused(ExitCodes.OUT_OF_MEMORY, SparkContextSource.shared(spark()),
          List.of("run", file.toString()), "out of memory", "partition task 0",
          "more memory", "blocks.shape");
    } finally {
      System.clearProperty(TaskHooks.MEMORY_KEY);
      CliRun.awaitNoRunningTasks(spark());
    }
    assertEquals(inputBefore, checksums(input.resolve("affinities")));
  }

  @Test
  void outOfMemoryIsRecognisedOnTheDriverAndInSparkText() {
    assertTrue(ExitCodes.outOfMemory(new IllegalStateException("wrap",
        new OutOfMemoryError("Java heap space"))).contains("Java heap space"));
    assertTrue(ExitCodes.outOfMemory(new RuntimeException("Job aborted: Lost task 0.3:"
        + " java.lang.OutOfMemoryError: GC overhead limit exceeded")) != null);
    assertEquals("seams task 4 ran out of memory (Java heap space)", ExitCodes.outOfMemory(
        new RuntimeException("Job aborted due to stage failure: Task 1 in stage 3.0 failed 4 times,"
        + " most recent failure: Lost task 1.3: " + org.sunder.spark.stage.TaskOutOfMemory.class
        .getName() + ": seams task 4 ran out of memory (Java heap space)\n\nDriver stacktrace:")));
    assertEquals(null, ExitCodes.outOfMemory(new RuntimeException("disk full")));
    ByteArrayOutputStream err = new ByteArrayOutputStream();
    int code = new ExitCodes(new java.io.PrintStream(err, true, StandardCharsets.UTF_8))
        .handle(new OutOfMemoryError("Java heap space"), "solve");
    assertEquals(ExitCodes.OUT_OF_MEMORY, code);
    assertFalse(err.toString(StandardCharsets.UTF_8).contains("\tat "));
  }

  // ------------------------------------------------------------ 4: blocks beyond one array

  @Test
  void aBlockOfMoreThanTwoToThe31ValuesIsRefusedUpFront() throws IOException {
    Path big = dir.resolve("big.zarr");
    Container c = Container.create(big, StorageFormat.ZARR);
    c.createDataset("affinities", DatasetSpec.of(new long[] {2000, 2000, 2000, 3},
        new int[] {100, 100, 100, 3}, DataType.FLOAT32));
    c.mergeAttributes("affinities", Map.of("offsets",
        List.of(List.of(-1, 0, 0), List.of(0, -1, 0), List.of(0, 0, -1))));
    planAndRunRefuse(ErrorKind.INVALID_CONFIG, "{\"input\": {\"container\": \"" + big + "\"},"
        + " \"blocks\": {\"shape\": [1000, 1000, 1000]}}", "blocks.shape", "[1000, 1000, 1000]",
        "[1002, 1002, 1002] voxels", "3018036024 affinity values", "2^31");
  }

  @Test
  void aPartitionTaskLargerThanTheHeapIsRefusedUpFront() throws IOException {
    Path big = dir.resolve("wide.zarr");
    Container c = Container.create(big, StorageFormat.ZARR);
    c.createDataset("affinities", DatasetSpec.of(new long[] {4000, 4000, 400, 3},
        new int[] {100, 100, 100, 3}, DataType.FLOAT32));
    c.mergeAttributes("affinities", Map.of("offsets",
        List.of(List.of(-1, 0, 0), List.of(0, -1, 0), List.of(0, 0, -1))));
    // Extended box 400 x 4000 x 402 (zyx, clipped to the volume) = 643.2 M voxels: 1.93 G
    // affinity values fit one array, but at 3 x 4 + 150 + 8 bytes per voxel, and
    // 2 x (3 x 4 + 20 + 21) for the fragments' context, the task needs about 165 GiB, more than
    // any test heap.
    planAndRunRefuse(ErrorKind.INVALID_CONFIG, "{\"input\": {\"container\": \"" + big + "\","
        + " \"missingChunks\": \"fill\"}, \"blocks\": {\"shape\": [400, 4000, 400]}}",
        "blocks.shape: a block of [400, 4000, 400] (zyx)", "643200000 voxels",
        "(276 bytes per voxel), more than the", "of this JVM's heap");
  }

  // ------------------------------------------------------------ 5, 9c: evaluate --mask

  @Test
  void evaluateRefusesAFloatMaskAndAMaskOfAnotherShape() throws IOException {
    Container c = Container.open(input);
    c.createDataset("fmask", DatasetSpec.of(new long[] {28, 20, 12}, new int[] {14, 10, 6},
        DataType.FLOAT32));
    c.createDataset("small", DatasetSpec.of(new long[] {28, 20, 6}, new int[] {14, 10, 6},
        DataType.UINT8));
    String labels = input + ":labels";
    refused(ErrorKind.INVALID_INPUT, List.of("evaluate", "--segmentation", labels, "--truth",
        labels, "--mask", input + ":fmask"), "mask 'fmask'", "float32", "uint8");
    refused(ErrorKind.INVALID_INPUT, List.of("evaluate", "--segmentation", labels, "--truth",
        labels, "--mask", input + ":small"), "mask 'small'", "[6, 20, 28]", "[12, 20, 28]",
        "slowest axis first");
  }

  // ------------------------------------------------------------ 6: master URL

  @Test
  void anInvalidMasterIsAConfigurationErrorBeforeAnythingIsWritten() throws IOException {
    Path file = config(basic(""));
    for (String master : List.of("nonsense://x", "local[x]", "spark://no-port")) {
      refused(ErrorKind.INVALID_CONFIG, List.of("run", file.toString(), "--master", master),
          "--master", "'" + master + "'", "local[*]");
    }
    refused(ErrorKind.INVALID_CONFIG, List.of("evaluate", "--segmentation", input + ":labels",
        "--truth", input + ":labels", "--master", "yarn-please"), "--master");
    for (String good : List.of("local", "local[4]", "local[*]", "local[2,3]", "yarn",
        "spark://head:7077", "spark://a:7077,b:7077", "k8s://https://api:6443",
        "local-cluster[2,1,1024]")) {
      assertTrue(SparkOptions.valid(good), good);
    }
  }

  // ------------------------------------------------------------ 7: empty volume

  @Test
  void anEmptyVolumeIsRefusedInTheConfigurationsAxisOrderBeforeAnythingIsWritten()
      throws IOException {
    Path empty = dir.resolve("empty.zarr");
    Container.create(empty, StorageFormat.ZARR);
    Files.createDirectories(empty.resolve("affinities"));
    Files.writeString(empty.resolve("affinities/.zarray"), "{\"zarr_format\": 2, \"shape\":"
        + " [3, 12, 0, 28], \"chunks\": [3, 6, 10, 14], \"dtype\": \"<f4\", \"compressor\": null,"
        + " \"fill_value\": 0, \"order\": \"C\", \"filters\": null}");
    Files.writeString(empty.resolve("affinities/.zattrs"), "{\"offsets\": [[-1, 0, 0],"
        + " [0, -1, 0], [0, 0, -1]]}");
    planAndRunRefuse(ErrorKind.INVALID_INPUT, "{\"input\": {\"container\": \"" + empty + "\"}}",
        "'affinities'", "is empty", "[12, 0, 28] (zyx)");
    planAndRunRefuse(ErrorKind.INVALID_INPUT, "{\"axes\": \"xyz\", \"input\": {\"container\": \""
        + empty + "\", \"offsets\": [[0, 0, -1], [0, -1, 0], [-1, 0, 0]]}}", "'affinities'",
        "[28, 0, 12] (xyz)");
  }

  // ------------------------------------------------------------ 8, 11: corrupt chunks

  private Path affinityChunk() {
    return Container.open(input).openDataset("affinities").chunkFile(new long[] {0, 1, 1, 0});
  }

  @Test
  void corruptInputChunksAreInvalidInputNamingTheChunkFile() throws IOException {
    Path chunk = affinityChunk();
    byte[] good = Files.readAllBytes(chunk);
    ByteArrayOutputStream gzip = new ByteArrayOutputStream();
    try (GZIPOutputStream out = new GZIPOutputStream(gzip)) {
      out.write(new byte[6 * 10 * 14 * 5 * 4]);
    }
    byte[] random = new byte[good.length];
    new Random(7).nextBytes(random);
    Map<String, byte[]> damage = new TreeMap<>(Map.of(
        "truncated", java.util.Arrays.copyOf(good, good.length / 3),
        "random bytes", random,
        "gzip where zstd is declared", gzip.toByteArray()));
    for (Map.Entry<String, byte[]> bad : damage.entrySet()) {
      Files.write(chunk, bad.getValue());
      Path file = config(basic(", \"workDir\": \"" + dir.resolve("work-" + bad.getKey().charAt(0))
          + "\", \"output\": {\"container\": \"" + dir.resolve("out-" + bad.getKey().charAt(0)
          + ".zarr") + "\"}, \"partition\": {\"method\": \"mutex-watershed\"}" + ONE_BLOCK));
      CliRun run = refused(ErrorKind.INVALID_INPUT.exitCode(), SparkContextSource.shared(spark()),
          List.of("run", file.toString()), chunk.toString(), "[0, 1, 1, 0]", "corrupt");
      assertEquals(1, run.err().lines().filter(l -> l.startsWith("sunder run:")).count(),
          bad.getKey() + ": reported once: " + run.err());
    }
  }

  @Test
  void aFailedTaskPrintsOneCleanLineAndItsTracesGoToTheLogFile() throws Exception {
    Files.write(affinityChunk(), new byte[] {1, 2, 3});
    Path file = config(basic(", \"partition\": {\"method\": \"mutex-watershed\"}"));
    Path log = dir.resolve("sunder-test.log");
    Path properties = Path.of("..", "bin", "sunder-log4j2.properties").toAbsolutePath();
    assertTrue(Files.isRegularFile(properties), properties.toString());
    Map<String, String> inputBefore = checksums(input.resolve("affinities"));
    Process child = child(List.of("-Dlog4j2.configurationFile=" + properties,
        "-D" + ExitCodes.LOG_FILE_PROPERTY + "=" + log), "run", file.toString(), "--master",
        "local[2]");
    if (!child.waitFor(90, TimeUnit.SECONDS)) {
      child.destroyForcibly();
      fail("the child run did not end: " + output(child));
    }
    String stderr = Files.readString(dir.resolve("child-err.log"));
    assertEquals(ErrorKind.INVALID_INPUT.exitCode(), child.exitValue(), stderr);
    assertFalse(stderr.contains("\tat "), "no stack trace on the terminal:\n" + stderr);
    assertFalse(stderr.contains("Exception in task"), stderr);
    List<String> lines = stderr.lines().filter(l -> l.startsWith("sunder run:")).toList();
    assertEquals(2, lines.size(), stderr);
    assertTrue(lines.get(0).contains(affinityChunk().toString()), stderr);
    assertTrue(lines.get(1).contains(log.toString()), stderr);
    String logged = Files.readString(log);
    assertTrue(logged.contains("\tat ") && logged.contains(affinityChunk().toString()),
        "the full report is in the log file:\n" + logged);
    assertEquals(inputBefore, checksums(input.resolve("affinities")));
  }

  // ------------------------------------------------------------ 9a, 9b: messages

  @Test
  void anN5DatasetWithoutDataTypeSaysWhatIsWrongWithItsAttributes() throws IOException {
    Path n5 = dir.resolve("v.n5");
    Container.create(n5, StorageFormat.N5);
    Files.createDirectories(n5.resolve("affinities"));
    Files.writeString(n5.resolve("affinities/attributes.json"), "{\"dimensions\": [28, 20, 12,"
        + " 3], \"blockSize\": [14, 10, 6, 3], \"compression\": {\"type\": \"raw\"}}");
    CliRun run = refused(ErrorKind.INVALID_INPUT, List.of("run", config("{\"input\":"
        + " {\"container\": \"" + n5 + "\"}}").toString()), "input.affinities", "'affinities'",
        "attributes.json", "'dataType'");
    assertFalse(run.err().contains("no dataset"), run.err());
  }

  @Test
  void offsetsFromTheAttributeOfA2dVolumeBlameTheAttributeInItsAxes() throws IOException {
    Path flat = dir.resolve("flat.zarr");
    Container c = Container.create(flat, StorageFormat.ZARR);
    Dataset aff = c.createDataset("affinities", DatasetSpec.of(new long[] {28, 20, 2},
        new int[] {14, 10, 2}, DataType.FLOAT32));
    aff.write(ArrayImgs.floats(28, 20, 2), new long[3]);
    c.mergeAttributes("affinities", Map.of("offsets", List.of(List.of(-1, 0, 0),
        List.of(0, -1, 0))));
    Path file = config("{\"axes\": \"yx\", \"input\": {\"container\": \"" + flat + "\"}}");
    CliRun run = refused(ErrorKind.INVALID_CONFIG, List.of("plan", "--no-sample",
        file.toString()), "offset 0 of the \"offsets\" attribute of dataset 'affinities'",
        "expected 2 integers (yx)", "give input.offsets");
    assertFalse(run.err().contains("input.offsets["), run.err());
    c.mergeAttributes("affinities", Map.of("offsets", List.of(List.of(-1, 0), List.of(0, -1)),
        "axes", "zyx"));
    refused(ErrorKind.INVALID_INPUT, List.of("plan", "--no-sample", file.toString()),
        "\"axes\" attribute of dataset 'affinities'", "\"zyx\"", "\"yx\"");
    c.mergeAttributes("affinities", Map.of("axes", "xy"));
    CliRun ok = CliRun.withoutSpark("plan", "--no-sample", file.toString());
    assertEquals(0, ok.exitCode(), ok.err());
  }

  @Test
  void resumingIntoAnOutputOfAnotherShapeNamesBothShapesInTheConfigurationsAxes()
      throws IOException {
    Path file = config("{\"axes\": \"xyz\", \"input\": {\"container\": \"" + input + "\","
        + " \"offsets\": [[0, 0, -1], [0, -1, 0], [-1, 0, 0], [0, 0, -2], [0, -2, 0]]}}");
    RunLoader.prepare(file, null, false).close();
    deleteTree(input.resolve("affinities"));
    org.sunder.spark.run.TestContainers.withAffinities(input, StorageFormat.ZARR,
        new long[] {12, 20, 14}, CHUNKS, org.sunder.spark.run.TestContainers.OFFSETS_ZYX);
    refused(ErrorKind.CONFLICT, List.of("run", file.toString()), "output dataset 'segmentation'",
        "has shape [28, 20, 12]", "now has shape [14, 20, 12]", "(xyz)", "--fresh");
  }

  private static void deleteTree(Path root) throws IOException {
    try (Stream<Path> walk = Files.walk(root)) {
      for (Path p : walk.sorted(java.util.Comparator.reverseOrder()).toList()) {
        Files.delete(p);
      }
    }
  }

  // ------------------------------------------------------------ 10: stale temporaries

  @Test
  void theNextRunRemovesTemporaryChunkFilesThatAKilledRunLeft() throws IOException {
    Path file = config(basic(""));
    RunLoader.prepare(file, null, false).close();
    Dataset out = Container.open(input).openDataset("segmentation");
    Path chunk = out.chunkFile(new long[] {1, 1, 0});
    Files.createDirectories(chunk.getParent());
    Path stale = chunk.resolveSibling("." + chunk.getFileName() + ".2x8kq0wz1m.tmp");
    Files.write(stale, new byte[] {9, 9});
    Map<String, String> inputBefore = checksums(input.resolve("affinities"));
    try (PreparedRun again = RunLoader.prepare(file, null, false)) {
      assertFalse(Files.exists(stale));
      assertTrue(again.notes().stream().anyMatch(n -> n.contains("removed 1 temporary chunk")),
          again.notes().toString());
    }
    assertEquals(inputBefore, checksums(input.resolve("affinities")));
  }

  // ------------------------------------------------------------ 12: missing chunks

  @Test
  void missingAffinityChunksAreRefusedUnlessTheConfigurationSaysFill() throws IOException {
    Path chunk = affinityChunk();
    Files.delete(chunk);
    planAndRunRefuse(ErrorKind.INVALID_INPUT, basic(""), "'affinities'", "lacks 1 of 8 chunk",
        "[1, 1, 0; channel chunk 0]", "(chunk grid position, zyx then channel)",
        "input.missingChunks");
    Path fill = config("{\"input\": {\"container\": \"" + input + "\", \"missingChunks\":"
        + " \"fill\"}}");
    CliRun ok = CliRun.withoutSpark("plan", "--no-sample", fill.toString());
    assertEquals(0, ok.exitCode(), ok.err());
    refused(ErrorKind.INVALID_CONFIG, List.of("plan", config("{\"input\": {\"container\": \""
        + input + "\", \"missingChunks\": \"zero\"}}").toString()), "input.missingChunks",
        "\"zero\"", "\"fill\"");
  }

  // ------------------------------------------------------------ the exit code table

  @Test
  void everyExitCodeIsDocumentedInTheReadmeAndTheHelp() throws IOException {
    String readme = Files.readString(Path.of("..", "README.md"));
    CliRun help = CliRun.withoutSpark("--help");
    for (ExitCodes.Code code : ExitCodes.TABLE) {
      assertTrue(readme.contains("| " + code.code() + " | " + code.meaning() + " |"),
          "README row for exit code " + code.code());
      assertTrue(help.out().replaceAll("\\s+", " ").contains(code.code() + " "
          + code.meaning()), "help for " + code.code() + ":\n" + help.out());
    }
    for (ErrorKind kind : ErrorKind.values()) {
      assertTrue(ExitCodes.TABLE.stream().anyMatch(c -> c.code() == kind.exitCode()),
          kind.name());
    }
  }

  // ------------------------------------------------------------ child processes

  /** The command line in a new JVM with this test's class path; stderr to child-err.log. */
  private Process child(List<String> properties, String... args) throws IOException {
    List<String> command = ChildCli.command("512m", properties, args);
    return new ProcessBuilder(command).redirectOutput(dir.resolve("child-out.log").toFile())
        .redirectError(dir.resolve("child-err.log").toFile()).start();
  }

  private String output(Process child) {
    try {
      return Files.readString(dir.resolve("child-out.log")) + "\n"
          + Files.readString(dir.resolve("child-err.log"));
    } catch (IOException e) {
      return "(no output: " + e + ")";
    }
  }
}
