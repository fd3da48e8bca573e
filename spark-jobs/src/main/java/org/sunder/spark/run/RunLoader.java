package org.sunder.spark.run;

import java.nio.file.Path;
import org.apache.spark.SparkConf;
import org.sunder.spark.config.ConfigReader;
import org.sunder.spark.config.RunConfig;

/** Configuration file to resolved settings to a prepared run: the first steps of every command. */
public final class RunLoader {
  private RunLoader() {}

  /** Reads and resolves {@code configFile}; {@code workDir} overrides the file's when not null. */
  public static RunSettings resolve(Path configFile, Path workDir, TaskHooks hooks) {
    RunConfig config = new ConfigReader().read(configFile);
    if (workDir != null) {
      config = new RunConfig(config.axes(), config.input(), config.output(),
          workDir.toString(), config.blocks(), config.partition(), config.solve(),
          config.evaluate());
    }
    return RunResolver.resolve(config, hooks);
  }

  /** Resolves and prepares the work dir and output ({@link RunPreparation}). */
  public static PreparedRun prepare(Path configFile, Path workDir, boolean fresh) {
    RunSettings settings = resolve(configFile, workDir, TaskHooks.from(new SparkConf()));
    return RunPreparation.prepare(settings, fresh);
  }
}
