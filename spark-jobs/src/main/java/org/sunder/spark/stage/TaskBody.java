package org.sunder.spark.stage;

import java.io.Serializable;
import org.sunder.spark.run.RunSettings;

/**
 * The work of one task of a stage, run on an executor: performs the task (reading and writing
 * the containers directly) and returns its result, which is recorded in the work dir once the
 * outputs are in place. Implementations are small named classes (Java-serialized with the
 * closure), never lambdas.
 */
public interface TaskBody extends Serializable {
  /** Runs task {@code index}; returns its result (small; registered with Kryo). */
  Object run(RunSettings settings, int index);
}
