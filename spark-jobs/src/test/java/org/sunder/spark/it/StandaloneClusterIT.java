package org.sunder.spark.it;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.function.BooleanSupplier;
import java.util.jar.JarFile;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import net.imglib2.FinalInterval;
import org.apache.spark.api.java.JavaSparkContext;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sunder.blockwise.store.Container;
import org.sunder.blockwise.store.Dataset;
import org.sunder.blockwise.store.StorageFormat;
import org.sunder.blockwise.store.codec.CodecSpec;
import org.sunder.blockwise.synth.Degradation;
import org.sunder.blockwise.synth.ScenarioOptions;
import org.sunder.blockwise.synth.SynthSpec;
import org.sunder.blockwise.synth.SyntheticScenario;
import org.sunder.spark.SparkContextSource;
import org.sunder.spark.cli.CliRun;
import org.sunder.spark.stage.TaskHooks;
import org.sunder.spark.workdir.Stage;
import org.sunder.spark.workdir.WorkDir;

/**
 * A real Spark standalone cluster on 127.0.0.1 (one master, two workers of one core each, all
 * separate JVMs) runs the shaded jar through Spark's own submit entry point; one worker and its
 * executor are SIGKILLed inside the partition stage, as when a machine is lost. The run must
 * finish with exit 0 and the same output bytes as a local-mode run.
 *
 * <p>The cluster's class path is a Spark distribution's: a {@code SPARK_HOME/jars} made of
 * Spark and its dependencies only (our modules, imglib2, picocli and xz left out, so executors
 * get them from the shaded jar alone) with the lz4-java version Spark ships. The input is
 * lz4-compressed, so executors decode it with Spark's lz4 classes (loaded first) under our
 * codec: a clash between the jar and Spark shows as a failed run. The executors' class-loading
 * logs must show lz4-java's classes coming from Spark's jar and our codec from the shaded jar.
 *
 * <p>Runs with failsafe after {@code package} ({@code mvn verify}), which builds the jar and
 * passes its path as {@code sunder.shadedJar}; the processes' logs go to {@code
 * sunder.itLogDir} ({@code target/standalone-cluster-it}).
 */
class StandaloneClusterIT {
  private static final int[] CHUNK_XYZ = {32, 28, 10};
  private static final int BLOCKS = 8;
  private static final String MWS = "{\"method\": \"mutex-watershed\"}";
  private static final long DELAY_MILLIS = 300;
  /** Our lz4 codec (package-private in blockwise), which executors must load from the jar. */
  private static final String LZ4_CODEC = "org.sunder.blockwise.store.codec.Lz4Codec";
  /** Class path entries that are not part of a Spark distribution. */
  private static final List<String> NOT_SPARK = List.of("/org/sunder/", "/net/imglib2/",
      "/info/picocli/", "/org/tukaani/", "/org/junit/", "/org/opentest4j/", "/org/apiguardian/",
      "/at/yawk/lz4/", "/surefire", "/failsafe");

  private static final List<Process> CHILDREN = new ArrayList<>();

  @TempDir
  static Path dir;

  @AfterAll
  static void killChildren() throws InterruptedException, IOException {
    for (Process p : CHILDREN) {
      p.descendants().forEach(ProcessHandle::destroyForcibly);
      p.destroyForcibly();
    }
    for (Process p : CHILDREN) {
      p.waitFor(30, TimeUnit.SECONDS);
    }
    Path jars = dir.resolve("spark-home/jars");
    if (Files.isDirectory(jars)) { // the links, before JUnit warns about each
      try (Stream<Path> links = Files.list(jars)) {
        for (Path link : links.toList()) {
          Files.delete(link);
        }
      }
    }
  }

  @Test
  void aLostWorkerInThePartitionStageLeavesTheOutputOfALocalRun() throws Exception {
    String jarProperty = System.getProperty("sunder.shadedJar");
    assertNotNull(jarProperty, "sunder.shadedJar is unset: run through 'mvn verify' (failsafe)");
    Path jar = Path.of(jarProperty);
    assertTrue(Files.isRegularFile(jar), "no shaded jar at " + jar + ": run 'mvn verify'");
    Path sparkLz4 = Path.of(System.getProperty("sunder.sparkLz4Jar", ""));
    assertTrue(Files.isRegularFile(sparkLz4), "no Spark lz4-java jar at " + sparkLz4);
    List<String> addOpens = Arrays.asList(System.getProperty("sunder.addOpens", "").trim()
        .split("\\s+"));
    assertTrue(addOpens.get(0).startsWith("--add-opens"), "sunder.addOpens unset: " + addOpens);
    assertShaded(jar, "net/imglib2/img/array/ArrayImg.class", "picocli/CommandLine.class",
        "org/sunder/blockwise/store/codec/Lz4Codec.class");

    Path sparkHome = sparkHome(dir.resolve("spark-home"), sparkLz4);
    Path logs = Files.createDirectories(Path.of(System.getProperty("sunder.itLogDir",
        dir.resolve("logs").toString())));
    try (Stream<Path> old = Files.list(logs)) {
      for (Path file : old.toList()) {
        Files.delete(file);
      }
    }
    int masterPort = freePort();
    String masterUrl = "spark://127.0.0.1:" + masterPort;
    Path masterLog = logs.resolve("master.log");
    start(sparkHome, addOpens, List.of("org.apache.spark.deploy.master.Master",
        "--host", "127.0.0.1", "--port", String.valueOf(masterPort), "--webui-port", String.valueOf(freePort())), masterLog);
    Process[] workers = new Process[2];
    Path[] workDirs = new Path[2];
    for (int i = 0; i < 2; i++) {
      workDirs[i] = Files.createDirectories(dir.resolve("worker-" + i));
      workers[i] = start(sparkHome, addOpens, List.of("org.apache.spark.deploy.worker.Worker",
          "--host", "127.0.0.1", "--webui-port", String.valueOf(freePort()), "--cores", "1",
          "--memory", "768m", "--work-dir", workDirs[i].toString(), masterUrl),
          logs.resolve("worker-" + i + ".log"));
    }
    Path localRun = writeLz4Scene(dir.resolve("local"));
    Path clusterRun = writeLz4Scene(dir.resolve("cluster"));
    JavaSparkContext sc = SharedSpark.start("local[2]");
    CliRun local;
    try {
      local = CliRun.with(SparkContextSource.shared(sc), "run",
          localRun.resolve("run.json").toString());
    } finally {
      sc.stop();
    }
    assertEquals(0, local.exitCode(), local.err());
    List<String> reference = Scenes.chunkFiles(localRun.resolve("scene.n5/segmentation"));
    assertFalse(reference.isEmpty());

    waitUntil(() -> workersRegisteredWithLeader(read(masterLog)) == 2, 60,
        "two workers registered", masterLog);

    long t0 = System.nanoTime();
    Path submitLog = logs.resolve("submit.log");
    Process submit = start(sparkHome, addOpens, List.of("-Xmx1g",
        "org.apache.spark.deploy.SparkSubmit", "--master", masterUrl,
        "--deploy-mode", "client", "--class", "org.sunder.spark.cli.SunderCli",
        "--conf", "spark.executor.memory=512m",
        "--conf", "spark.executor.extraJavaOptions=" + String.join(" ", addOpens)
            + " -Xlog:class+load=info:file=" + logs.resolve("executor-classes-%p.log"),
        "--conf", "spark.driver.host=127.0.0.1", "--conf", "spark.ui.enabled=false",
        "--conf", TaskHooks.DELAY_KEY + "=" + DELAY_MILLIS,
        jar.toString(), "run", clusterRun.resolve("run.json").toString()), submitLog);
    WorkDir work = new WorkDir(clusterRun.resolve("scene.n5.sunder-work/segmentation"));
    waitUntil(() -> work.ledger(Stage.PARTITION).finished().cardinality() >= 1
        && hasExecutorDir(workDirs[1]), 60, "a finished partition task", submitLog);
    List<ProcessHandle> executors = workers[1].descendants().toList();
    int doneAtKill = work.ledger(Stage.PARTITION).finished().cardinality();
    workers[1].destroyForcibly();
    executors.forEach(ProcessHandle::destroyForcibly);
    double killedAt = seconds(t0);
    System.out.printf("%.1f s: SIGKILLed worker 1 (pid %d) and its %d executor process(es);"
        + " partition tasks finished: %d of %d%n", killedAt, workers[1].pid(), executors.size(),
        doneAtKill, BLOCKS);
    assertTrue(doneAtKill < BLOCKS, "the kill came after the partition stage");
    assertFalse(executors.isEmpty(), "worker 1 ran no executor");

    if (!submit.waitFor(90, TimeUnit.SECONDS)) {
      fail("the submitted run did not finish in 90 s:\n" + read(submitLog));
    }
    System.out.printf("%.1f s: the submitted run ended with exit code %d%n", seconds(t0),
        submit.exitValue());
    String out = read(submitLog);
    assertEquals(0, submit.exitValue(), out);
    assertTrue(out.contains("Lost executor"), "the driver never lost an executor:\n" + out);
    assertEquals(reference, Scenes.chunkFiles(clusterRun.resolve("scene.n5/segmentation")),
        "cluster output bytes differ from the local run");
    String loaded = executorClassLoads(logs);
    assertTrue(loaded.lines().anyMatch(l -> l.contains("net.jpountz.lz4.LZ4BlockInputStream ")
        && l.contains(sparkLz4.getFileName().toString())),
        "no executor decoded lz4 with Spark's lz4-java " + sparkLz4.getFileName());
    assertTrue(loaded.lines().anyMatch(l -> l.contains(LZ4_CODEC + " ")
        && l.contains(jar.getFileName().toString())),
        "no executor loaded " + LZ4_CODEC + " from the shaded jar");
    assertFalse(loaded.lines().anyMatch(l -> l.contains("net.jpountz.")
        && l.contains(jar.getFileName().toString())),
        "an executor loaded lz4-java classes from the shaded jar, not Spark's");
    System.out.println("executors: lz4 classes from " + sparkLz4.getFileName() + ", "
        + "our lz4 codec" + " from " + jar.getFileName());
    System.out.println("driver: " + out.lines().filter(l -> l.contains("Lost executor")
        || l.contains("failed attempts retried")).reduce((a, b) -> b).orElse(""));
    System.out.println("output chunk files byte-identical to the local[2] run: "
        + reference.size() + " files");
  }

  /**
   * The seeded synthetic scene with its affinities and ground truth re-encoded as lz4, and a
   * configuration for it, under {@code runDir}.
   */
  private static Path writeLz4Scene(Path runDir) throws IOException {
    Container source = Container.create(runDir.resolve("source.n5"), StorageFormat.N5);
    SyntheticScenario.write(source, SynthSpec.small(13), ScenarioOptions.defaults()
        .withDegradation(Degradation.moderate(13)).withChunkShape(CHUNK_XYZ));
    Path root = runDir.resolve("scene.n5");
    Container target = Container.create(root, StorageFormat.N5);
    for (String name : List.of(SyntheticScenario.AFFINITIES, SyntheticScenario.GROUND_TRUTH)) {
      Dataset from = source.openDataset(name);
      long[] max = from.shape();
      for (int d = 0; d < max.length; d++) {
        max[d] -= 1;
      }
      Dataset to = target.createDataset(name, from.spec().withCodec(CodecSpec.lz4()));
      to.write(from.read(new FinalInterval(new long[max.length], max)), new long[max.length]);
      Map<String, Object> attributes = source.readAttributes(name);
      target.mergeAttributes(name, attributes);
    }
    assertEquals("lz4", Container.open(root).openDataset(SyntheticScenario.AFFINITIES).spec()
        .codec().name());
    Scenes.writeConfig(runDir.resolve("run.json"), root, CHUNK_XYZ, MWS, null);
    return runDir;
  }

  /** A Spark distribution's layout: {@code jars/} with Spark and its dependencies. */
  private static Path sparkHome(Path home, Path sparkLz4) throws IOException {
    Path jars = Files.createDirectories(home.resolve("jars"));
    for (String entry : System.getProperty("java.class.path").split(java.io.File.pathSeparator)) {
      Path p = Path.of(entry);
      if (entry.endsWith(".jar") && Files.isRegularFile(p)
          && NOT_SPARK.stream().noneMatch(entry::contains)
          && !entry.contains("/target/")) {
        Files.createSymbolicLink(jars.resolve(p.getFileName()), p.toAbsolutePath());
      }
    }
    Files.createSymbolicLink(jars.resolve(sparkLz4.getFileName()), sparkLz4.toAbsolutePath());
    return home;
  }

  private static void assertShaded(Path jar, String... entries) throws IOException {
    try (JarFile file = new JarFile(jar.toFile())) {
      for (String entry : entries) {
        assertNotNull(file.getEntry(entry), jar + " lacks " + entry);
      }
    }
  }

  /** Starts a JVM on the distribution's class path; it is killed after the class. */
  private static Process start(Path sparkHome, List<String> addOpens, List<String> args,
      Path log) throws IOException {
    List<String> command = new ArrayList<>();
    command.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
    command.add("-Xmx512m");
    command.addAll(addOpens);
    command.add("-cp");
    command.add(sparkHome.resolve("jars") + "/*");
    command.addAll(args);
    ProcessBuilder builder = new ProcessBuilder(command).redirectErrorStream(true)
        .redirectOutput(log.toFile());
    builder.environment().put("SPARK_HOME", sparkHome.toString());
    builder.environment().put("SPARK_LOCAL_IP", "127.0.0.1");
    builder.environment().put("SPARK_SCALA_VERSION", "2.13");
    Process process = builder.start();
    CHILDREN.add(process);
    return process;
  }

  /** The class-loading logs of every executor, one text. */
  private static String executorClassLoads(Path logs) throws IOException {
    StringBuilder all = new StringBuilder();
    try (Stream<Path> files = Files.list(logs)) {
      for (Path file : files.filter(f -> f.getFileName().toString()
          .startsWith("executor-classes-")).sorted().toList()) {
        all.append(read(file));
      }
    }
    return all.toString();
  }

  private static boolean hasExecutorDir(Path workerDir) {
    try (Stream<Path> apps = Files.list(workerDir)) {
      return apps.anyMatch(Files::isDirectory);
    } catch (IOException e) {
      return false;
    }
  }

  private static void waitUntil(BooleanSupplier condition, int seconds, String what, Path log)
      throws InterruptedException {
    long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(seconds);
    while (!condition.getAsBoolean()) {
      if (System.nanoTime() > deadline) {
        fail("not reached in " + seconds + " s: " + what + "\n" + read(log));
      }
      Thread.sleep(50);
    }
  }

  private static int freePort() throws IOException {
    try (ServerSocket socket = new ServerSocket(0)) {
      return socket.getLocalPort();
    }
  }

  /**
   * Distinct workers the master registered once it led: a worker that asks before the master
   * is elected leader is turned away and asks again, so its first line does not count.
   */
  private static int workersRegisteredWithLeader(String masterLog) {
    int leader = masterLog.indexOf("elected leader");
    if (leader < 0) {
      return 0;
    }
    Set<String> workers = new HashSet<>();
    Matcher m = Pattern.compile("Registering worker (\\S+)")
        .matcher(masterLog.substring(leader));
    while (m.find()) {
      workers.add(m.group(1));
    }
    return workers.size();
  }

  private static double seconds(long since) {
    return (System.nanoTime() - since) / 1e9;
  }

  private static String read(Path log) {
    try {
      return Files.readString(log, StandardCharsets.UTF_8);
    } catch (IOException e) {
      return "(no output: " + e + ")";
    }
  }
}
