package org.sunder.spark.cli;

import java.util.regex.Pattern;
import org.apache.spark.SparkConf;
import org.sunder.spark.config.ConfigException;
import picocli.CommandLine.Option;

/** Options shared by the commands that start Spark. */
final class SparkOptions {
  /** The master URLs Spark itself understands (local modes, standalone, YARN, Kubernetes). */
  private static final Pattern MASTER = Pattern.compile("local(\\[(\\*|[1-9][0-9]*)"
      + "(,[0-9]+)?\\])?|local-cluster\\[[1-9][0-9]*,[1-9][0-9]*,[1-9][0-9]*\\]"
      + "|spark://[^/\\s:]+:[0-9]+(,[^/\\s:]+:[0-9]+)*|yarn|k8s://\\S+");

  @Option(names = "--master", paramLabel = "URL", defaultValue = "local[*]",
      description = "Spark master when none is set by spark-submit (default: ${DEFAULT-VALUE},"
          + " all cores of this machine).")
  String master;

  /**
   * Refuses a master URL Spark would not understand, before anything is written: the one
   * spark-submit set ({@code spark.master}), else {@code --master}.
   */
  void requireValid() {
    SparkConf conf = new SparkConf();
    boolean fromSubmit = conf.contains("spark.master");
    String effective = fromSubmit ? conf.get("spark.master") : master;
    if (!valid(effective)) {
      throw new ConfigException((fromSubmit ? "spark.master" : "--master") + ": '" + effective
          + "' is not a Spark master URL; expected local, local[N], local[*], spark://HOST:PORT,"
          + " yarn or k8s://HOST:PORT");
    }
  }

  static boolean valid(String url) {
    return url != null && MASTER.matcher(url).matches();
  }
}
