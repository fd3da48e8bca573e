package org.sunder.spark.stage;

import org.sunder.spark.workdir.Stage;
import java.util.Locale;

/**
 * What one stage did in this run.
 *
 * @param total tasks of the stage
 * @param skipped tasks an earlier run had finished
 * @param ran tasks run now
 * @param seconds wall time of the stage in this run
 */
public record StageReport(Stage stage, int total, int skipped, int ran, double seconds) {
  /** For example {@code "partition  8 tasks (3 skipped, 5 run)  in 2.41 s"}. */
  public String line() {
    return String.format(Locale.ROOT, "%-9s %d tasks (%d skipped, %d run)  in %.2f s",
        stage.cliName(), total, skipped, ran, seconds);
  }
}
