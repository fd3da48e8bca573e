package org.sunder.spark.it;

import org.apache.spark.SparkConf;
import org.apache.spark.api.java.JavaSparkContext;
import org.junit.jupiter.api.extension.AfterAllCallback;
import org.junit.jupiter.api.extension.BeforeAllCallback;
import org.junit.jupiter.api.extension.ExtensionContext;
import org.sunder.spark.SparkContextSource;
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

  /**
   * The context as a JUnit extension of a test class ({@code @RegisterExtension static}): started
   * before the class's own {@code @BeforeAll} methods, stopped after its {@code @AfterAll} ones.
   */
  public static PerClass perClass(String master) {
    return new PerClass(master);
  }

  /** See {@link #perClass}. */
  public static final class PerClass implements BeforeAllCallback, AfterAllCallback {
    private final String master;
    private JavaSparkContext sc;

    private PerClass(String master) {
      this.master = master;
    }

    /** The running context. */
    public JavaSparkContext context() {
      return sc;
    }

    /** The running context as the command line's source of contexts. */
    public SparkContextSource source() {
      return SparkContextSource.shared(sc);
    }

    @Override
    public void beforeAll(ExtensionContext context) {
      sc = start(master);
    }

    @Override
    public void afterAll(ExtensionContext context) {
      sc.stop();
    }
  }
}
