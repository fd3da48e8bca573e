package org.sunder.spark.progress;

import org.apache.spark.TaskEndReason;
import org.apache.spark.scheduler.SparkListener;
import org.apache.spark.scheduler.SparkListenerJobEnd;
import org.apache.spark.scheduler.SparkListenerJobStart;
import org.apache.spark.scheduler.SparkListenerTaskEnd;

/**
 * Feeds Spark's task events of Sunder's stage jobs into a {@link ProgressTracker}. A job counts
 * when its local property {@value #STAGE_PROPERTY} names the stage; other jobs are ignored.
 */
public final class ProgressListener extends SparkListener {
  /** Local property a stage sets on the Spark context before it starts its job. */
  public static final String STAGE_PROPERTY = "sunder.stage";

  private final ProgressTracker tracker;
  private final ProgressPrinter printer;
  private volatile int activeJob = -1;

  public ProgressListener(ProgressTracker tracker, ProgressPrinter printer) {
    this.tracker = tracker;
    this.printer = printer;
  }

  @Override
  public void onJobStart(SparkListenerJobStart jobStart) {
    String stage = jobStart.properties() == null ? null
        : jobStart.properties().getProperty(STAGE_PROPERTY);
    if (stage == null) {
      return;
    }
    int tasks = 0;
    scala.collection.Iterator<org.apache.spark.scheduler.StageInfo> stages =
        jobStart.stageInfos().iterator();
    while (stages.hasNext()) {
      tasks += stages.next().numTasks();
    }
    activeJob = jobStart.jobId();
    tracker.start(stage, tasks);
    printer.update();
  }

  @Override
  public void onTaskEnd(SparkListenerTaskEnd taskEnd) {
    if (activeJob < 0) {
      return;
    }
    TaskEndReason reason = taskEnd.reason();
    tracker.taskEnded(reason instanceof org.apache.spark.Success$);
    printer.update();
  }

  @Override
  public void onJobEnd(SparkListenerJobEnd jobEnd) {
    if (jobEnd.jobId() == activeJob) {
      activeJob = -1;
      printer.finish();
    }
  }
}
