package org.sunder.spark.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.apache.spark.api.java.JavaSparkContext;
import org.sunder.blockwise.metrics.SegmentationScores;
import org.sunder.spark.config.ConfigException;
import org.sunder.spark.evaluate.EvaluateJob;
import org.sunder.spark.evaluate.EvaluationTarget;
import org.sunder.spark.evaluate.ScoreReport;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.ParentCommand;

/** {@code sunder evaluate --segmentation C:D --truth C:D}. */
@Command(name = "evaluate", mixinStandardHelpOptions = true,
    description = {"Score a segmentation against a ground truth: variation of information"
        + " (split, merge), adapted Rand error with precision and recall, adjusted Rand index,"
        + " and the worst splits and merges. Both are label datasets of the same shape, given as"
        + " CONTAINER:DATASET. (A run with evaluate.groundTruth in its configuration scores"
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

  @Option(names = "--keep-background", description = "Also score voxels whose ground-truth"
      + " label is 0 (default: they are ignored).")
  boolean keepBackground;

  @Mixin
  SparkOptions spark;

  @Override
  public Integer call() {
    String[] seg = split(segmentation, "--segmentation");
    String[] gt = split(truth, "--truth");
    String[] m = mask == null ? new String[] {null, null} : split(mask, "--mask");
    EvaluationTarget target = new EvaluationTarget(seg[0], seg[1], gt[0], gt[1], m[0], m[1],
        !keepBackground);
    JavaSparkContext sc = cli.spark().open(spark.master);
    try {
      SegmentationScores scores = EvaluateJob.score(sc, target);
      ScoreReport.print(scores, !keepBackground, cli.out());
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
}
