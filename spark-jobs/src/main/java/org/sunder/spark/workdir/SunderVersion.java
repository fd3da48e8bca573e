package org.sunder.spark.workdir;

import java.io.IOException;
import java.io.InputStream;
import java.util.Properties;

/** The tool version, from the build. */
public final class SunderVersion {
  private SunderVersion() {}

  /** For example {@code 0.1.0-SNAPSHOT}; {@code unknown} outside a Maven build. */
  public static String get() {
    try (InputStream in = SunderVersion.class.getResourceAsStream("version.properties")) {
      if (in == null) {
        return "unknown";
      }
      Properties properties = new Properties();
      properties.load(in);
      return properties.getProperty("version", "unknown");
    } catch (IOException e) {
      return "unknown";
    }
  }
}
