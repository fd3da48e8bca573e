package org.sunder.testing;

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
 * Runs a reference script with Debian's {@code /usr/bin/python3} from a JUnit test.
 *
 * <p>Reference libraries (zarr, numcodecs, scipy, scikit-image, scikit-learn) are external
 * checks: a test calls {@link #requireModules} first. Locally, a missing module skips the test
 * with a message that names it; under CI ({@code CI=true}) it fails the test, because
 * {@code .ci/run} installs every reference.
 */
public final class PythonReference {

  /** The interpreter Debian's packages install into; never a virtualenv's. */
  public static final Path PYTHON = Path.of("/usr/bin/python3");

  private PythonReference() {}

  /** Skips (locally) or fails (under CI) unless every module imports. */
  public static void requireModules(String... modules) {
    String missing = null;
    if (!Files.isExecutable(PYTHON)) {
      missing = PYTHON + " is not installed";
    } else {
      StringBuilder script = new StringBuilder("import importlib, sys\nmissing = []\n");
      for (String module : modules) {
        script.append("try:\n    importlib.import_module('").append(module)
            .append("')\nexcept Exception:\n    missing.append('").append(module).append("')\n");
      }
      script.append("print(' '.join(missing))\n");
      Result result = run(script.toString());
      if (result.exitCode() != 0) {
        missing = "python3 failed: " + result.stderr();
      } else if (!result.stdout().isBlank()) {
        missing = "python3 modules missing: " + result.stdout().strip();
      }
    }
    if (missing != null) {
      String message = missing + " (Debian packages python3-zarr python3-numcodecs python3-fsspec"
          + " python3-scipy python3-skimage python3-sklearn python3-jsonschema; .ci/run installs"
          + " them)";
      if ("true".equalsIgnoreCase(System.getenv("CI"))) {
        fail(message);
      }
      Assumptions.abort(message);
    }
  }

  /** Runs {@code script} with the given arguments; never throws for a non-zero exit. */
  public static Result run(String script, String... args) {
    try {
      Path file = Files.createTempFile("sunder-ref", ".py");
      try {
        Files.writeString(file, script, StandardCharsets.UTF_8);
        List<String> command = new ArrayList<>();
        command.add(PYTHON.toString());
        command.add(file.toString());
        command.addAll(List.of(args));
        ProcessBuilder builder = new ProcessBuilder(command);
        builder.environment().remove("PYTHONPATH");
        Path out = Files.createTempFile("sunder-ref", ".out");
        Path err = Files.createTempFile("sunder-ref", ".err");
        builder.redirectOutput(out.toFile()).redirectError(err.toFile());
        Process process = builder.start();
        if (!process.waitFor(10, TimeUnit.MINUTES)) {
          process.destroyForcibly();
          fail("python3 reference script timed out after 10 minutes");
        }
        Result result = new Result(process.exitValue(),
            Files.readString(out, StandardCharsets.UTF_8),
            Files.readString(err, StandardCharsets.UTF_8));
        Files.deleteIfExists(out);
        Files.deleteIfExists(err);
        return result;
      } finally {
        Files.deleteIfExists(file);
      }
    } catch (IOException e) {
      throw new IllegalStateException("cannot run " + PYTHON, e);
    } catch (InterruptedException e) {
      Thread.currentThread().interrupt();
      throw new IllegalStateException("interrupted while running " + PYTHON, e);
    }
  }

  /** Runs {@code script} and fails the test, showing its stderr, unless it exits 0. */
  public static String runChecked(String script, String... args) {
    Result result = run(script, args);
    assertEquals(0, result.exitCode(),
        () -> "reference script failed:\n" + result.stderr() + "\nstdout:\n" + result.stdout());
    return result.stdout();
  }

  /** What a reference script printed. */
  public record Result(int exitCode, String stdout, String stderr) {}
}
