package org.sunder.spark.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;

/**
 * Opens a page in Debian's headless Chromium ({@code /usr/bin/chromium}, package
 * {@code chromium}, which {@code .ci/run} installs): the DOM after the page's scripts ran, and a
 * screenshot. Locally a missing browser skips the test; under CI ({@code CI=true}) it fails.
 */
final class HeadlessChromium {
  static final Path BROWSER = Path.of("/usr/bin/chromium");

  private HeadlessChromium() {}

  static void require() {
    if (!Files.isExecutable(BROWSER)) {
      String message = BROWSER + " is not installed (Debian package chromium; .ci/run installs it)";
      if ("true".equalsIgnoreCase(System.getenv("CI"))) {
        fail(message);
      }
      Assumptions.abort(message);
    }
  }

  /** The DOM of {@code page} once loaded (scripts ran within 10 s of virtual time). */
  static String dumpDom(Path page) {
    return run(page, "--dump-dom", "--virtual-time-budget=10000");
  }

  /** Writes a PNG screenshot of {@code page} at the given window size. */
  static void screenshot(Path page, Path png, int width, int height) {
    run(page, "--screenshot=" + png.toAbsolutePath(), "--window-size=" + width + "," + height,
        "--hide-scrollbars", "--virtual-time-budget=10000");
  }

  private static String run(Path page, String... options) {
    Path profile = tempDir();
    List<String> command = new ArrayList<>(List.of(BROWSER.toString(), "--headless",
        "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage", "--no-first-run",
        "--user-data-dir=" + profile));
    command.addAll(List.of(options));
    command.add(page.toAbsolutePath().toUri().toString());
    try {
      Path out = Files.createTempFile("sunder-chromium", ".out");
      Path err = Files.createTempFile("sunder-chromium", ".err");
      Process process = new ProcessBuilder(command).redirectOutput(out.toFile())
          .redirectError(err.toFile()).start();
      if (!process.waitFor(3, TimeUnit.MINUTES)) {
        process.destroyForcibly();
        fail("chromium did not finish within 3 minutes: " + command);
      }
      String stdout = Files.readString(out, StandardCharsets.UTF_8);
      String stderr = Files.readString(err, StandardCharsets.UTF_8);
      Files.deleteIfExists(out);
      Files.deleteIfExists(err);
      assertEquals(0, process.exitValue(), () -> "chromium failed: " + command + "\n" + stderr);
      return stdout;
    } catch (IOException e) {
      throw new IllegalStateException("cannot run " + BROWSER, e);
    } catch (InterruptedException e) {
      Thread.currentThread().interrupt();
      throw new IllegalStateException("interrupted while running " + BROWSER, e);
    } finally {
      deleteTree(profile);
    }
  }

  private static void deleteTree(Path root) {
    try (java.util.stream.Stream<Path> paths = Files.walk(root)) {
      for (Path p : paths.sorted(java.util.Comparator.reverseOrder()).toList()) {
        Files.deleteIfExists(p);
      }
    } catch (IOException e) {
      // a browser helper may still be closing a file; the folder is in the temp dir
    }
  }

  private static Path tempDir() {
    try {
      return Files.createTempDirectory("sunder-chromium-profile");
    } catch (IOException e) {
      throw new IllegalStateException("cannot create a browser profile folder", e);
    }
  }
}
