package org.sunder.spark.it;

import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.spark.SparkSetup;

/** The one Spark context of a test class, configured as the command line configures it. */
public final class SharedSpark {
  private SharedSpark() {}

  public static JavaSparkContext start(String master) {
    JavaSparkContext sc = new JavaSparkContext(
        SparkSetup.configure(new SparkConf(), master, "sunder-test"));
    sc.setLogLevel("WARN");
    return sc;
  }
}
