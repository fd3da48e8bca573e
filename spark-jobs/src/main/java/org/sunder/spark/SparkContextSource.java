package org.sunder.spark;

import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.spark.config.ConfigException;

/**
 * Where a command gets its Spark context. The command line starts one per command (and stops
 * it); tests hand every command of a class the same context.
 */
public interface SparkContextSource {
  /** A context configured by {@link SparkSetup}; {@code defaultMaster} applies when none is set. */
  JavaSparkContext open(String defaultMaster);

  /** Called when the command is done with the context. */
  void release(JavaSparkContext context);

  /** Starts a new context per command and stops it afterwards. */
  static SparkContextSource perCommand() {
    return new SparkContextSource() {
      @Override
      public JavaSparkContext open(String defaultMaster) {
        SparkConf conf = SparkSetup.configure(new SparkConf(), defaultMaster, "sunder");
        JavaSparkContext context;
        try {
          context = new JavaSparkContext(conf);
        } catch (Exception e) { // Scala code throws SparkException without declaring it
          if (String.valueOf(e.getMessage()).contains("Master URL")) {
            throw new ConfigException("--master: Spark cannot use master '"
                + conf.get("spark.master") + "': " + e.getMessage(), e);
          }
          if (e instanceof RuntimeException runtime) {
            throw runtime;
          }
          throw new IllegalStateException("cannot start Spark: " + e.getMessage(), e);
        }
        context.setLogLevel("WARN");
        return context;
      }

      @Override
      public void release(JavaSparkContext context) {
        context.stop();
      }
    };
  }

  /** Always the given context, never stopped here. */
  static SparkContextSource shared(JavaSparkContext context) {
    return new SparkContextSource() {
      @Override
      public JavaSparkContext open(String defaultMaster) {
        return context;
      }

      @Override
      public void release(JavaSparkContext released) {
        // owned by the caller
      }
    };
  }
}
