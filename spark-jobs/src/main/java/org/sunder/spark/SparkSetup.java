package org.sunder.spark;

import org.apache.spark.SparkConf;
import org.sunder.spark.kryo.SunderKryoRegistrator;

/**
 * The Spark settings every Sunder run uses: Kryo with Sunder's registrator and registration
 * required, Spark's own console progress bar off (Sunder prints its own), and a local master
 * when none was given (as under {@code spark-submit}).
 */
public final class SparkSetup {
  private SparkSetup() {}

  /** Applies Sunder's settings to {@code conf} and returns it. */
  public static SparkConf configure(SparkConf conf, String defaultMaster, String appName) {
    if (!conf.contains("spark.master")) {
      conf.setMaster(defaultMaster);
    }
    if (!conf.contains("spark.app.name")) {
      conf.setAppName(appName);
    }
    kryo(conf);
    conf.set("spark.ui.showConsoleProgress", "false");
    if (conf.get("spark.master").startsWith("local") && !conf.contains("spark.ui.enabled")) {
      conf.set("spark.ui.enabled", "false");
    }
    return conf;
  }

  /** Only the serializer settings (also used to read and write task records). */
  public static SparkConf kryo(SparkConf conf) {
    return SunderKryoRegistrator.configure(conf);
  }
}
