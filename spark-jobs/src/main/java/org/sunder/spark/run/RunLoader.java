package org.sunder.spark.run;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Optional;
import org.apache.spark.SparkConf;
import org.sunder.blockwise.SunderException;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.config.ConfigReader;
import org.sunder.spark.config.RunConfig;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.WorkDir;

/**
 * Configuration file to resolved settings to a prepared run: the first steps of every command.
 * Relative paths in the file (containers, work dir) are taken relative to the file's folder, so
 * a configuration means the same from any current directory; a {@code --work-dir} given on the
 * command line is relative to the current directory. Configuration errors found while resolving
 * name the file, as the reader's do.
 *
 * <p>The default block shape depends on the memory and cores of the run ({@link TaskBudget}),
 * so a rerun with another heap could choose another one. A configuration without
 * {@code blocks.shape} whose work dir holds an earlier run therefore keeps that run's block shape
 * (unless {@code --fresh}), with a note; the resume check then compares everything else.
 */
public final class RunLoader {
  private RunLoader() {}

  /** Reads and resolves {@code configFile}; {@code workDir} overrides the file's when not null. */
  public static RunSettings resolve(Path configFile, Path workDir) {
    return resolve(configFile, workDir, false, 0);
  }

  /**
   * Reads and resolves {@code configFile} for a run on {@code cores} cores ({@code 0}: as the
   * Spark configuration and this machine say, {@link TaskBudget}); keeps an earlier run's block
   * shape unless {@code fresh} (see the class comment).
   */
  public static RunSettings resolve(Path configFile, Path workDir, boolean fresh, int cores) {
    RunConfig config = new ConfigReader().read(configFile);
    Path folder = configFile.toAbsolutePath().normalize().getParent();
    config = config.relativeTo(folder);
    if (workDir != null) {
      config = new RunConfig(config.axes(), config.input(), config.output(),
          workDir.toAbsolutePath().normalize().toString(), config.blocks(), config.partition(),
          config.solve(), config.evaluate());
    }
    try {
      TaskBudget budget = TaskBudget.of(new SparkConf(), cores, config.blocks().memoryPerTask());
      RunSettings settings = RunResolver.resolve(config, budget);
      return fresh || config.blocks().shape() != null ? settings
          : keepEarlierShape(config, settings, budget);
    } catch (ConfigException e) {
      throw new ConfigException(configFile + ": " + e.getMessage(), e);
    }
  }

  /**
   * {@code settings} resolved again with the block shape of the work dir's earlier run, when
   * there is one that differs from the chosen default and is still valid for the input;
   * {@code settings} otherwise (the resume check then reports whatever differs).
   */
  private static RunSettings keepEarlierShape(RunConfig config, RunSettings settings,
      TaskBudget budget) {
    Optional<int[]> earlier = earlierShape(settings);
    AxisOrder axes = new AxisOrder(settings.axes());
    int[] chosen = axes.toFile(settings.blockShape());
    if (earlier.isEmpty() || Arrays.equals(earlier.get(), chosen)) {
      return settings;
    }
    RunConfig.BlockSection blocks = config.blocks();
    RunConfig kept = new RunConfig(config.axes(), config.input(), config.output(),
        config.workDir(), new RunConfig.BlockSection(earlier.get(), blocks.halo(),
            blocks.memoryPerTask()), config.partition(), config.solve(), config.evaluate());
    RunSettings resumed;
    try {
      resumed = RunResolver.resolve(kept, budget);
    } catch (ConfigException e) {
      return settings;
    }
    BlockShapeOrigin o = resumed.blockOrigin();
    return resumed.withBlockOrigin(new BlockShapeOrigin(BlockShapeOrigin.KEPT, o.overhead(), null,
        o.bytesPerExtendedVoxel(), budget, "blocks.shape is not set: keeping "
        + Arrays.toString(earlier.get()) + " (" + axes + ") of the earlier run in the work dir"
        + " so that it can resume; the default for this configuration and memory would be "
        + Arrays.toString(chosen) + " (set blocks.shape, or use --fresh to start over with it)"));
  }

  /** The block shape (file order) in the work dir's manifest, if it has one in these axes. */
  private static Optional<int[]> earlierShape(RunSettings settings) {
    Optional<Manifest> manifest;
    try {
      manifest = new WorkDir(settings.workDirPath()).manifest();
    } catch (SunderException e) {
      return Optional.empty();
    }
    if (manifest.isEmpty() || manifest.get().config() == null) {
      return Optional.empty();
    }
    JsonNode config = manifest.get().config();
    JsonNode shape = config.path("blocks").path("shape");
    if (!settings.axes().equals(config.path("input").path("axes").asText())
        || !shape.isArray() || shape.size() != settings.blockShape().length) {
      return Optional.empty();
    }
    int[] values = new int[shape.size()];
    for (int d = 0; d < values.length; d++) {
      if (!shape.get(d).canConvertToInt()) {
        return Optional.empty();
      }
      values[d] = shape.get(d).asInt();
    }
    return Optional.of(values);
  }

  /** Resolves and prepares the work dir and output ({@link RunPreparation}). */
  public static PreparedRun prepare(Path configFile, Path workDir, boolean fresh) {
    RunSettings settings = resolve(configFile, workDir, fresh, 0);
    PreparedRun run = RunPreparation.prepare(settings, fresh);
    String note = settings.blockOrigin() == null ? null : settings.blockOrigin().note();
    if (note == null) {
      return run;
    }
    List<String> notes = new ArrayList<>(run.notes());
    notes.add(0, note);
    return new PreparedRun(run.settings(), run.workDir(), run.manifest(), notes, run.lock());
  }

  /**
   * Resolves and runs every check {@link #prepare} runs before it writes (the work dir's lock,
   * the output's and the work dir's owners), writing nothing: what {@code plan} refuses,
   * {@code run} refuses with the same message and exit code.
   */
  public static RunSettings check(Path configFile, Path workDir, boolean fresh) {
    return check(configFile, workDir, fresh, 0);
  }

  /** As {@link #check(Path, Path, boolean)} for a run on {@code cores} cores (0: this machine's). */
  public static RunSettings check(Path configFile, Path workDir, boolean fresh, int cores) {
    RunSettings settings = resolve(configFile, workDir, fresh, cores);
    RunPreparation.check(settings, fresh);
    return settings;
  }
}
