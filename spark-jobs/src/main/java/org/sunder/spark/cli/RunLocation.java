package org.sunder.spark.cli;

import java.nio.file.Path;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * The run a command works on (a picocli mixin): its configuration file, the command's next
 * positional parameter, and optionally its work dir.
 */
final class RunLocation {
  @Parameters(paramLabel = "CONFIG", description = "Run configuration (JSON)."
      + " Relative paths in it are relative to the configuration file's folder.")
  Path config;

  @Option(names = "--work-dir", paramLabel = "DIR", description = "Work dir of the run, for its"
      + " manifest and task records (default: the configuration's workDir, else <output"
      + " container>.sunder-work/<dataset>).")
  Path workDir;
}
