package org.sunder.spark.stage;

import java.nio.file.Path;
import org.sunder.blockwise.graph.Offsets;
import org.sunder.blockwise.partition.PartitionConfig;
import org.sunder.spark.run.RunSettings;
import org.sunder.stitching.StitchingSetup;

/** The stitching module's view of a run's settings, built where a task needs it. */
public final class StitchingSetups {
  private StitchingSetups() {}

  public static StitchingSetup of(RunSettings s) {
    return of(s, s.outputDataset());
  }

  /** The same run writing its labels to {@code labelsDataset} in the output container. */
  public static StitchingSetup of(RunSettings s, String labelsDataset) {
    return StitchingSetup.of(Path.of(s.inputContainer()), s.affinities(),
        s.mask() == null ? "" : s.mask(), Path.of(s.outputContainer()), labelsDataset,
        s.grid(), new Offsets(s.offsets()), PartitionConfig.fromJson(s.partitionJson()));
  }
}
