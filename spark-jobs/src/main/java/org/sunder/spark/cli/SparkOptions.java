package org.sunder.spark.cli;

import picocli.CommandLine.Option;

/** Options shared by the commands that start Spark. */
final class SparkOptions {
  @Option(names = "--master", paramLabel = "URL", defaultValue = "local[*]",
      description = "Spark master when none is set by spark-submit (default: ${DEFAULT-VALUE},"
          + " all cores of this machine).")
  String master;
}
