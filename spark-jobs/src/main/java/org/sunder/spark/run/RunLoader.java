package org.sunder.spark.run;

import java.nio.file.Path;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.config.ConfigReader;
import org.sunder.spark.config.RunConfig;

/**
 * Configuration file to resolved settings to a prepared run: the first steps of every command.
 * Relative paths in the file (containers, work dir) are taken relative to the file's folder, so
 * a configuration means the same from any current directory; a {@code --work-dir} given on the
 * command line is relative to the current directory. Configuration errors found while resolving
 * name the file, as the reader's do.
 */
public final class RunLoader {
  private RunLoader() {}

  /** Reads and resolves {@code configFile}; {@code workDir} overrides the file's when not null. */
  public static RunSettings resolve(Path configFile, Path workDir) {
    RunConfig config = new ConfigReader().read(configFile);
    Path folder = configFile.toAbsolutePath().normalize().getParent();
    config = config.relativeTo(folder);
    if (workDir != null) {
      config = new RunConfig(config.axes(), config.input(), config.output(),
          workDir.toAbsolutePath().normalize().toString(), config.blocks(), config.partition(),
          config.solve(), config.evaluate());
    }
    try {
      return RunResolver.resolve(config);
    } catch (ConfigException e) {
      throw new ConfigException(configFile + ": " + e.getMessage(), e);
    }
  }

  /** Resolves and prepares the work dir and output ({@link RunPreparation}). */
  public static PreparedRun prepare(Path configFile, Path workDir, boolean fresh) {
    RunSettings settings = resolve(configFile, workDir);
    return RunPreparation.prepare(settings, fresh);
  }

  /**
   * Resolves and runs every check {@link #prepare} runs before it writes (the work dir's lock,
   * the output's and the work dir's owners), writing nothing: what {@code plan} refuses,
   * {@code run} refuses with the same message and exit code.
   */
  public static RunSettings check(Path configFile, Path workDir, boolean fresh) {
    RunSettings settings = resolve(configFile, workDir);
    RunPreparation.check(settings, fresh);
    return settings;
  }
}
