package org.sunder.spark;

/**
 * How the user starts Sunder, for the commands that output suggests: the launcher's absolute
 * path when it said so ({@code bin/sunder} sets the system property {@value #PROPERTY}), else
 * {@code bin/sunder}, which works from the project folder.
 */
public final class Launcher {
  /** System property holding the launcher's absolute path. */
  public static final String PROPERTY = "sunder.launcher";
  /** The launcher relative to the project folder. */
  public static final String FALLBACK = "bin/sunder";

  private Launcher() {}

  /** The launcher as the user can type it, e.g. {@code /opt/sunder/bin/sunder}. */
  public static String command() {
    String path = System.getProperty(PROPERTY);
    return path == null || path.isBlank() ? FALLBACK : path;
  }
}
