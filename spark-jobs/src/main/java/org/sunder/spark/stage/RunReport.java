package org.sunder.spark.stage;

import java.io.PrintStream;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.sunder.spark.config.AxisOrder;
import org.sunder.spark.run.RunSettings;
import org.sunder.stitching.scores.EvaluationScores;
import org.sunder.stitching.scores.SeamAuditResult;
import org.sunder.stitching.solve.SolveReport;

/**
 * What a run did: per stage the tasks skipped and run and the time taken, the solve's figures,
 * the scores (when evaluated), the seam audit of the final segmentation and where the output is.
 *
 * @param solve the solve's figures, or {@code null} if the solve has not run yet
 * @param scores the scores, or {@code null} without evaluation
 * @param seams the seam audit, or {@code null} before the relabel stage has finished
 * @param seconds wall time of this run's stages
 */
public record RunReport(RunSettings settings, List<StageReport> stages, SolveReport solve,
    EvaluationScores scores, SeamAuditResult seams, double seconds) {
  public RunReport {
    stages = List.copyOf(stages);
  }

  public void print(PrintStream out) {
    for (StageReport stage : stages) {
      out.println(stage.line());
    }
    if (solve != null) {
      out.println(String.format(Locale.ROOT, "reduced graph: %d nodes, %d edges (%s), solved in"
          + " %.3f s; %d provisional segments -> %d final ids", solve.nodeCount(),
          solve.edgeCount(), solve.method(), solve.solveSeconds(), solve.segmentCount(),
          solve.finalIdCount()));
    }
    if (scores != null) {
      scores.print(settings.ignoreBackground(), out);
    }
    if (seams != null) {
      AxisOrder axes = new AxisOrder(settings.axes());
      seams.print(Arrays.toString(axes.toFile(settings.blockShape())) + " (" + axes + ")", out);
    }
    out.println(String.format(Locale.ROOT, "segmentation: %s  dataset %s  (this run's stages took %.2f s)",
        settings.outputContainer(), settings.outputDataset(), seconds));
    out.println("work dir: " + settings.workDir());
  }
}
