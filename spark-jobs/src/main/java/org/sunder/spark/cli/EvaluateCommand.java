package org.sunder.spark.cli;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.evaluate.EvaluateJob;
import org.sunder.spark.evaluate.SeamAuditJob;
import org.sunder.spark.run.RunResolver;
import org.sunder.spark.workdir.Manifest;
import org.sunder.spark.workdir.WorkDir;
import org.sunder.stitching.scores.EvaluationScores;
import org.sunder.stitching.scores.SeamAuditResult;
import org.sunder.stitching.setup.EvaluationTarget;
import org.sunder.stitching.task.EvaluateTask;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.ParentCommand;

/** {@code sunder evaluate --segmentation C:D --truth C:D}. */
@Command(name = "evaluate", mixinStandardHelpOptions = true,
    description = {"Score a segmentation against a ground truth: variation of information"
        + " (split, merge), adapted Rand error with precision and recall, adjusted Rand index,"
        + " and the worst splits and merges. Both are label datasets of the same shape, given as"
        + " CONTAINER:DATASET. Then a seam audit: ground-truth objects cut exactly at block"
        + " faces, and the share of label boundaries there, against control planes half a block"
        + " away; it needs the block shape (--block-shape, or the manifest of the run that wrote"
        + " the segmentation). (A run with evaluate.groundTruth in its configuration scores"
        + " itself.)"})
final class EvaluateCommand implements Callable<Integer> {
  @ParentCommand
  SunderCli cli;

  @Option(names = "--segmentation", required = true, paramLabel = "CONTAINER:DATASET",
      description = "The segmentation to score, e.g. volume.zarr:segmentation.")
  String segmentation;

  @Option(names = "--truth", required = true, paramLabel = "CONTAINER:DATASET",
      description = "The ground truth, e.g. volume.zarr:ground-truth.")
  String truth;

  @Option(names = "--mask", paramLabel = "CONTAINER:DATASET",
      description = "Only score voxels where this uint8 dataset is non-zero (default: all).")
  String mask;

  @Option(names = "--ignore-background", arity = "0..1", paramLabel = "true|false",
      defaultValue = "true", fallbackValue = "true", description = "Ignore voxels whose"
      + " ground-truth label is 0, as the configuration key evaluate.ignoreBackground does;"
      + " --ignore-background=false scores them too (default: ${DEFAULT-VALUE}).")
  boolean ignoreBackground;

  /** The earlier spelling, refused with a pointer to the new one. */
  @Option(names = "--keep-background", hidden = true)
  boolean keepBackground;

  @Option(names = "--block-shape", split = ",", paramLabel = "Z,Y,X",
      description = "Block core shape of the run that wrote the segmentation, in --axes order,"
          + " for the seam audit (default: blocks.shape from the manifest in"
          + " the run's work dir (--work-dir) when that run wrote this dataset; without either,"
          + " no seam audit).")
  int[] blockShape;

  @Option(names = "--work-dir", paramLabel = "DIR", description = "Work dir of the run that"
      + " wrote the segmentation, whose manifest gives the block shape for the seam audit"
      + " (default: CONTAINER.sunder-work/DATASET).")
  Path workDir;

  @Option(names = "--axes", defaultValue = "zyx", paramLabel = "AXES",
      description = "Axis order of --block-shape, slowest first (default: ${DEFAULT-VALUE}).")
  String axes;

  @Mixin
  SparkOptions spark;

  /** A block core shape in memory order and as the user writes it. */
  record Blocks(int[] memoryOrder, String text) {}

  @Override
  public Integer call() {
    if (keepBackground) {
      throw new ConfigException("--keep-background: renamed to match the configuration key"
          + " evaluate.ignoreBackground; use --ignore-background=false");
    }
    spark.requireValid();
    String[] seg = split(segmentation, "--segmentation");
    String[] gt = split(truth, "--truth");
    String[] m = mask == null ? new String[] {null, null} : split(mask, "--mask");
    EvaluationTarget target = new EvaluationTarget(seg[0], seg[1], gt[0], gt[1], m[0], m[1],
        ignoreBackground);
    Optional<Blocks> blocks = blocks(seg[0], seg[1]);
    EvaluateTask.requireComparable(target);
    JavaSparkContext sc = cli.spark().open(spark.master);
    try {
      EvaluationScores scores = EvaluateJob.score(sc, target);
      scores.print(ignoreBackground, cli.out());
      if (blocks.isPresent()) {
        SeamAuditResult audit = SeamAuditJob.audit(sc, target, blocks.get().memoryOrder());
        audit.print(blocks.get().text(), cli.out());
      } else {
        cli.out().println("seam audit: skipped, no block shape: give --block-shape, or evaluate"
            + " the output of a run whose work dir is " + runWorkDir(seg[0], seg[1])
            + " (--work-dir)");
      }
      return 0;
    } finally {
      cli.spark().release(sc);
    }
  }

  private static String[] split(String value, String option) {
    int colon = value.lastIndexOf(':');
    if (colon <= 0 || colon == value.length() - 1) {
      throw new ConfigException(option + ": expected CONTAINER:DATASET, got '" + value + "'");
    }
    return new String[] {Path.of(value.substring(0, colon)).toAbsolutePath().normalize().toString(),
        value.substring(colon + 1)};
  }

  /** The block shape from --block-shape, else from the manifest of the run that wrote it. */
  private Optional<Blocks> blocks(String container, String dataset) {
    if (blockShape != null) {
      AxisOrder order = axesOption();
      if (blockShape.length != order.dimensions()) {
        throw new ConfigException("--block-shape: expected " + order.dimensions() + " sizes in "
            + order + " order, got " + Arrays.toString(blockShape));
      }
      for (int size : blockShape) {
        if (size <= 0) {
          throw new ConfigException("--block-shape: expected sizes > 0, got "
              + Arrays.toString(blockShape));
        }
      }
      return Optional.of(new Blocks(order.toMemory(blockShape),
          Arrays.toString(blockShape) + " (" + order + ")"));
    }
    WorkDir work = new WorkDir(runWorkDir(container, dataset));
    Optional<Manifest> manifest = work.manifest();
    if (manifest.isEmpty() || manifest.get().config() == null) {
      return Optional.empty();
    }
    JsonNode config = manifest.get().config();
    JsonNode output = config.path("output");
    JsonNode shape = config.path("blocks").path("shape");
    if (!output.path("container").asText("").equals(container)
        || !output.path("dataset").asText("").equals(dataset) || !shape.isArray()) {
      return Optional.empty();
    }
    AxisOrder order = new AxisOrder(config.path("input").path("axes").asText("zyx"));
    int[] fileOrder = new int[shape.size()];
    for (int i = 0; i < fileOrder.length; i++) {
      fileOrder[i] = shape.get(i).asInt();
    }
    if (fileOrder.length != order.dimensions()) {
      throw new ConfigException("the manifest in " + work.root() + " has blocks.shape "
          + Arrays.toString(fileOrder) + " for axes " + order + "; give --block-shape");
    }
    return Optional.of(new Blocks(order.toMemory(fileOrder), Arrays.toString(fileOrder) + " ("
        + order + ", from the run's manifest in " + work.root() + ")"));
  }

  /** The work dir of the run that wrote the segmentation: --work-dir, else the default one. */
  private Path runWorkDir(String container, String dataset) {
    return workDir != null ? workDir.toAbsolutePath().normalize()
        : RunResolver.defaultWorkDir(Path.of(container), dataset);
  }

  private AxisOrder axesOption() {
    try {
      return new AxisOrder(axes);
    } catch (ConfigException e) {
      throw new ConfigException("--axes: " + e.getMessage(), e);
    }
  }
}
